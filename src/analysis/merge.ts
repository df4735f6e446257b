import type { ReflectionTable } from '../core';

export interface MergeResult {
  readonly table: ReflectionTable;
  /** Observations read and unique indices after merging identical (h, k, l). */
  readonly observations: number;
  readonly unique: number;
  /** R_int = sum |I - <I>| / sum I over indices measured more than once; NaN when none were. */
  readonly rInt: number;
  /** Indices measured more than once. */
  readonly repeated: number;
  /**
   * Robust scale of the normalised deviations (I - <I>)/sigma among repeats, corrected for
   * the mean's own contribution; ~1 when sigmas are right. NaN with fewer than 20 repeats.
   */
  readonly sigmaScale: number;
}

/**
 * Merge repeated observations of the same (h, k, l) (unmerged input) with weights 1/sigma^2.
 * Symmetry-equivalent but different indices stay separate: the Laue-class test needs them.
 * Linear after one sort of integer keys.
 */
export function mergeIdentical(table: ReflectionTable): MergeResult {
  const n = table.n;
  const keys = new Float64Array(n);
  const order = new Int32Array(n);
  for (let j = 0; j < n; j++) {
    order[j] = j;
    keys[j] = ((table.h[j] + 4096) * 8192 + (table.k[j] + 4096)) * 8192 + (table.l[j] + 4096);
  }
  order.sort((a, b) => keys[a] - keys[b]);
  const H: number[] = [], K: number[] = [], L: number[] = [], I: number[] = [], S: number[] = [];
  let num = 0, den = 0, repeated = 0;
  const dev: number[] = [];
  for (let a = 0; a < n; ) {
    let b = a + 1;
    while (b < n && keys[order[b]] === keys[order[a]]) b++;
    let sw = 0, swi = 0;
    for (let q = a; q < b; q++) {
      const j = order[q];
      const s = table.sigma[j] > 0 ? table.sigma[j] : 1;
      const w = 1 / (s * s);
      sw += w; swi += w * table.i[j];
    }
    const mean = swi / sw;
    const m = b - a;
    if (m > 1) {
      repeated++;
      for (let q = a; q < b; q++) {
        const j = order[q];
        num += Math.abs(table.i[j] - mean);
        den += table.i[j];
        const s = table.sigma[j] > 0 ? table.sigma[j] : 1;
        if (dev.length < 200_000) dev.push(((table.i[j] - mean) / s) * Math.sqrt(m / (m - 1)));
      }
    }
    const j0 = order[a];
    H.push(table.h[j0]); K.push(table.k[j0]); L.push(table.l[j0]);
    I.push(mean); S.push(1 / Math.sqrt(sw));
    a = b;
  }
  let sigmaScale = NaN;
  if (dev.length >= 20) {
    const abs = Float64Array.from(dev, Math.abs).sort();
    sigmaScale = 1.4826 * abs[abs.length >> 1];
  }
  const merged: ReflectionTable = {
    n: H.length,
    h: Int16Array.from(H), k: Int16Array.from(K), l: Int16Array.from(L),
    i: Float32Array.from(I), sigma: Float32Array.from(S),
    meta: { ...table.meta, unmerged: false, warnings: [...table.meta.warnings] },
  };
  return { table: merged, observations: n, unique: H.length, rInt: den > 0 ? num / den : NaN, repeated, sigmaScale };
}
