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

function keyOf(h: number, k: number, l: number): number {
  return ((h + 4096) * 8192 + (k + 4096)) * 8192 + (l + 4096);
}

/**
 * Merge repeated observations of the same (h, k, l) (unmerged input) with weights 1/sigma^2.
 * Symmetry-equivalent but different indices stay separate: the Laue-class test needs them.
 * Linear: one pass assigns each observation its unique index, a second accumulates.
 */
export function mergeIdentical(table: ReflectionTable): MergeResult {
  const n = table.n;
  const uniqueOf = new Int32Array(n);
  const firstRow: number[] = [];
  const ids = new Map<number, number>();
  for (let j = 0; j < n; j++) {
    const key = keyOf(table.h[j], table.k[j], table.l[j]);
    let u = ids.get(key);
    if (u === undefined) { u = firstRow.length; ids.set(key, u); firstRow.push(j); }
    uniqueOf[j] = u;
  }
  const m = firstRow.length;
  const sw = new Float64Array(m), swi = new Float64Array(m), count = new Int32Array(m);
  for (let j = 0; j < n; j++) {
    const s = table.sigma[j] > 0 ? table.sigma[j] : 1;
    const w = 1 / (s * s);
    const u = uniqueOf[j];
    sw[u] += w;
    swi[u] += w * table.i[j];
    count[u]++;
  }
  const H = new Int16Array(m), K = new Int16Array(m), L = new Int16Array(m), I = new Float32Array(m), S = new Float32Array(m);
  let repeated = 0;
  for (let u = 0; u < m; u++) {
    const j = firstRow[u];
    H[u] = table.h[j]; K[u] = table.k[j]; L[u] = table.l[j];
    I[u] = swi[u] / sw[u];
    S[u] = 1 / Math.sqrt(sw[u]);
    if (count[u] > 1) repeated++;
  }
  let num = 0, den = 0;
  const dev: number[] = [];
  for (let j = 0; j < n; j++) {
    const u = uniqueOf[j];
    const c = count[u];
    if (c < 2) continue;
    const mean = swi[u] / sw[u];
    num += Math.abs(table.i[j] - mean);
    den += table.i[j];
    const s = table.sigma[j] > 0 ? table.sigma[j] : 1;
    if (dev.length < 200_000) dev.push(((table.i[j] - mean) / s) * Math.sqrt(c / (c - 1)));
  }
  let sigmaScale = NaN;
  if (dev.length >= 20) {
    const abs = Float64Array.from(dev, Math.abs).sort();
    sigmaScale = 1.4826 * abs[abs.length >> 1];
  }
  const merged: ReflectionTable = {
    n: m, h: H, k: K, l: L, i: I, sigma: S,
    meta: { ...table.meta, unmerged: false, warnings: [...table.meta.warnings] },
  };
  return { table: merged, observations: n, unique: m, rInt: den > 0 ? num / den : NaN, repeated, sigmaScale };
}
