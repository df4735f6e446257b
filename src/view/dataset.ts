import { makeCell, type UnitCell } from '../lattice';
import type { ReflectionTable } from '../core';

/**
 * A loaded data set as the page holds it: the reflection columns plus the
 * per-reflection quantities every view needs (reciprocal-space position,
 * 1/d, I/sigma), computed once after loading. Positions follow the project's
 * orthogonalisation: a along x, b in the xy plane, c* along z.
 */
export interface Dataset {
  readonly name: string;
  readonly table: ReflectionTable;
  readonly cell: UnitCell;
  /** True when the file gave no cell and a unit cube stands in for it. */
  readonly cellAssumed: boolean;
  /** a*, b*, c* as rows (1/angstrom). */
  readonly recip: Float64Array;
  /** x, y, z per reflection (1/angstrom). */
  readonly xyz: Float32Array;
  /** 1/d per reflection (1/angstrom). */
  readonly dstar: Float32Array;
  readonly iOverSigma: Float32Array;
  readonly dMin: number;
  readonly dMax: number;
}

export function makeDataset(table: ReflectionTable, name: string): Dataset {
  let cellAssumed = false;
  let cell: UnitCell | undefined;
  if (table.meta.cell) {
    const c = makeCell(table.meta.cell);
    if (c.ok) cell = c.value;
  }
  if (!cell) {
    cellAssumed = true;
    const c = makeCell({ a: 1, b: 1, c: 1, alpha: 90, beta: 90, gamma: 90 });
    if (!c.ok) throw c.error;
    cell = c.value;
  }
  const f = cell.frac;
  const n = table.n;
  const xyz = new Float32Array(3 * n), dstar = new Float32Array(n), ios = new Float32Array(n);
  let qMax = 0, qMin = Infinity;
  for (let r = 0; r < n; r++) {
    const h = table.h[r], k = table.k[r], l = table.l[r];
    const x = h * f[0] + k * f[3] + l * f[6], y = h * f[1] + k * f[4] + l * f[7], z = h * f[2] + k * f[5] + l * f[8];
    xyz[3 * r] = x; xyz[3 * r + 1] = y; xyz[3 * r + 2] = z;
    const q = Math.sqrt(x * x + y * y + z * z);
    dstar[r] = q;
    if (q > qMax) qMax = q;
    if (q > 0 && q < qMin) qMin = q;
    const s = table.sigma[r];
    ios[r] = s > 0 ? table.i[r] / s : NaN;
  }
  return { name, table, cell, cellAssumed, recip: f, xyz, dstar, iOverSigma: ios, dMin: qMax > 0 ? 1 / qMax : Infinity, dMax: Number.isFinite(qMin) ? 1 / qMin : Infinity };
}
