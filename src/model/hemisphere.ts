import { fail, ok, type Result } from '../core';
import type { UnitCell } from '../lattice';

/** More reflections than this is a mistake in --dmin rather than a wish. */
export const MAX_GENERATED_REFLECTIONS = 5_000_000;

/**
 * Every h,k,l with d >= dmin in one hemisphere: l > 0, or l = 0 and k > 0, or l = k = 0 and h > 0
 * (Friedel mates merged, 0 0 0 left out), in h, k, l loop order. The bound |h| <= a/dmin holds for
 * any cell because h = a . d* and |d*| <= 1/dmin.
 * `keep`, when given, filters the candidates (e.g. to one reflection per Laue-equivalent set).
 */
export function hemisphereIndices(
  cell: UnitCell, dmin: number, keep?: (h: number, k: number, l: number) => boolean,
): Result<{ h: Int32Array; k: Int32Array; l: Int32Array }> {
  if (!(dmin > 0)) return fail(`the resolution limit must be a positive number of angstrom (got ${dmin})`);
  const hmax = Math.floor(cell.a / dmin), kmax = Math.floor(cell.b / dmin), lmax = Math.floor(cell.c / dmin);
  const estimate = (2 * Math.PI / 3) * cell.volume / dmin ** 3; // reflections in a hemisphere of radius 1/dmin
  if (estimate > MAX_GENERATED_REFLECTIONS)
    return fail(`about ${Math.round(estimate)} reflections would be generated (limit ${MAX_GENERATED_REFLECTIONS}); use a larger d_min`);
  const inv2 = 1 / (dmin * dmin) * (1 + 1e-12);
  const hs: number[] = [], ks: number[] = [], ls: number[] = [];
  for (let h = -hmax; h <= hmax; h++)
    for (let k = -kmax; k <= kmax; k++)
      for (let l = 0; l <= lmax; l++) {
        if (l === 0 && (k < 0 || (k === 0 && h <= 0))) continue;
        if (cell.invDSquared(h, k, l) > inv2) continue;
        if (keep && !keep(h, k, l)) continue;
        hs.push(h); ks.push(k); ls.push(l);
      }
  if (hs.length === 0) return fail(`no reflection has d >= ${dmin} angstrom in this cell (longest edge ${Math.max(cell.a, cell.b, cell.c)} angstrom)`);
  return ok({ h: Int32Array.from(hs), k: Int32Array.from(ks), l: Int32Array.from(ls) });
}
