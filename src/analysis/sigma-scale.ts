import type { ReflectionTable } from '../core';
import type { HklIndex } from './hkl-index';
import { clamp } from './special-functions';

/**
 * Robust scale k of the standard uncertainties: the true error of I is taken as k sigma.
 *
 * Preferred source: differences of symmetry-equivalent reflections (I1 - I2)/sqrt(s1^2 + s2^2),
 * which are N(0, k^2) when the rotation is true symmetry; k = 1.4826 * median |d| (the median
 * absolute deviation of a normal distribution). Only weak pairs (both I/sigma < 5) are used,
 * because absences are weak and strong reflections carry extra proportional errors.
 * Fallback: the negative intensities, whose (I/sigma)^2 average k^2 for a zero-mean normal
 * (slightly low when weak true intensities are mixed in). Limited to [0.5, 4].
 */
export function sigmaScaleFromPairs(table: ReflectionTable, rotations: readonly number[][], index: HklIndex): { k: number; pairs: number } {
  const d: number[] = [];
  const n = table.n;
  const stride = Math.max(1, Math.floor(n / 50_000));
  for (const r of rotations) {
    for (let j = 0; j < n; j += stride) {
      const h = table.h[j], k = table.k[j], l = table.l[j];
      const q = index.findWithFriedel(h * r[0] + k * r[3] + l * r[6], h * r[1] + k * r[4] + l * r[7], h * r[2] + k * r[5] + l * r[8]);
      if (q < 0 || q <= j) continue;
      const s1 = table.sigma[j], s2 = table.sigma[q];
      if (!(s1 > 0 && s2 > 0)) continue;
      if (Math.abs(table.i[j] / s1) >= 5 || Math.abs(table.i[q] / s2) >= 5) continue;
      d.push(Math.abs(table.i[j] - table.i[q]) / Math.sqrt(s1 * s1 + s2 * s2));
      if (d.length >= 100_000) break;
    }
  }
  if (d.length < 30) return { k: NaN, pairs: d.length };
  const a = Float64Array.from(d).sort();
  return { k: clamp(1.4826 * a[a.length >> 1], 0.5, 4), pairs: d.length };
}

export function sigmaScaleFromNegatives(table: ReflectionTable): { k: number; negatives: number } {
  let s = 0, m = 0;
  for (let j = 0; j < table.n; j++) {
    const I = table.i[j], sg = table.sigma[j];
    if (I < 0 && sg > 0) { s += (I / sg) ** 2; m++; }
  }
  if (m < 30) return { k: NaN, negatives: m };
  return { k: clamp(Math.sqrt(s / m), 0.5, 4), negatives: m };
}
