import { makeCell } from '../../src/lattice';
import { tableFromArrays, type ReflectionTable } from '../../src/core';

/**
 * A small invented monoclinic data set for renderer tests: h0l with a c-glide
 * (l odd absent) except one deliberate violator at 1 0 3. Intensities come
 * from a smooth formula, no random numbers, so pictures are reproducible.
 */
export function syntheticMonoclinic(): { table: ReflectionTable; recip: Float64Array } {
  const cell = makeCell({ a: 6, b: 8, c: 10, alpha: 90, beta: 105, gamma: 90 });
  if (!cell.ok) throw cell.error;
  const h: number[] = [], k: number[] = [], l: number[] = [], i: number[] = [], s: number[] = [];
  for (let H = -4; H <= 4; H++) for (let K = -3; K <= 3; K++) for (let L = -5; L <= 5; L++) {
    if (H === 0 && K === 0 && L === 0) continue;
    if (cell.value.dSpacing(H, K, L) < 1.2) continue;
    let I = 1000 * (1 + Math.cos(H * 1.3 + K * 0.7 + L * 0.45)) * Math.exp(-0.4 / cell.value.dSpacing(H, K, L) ** 2) + 5;
    if (K === 0 && L % 2 !== 0) I = H === 1 && L === 3 ? 400 : 2;
    h.push(H); k.push(K); l.push(L); i.push(I); s.push(Math.sqrt(I) + 3);
  }
  return { table: tableFromArrays({ h, k, l, i, sigma: s }, { source: 'synthetic-monoclinic', block: 'synthetic' }), recip: cell.value.frac };
}
