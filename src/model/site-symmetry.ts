import { DEN } from '../symmetry';
import type { CrystalModel, ModelOp } from './crystal-model';

/** Distance (angstrom) within which a symmetry image counts as the atom itself (special position). */
export const SPECIAL_POSITION_TOLERANCE = 0.02;

/** Distance in angstrom between fractional position x and its image under op, modulo lattice translations (metric G row-major). */
export function imageDistance(g: Float64Array, op: ModelOp, x: number, y: number, z: number): number {
  const r = op.r, t = op.t;
  let dx = r[0] * x + r[1] * y + r[2] * z + t[0] / DEN - x;
  let dy = r[3] * x + r[4] * y + r[5] * z + t[1] / DEN - y;
  let dz = r[6] * x + r[7] * y + r[8] * z + t[2] / DEN - z;
  dx -= Math.round(dx); dy -= Math.round(dy); dz -= Math.round(dz);
  return Math.sqrt(Math.max(0, g[0] * dx * dx + g[4] * dy * dy + g[8] * dz * dz + 2 * (g[1] * dx * dy + g[2] * dx * dz + g[5] * dy * dz)));
}

/** Order of the site symmetry of fractional position (x, y, z): operations mapping it onto itself modulo lattice translations. */
export function siteSymmetryOrder(model: Pick<CrystalModel, 'cell' | 'ops'>, x: number, y: number, z: number, tolerance = SPECIAL_POSITION_TOLERANCE): number {
  let order = 0;
  for (const op of model.ops) if (imageDistance(model.cell.metric, op, x, y, z) <= tolerance) order++;
  return Math.max(order, 1);
}

/** Shortest distance from (x, y, z) to an image of itself that does not coincide with it (Infinity when none). */
export function closestDistinctImage(model: Pick<CrystalModel, 'cell' | 'ops'>, x: number, y: number, z: number, tolerance = SPECIAL_POSITION_TOLERANCE): number {
  let closest = Infinity;
  for (const op of model.ops) {
    const d = imageDistance(model.cell.metric, op, x, y, z);
    if (d > tolerance && d < closest) closest = d;
  }
  return closest;
}
