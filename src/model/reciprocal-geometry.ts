import type { CellParams } from '../core';

/**
 * What the structure-factor code needs from the cell: the reciprocal metric tensor G*
 * (so that 1/d^2 = h G* h^T and (sin(theta)/lambda)^2 = h G* h^T / 4) and the reciprocal
 * lengths a*, b*, c* that turn CIF U_ij into U*_ij = U_ij a*_i a*_j.
 * Lengths in 1/angstrom.
 */
export interface ReciprocalGeometry {
  /** G*11, G*22, G*33, G*12, G*13, G*23 in 1/angstrom^2. */
  readonly gstar: Float64Array;
  readonly astar: number;
  readonly bstar: number;
  readonly cstar: number;
}

export function reciprocalGeometry(cell: CellParams): ReciprocalGeometry {
  const rad = Math.PI / 180;
  const ca = Math.cos(cell.alpha * rad), cb = Math.cos(cell.beta * rad), cg = Math.cos(cell.gamma * rad);
  // direct metric G, then invert the symmetric 3x3 matrix
  const g11 = cell.a * cell.a, g22 = cell.b * cell.b, g33 = cell.c * cell.c;
  const g12 = cell.a * cell.b * cg, g13 = cell.a * cell.c * cb, g23 = cell.b * cell.c * ca;
  const c11 = g22 * g33 - g23 * g23;
  const c12 = g13 * g23 - g12 * g33;
  const c13 = g12 * g23 - g13 * g22;
  const c22 = g11 * g33 - g13 * g13;
  const c23 = g12 * g13 - g11 * g23;
  const c33 = g11 * g22 - g12 * g12;
  const det = g11 * c11 + g12 * c12 + g13 * c13;
  const gstar = Float64Array.of(c11 / det, c22 / det, c33 / det, c12 / det, c13 / det, c23 / det);
  return { gstar, astar: Math.sqrt(gstar[0]), bstar: Math.sqrt(gstar[1]), cstar: Math.sqrt(gstar[2]) };
}

/** (sin(theta)/lambda)^2 of reflection h, k, l. */
export function stol2Of(g: Float64Array, h: number, k: number, l: number): number {
  return 0.25 * (h * h * g[0] + k * k * g[1] + l * l * g[2] + 2 * (h * k * g[3] + h * l * g[4] + k * l * g[5]));
}
