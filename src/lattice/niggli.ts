import { fail, ok, type CellParams, type Result } from '../core';
import { cellFromMetric, transformMetric } from './change-of-basis';
import { makeCell } from './cell';

/**
 * Niggli reduction by the algorithm of Krivy & Gruber (1976), Acta Cryst. A32,
 * 297-298, with the epsilon comparisons of Grosse-Kunstleve, Sauter & Adams
 * (2004), Acta Cryst. A60, 1-6, which keep it from cycling on cells that lie on
 * or near a boundary of the reduced domain.
 *
 * Works on the Gruber vector (A, B, C, xi, eta, zeta) = (a.a, b.b, c.c, 2b.c,
 * 2a.c, 2a.b) and accumulates the integer matrix P with
 * (a_red, b_red, c_red) = (a, b, c) P (International Tables Vol. A, Part 5
 * convention; det P = +1).
 */
export interface NiggliResult {
  /** The reduced cell, recomputed from the input metric and P (not from the running sums). */
  readonly cell: CellParams;
  /** Integer P, row-major, from the input basis to the reduced basis. */
  readonly transform: Int32Array;
  /** Metric tensor of the reduced cell, row-major. */
  readonly metric: number[];
  /** Number of Krivy-Gruber steps taken (for diagnostics). */
  readonly steps: number;
}

/** Relative epsilon of Grosse-Kunstleve et al. (2004): eps = rel * V^(2/3). */
export const NIGGLI_RELATIVE_EPSILON = 1e-5;
const MAX_STEPS = 10000;

function mul(p: Int32Array, m: readonly number[]): void {
  const t = new Array<number>(9);
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++) t[3 * i + j] = p[3 * i] * m[j] + p[3 * i + 1] * m[3 + j] + p[3 * i + 2] * m[6 + j];
  for (let j = 0; j < 9; j++) p[j] = t[j];
}

function metricVolume(g: readonly number[]): number {
  const det =
    g[0] * (g[4] * g[8] - g[5] * g[7]) - g[1] * (g[3] * g[8] - g[5] * g[6]) + g[2] * (g[3] * g[7] - g[4] * g[6]);
  return det > 0 ? Math.sqrt(det) : NaN;
}

/** Niggli-reduce a cell given by its parameters. */
export function niggliReduce(cell: CellParams, relativeEpsilon = NIGGLI_RELATIVE_EPSILON): Result<NiggliResult> {
  const checked = makeCell(cell, { file: 'cell' });
  if (!checked.ok) return checked;
  return niggliReduceMetric(Array.from(checked.value.metric), relativeEpsilon);
}

/** Niggli-reduce a cell given by its metric tensor G (row-major, angstrom^2). */
export function niggliReduceMetric(g: readonly number[], relativeEpsilon = NIGGLI_RELATIVE_EPSILON): Result<NiggliResult> {
  const vol = metricVolume(g);
  if (!(vol > 0)) return fail('the metric tensor is not positive definite (the cell has no volume)');
  const eps = relativeEpsilon * Math.pow(vol, 2 / 3);
  let A = g[0], B = g[4], C = g[8];
  let xi = 2 * g[5], eta = 2 * g[2], zeta = 2 * g[1];
  const p = new Int32Array([1, 0, 0, 0, 1, 0, 0, 0, 1]);
  const lt = (x: number, y: number) => x < y - eps;
  const gt = (x: number, y: number) => y < x - eps;
  const eq = (x: number, y: number) => !(x < y - eps || y < x - eps);
  let steps = 0;
  for (;;) {
    if (++steps > MAX_STEPS) return fail('Niggli reduction did not converge; the cell is probably degenerate');
    // N1
    if (gt(A, B) || (eq(A, B) && gt(Math.abs(xi), Math.abs(eta)))) {
      [A, B] = [B, A];
      [xi, eta] = [eta, xi];
      mul(p, [0, -1, 0, -1, 0, 0, 0, 0, -1]);
    }
    // N2
    if (gt(B, C) || (eq(B, C) && gt(Math.abs(eta), Math.abs(zeta)))) {
      [B, C] = [C, B];
      [eta, zeta] = [zeta, eta];
      mul(p, [-1, 0, 0, 0, 0, -1, 0, -1, 0]);
      continue;
    }
    // N3 / N4: signs of xi, eta, zeta with epsilon (Grosse-Kunstleve et al. 2004)
    let nPos = 0, nZero = 0;
    for (const v of [xi, eta, zeta]) {
      if (gt(v, 0)) nPos++;
      else if (!lt(v, 0)) nZero++;
    }
    if (nPos === 3 || (nZero === 0 && nPos === 1)) {
      const i = lt(xi, 0) ? -1 : 1, j = lt(eta, 0) ? -1 : 1, k = lt(zeta, 0) ? -1 : 1;
      mul(p, [i, 0, 0, 0, j, 0, 0, 0, k]);
      xi = Math.abs(xi); eta = Math.abs(eta); zeta = Math.abs(zeta);
    } else {
      const f = [1, 1, 1];
      let z = -1;
      [xi, eta, zeta].forEach((v, idx) => {
        if (gt(v, 0)) f[idx] = -1;
        else if (!lt(v, 0)) z = idx;
      });
      if (f[0] * f[1] * f[2] < 0) {
        if (z < 0) return fail('Niggli reduction reached an inconsistent sign state');
        f[z] = -1;
      }
      mul(p, [f[0], 0, 0, 0, f[1], 0, 0, 0, f[2]]);
      xi = -Math.abs(xi); eta = -Math.abs(eta); zeta = -Math.abs(zeta);
    }
    // N5
    if (gt(Math.abs(xi), B) || (eq(xi, B) && lt(2 * eta, zeta)) || (eq(xi, -B) && lt(zeta, 0))) {
      const s = Math.sign(xi);
      mul(p, [1, 0, 0, 0, 1, -s, 0, 0, 1]);
      C = B + C - s * xi;
      eta = eta - s * zeta;
      xi = xi - 2 * s * B;
      continue;
    }
    // N6
    if (gt(Math.abs(eta), A) || (eq(eta, A) && lt(2 * xi, zeta)) || (eq(eta, -A) && lt(zeta, 0))) {
      const s = Math.sign(eta);
      mul(p, [1, 0, -s, 0, 1, 0, 0, 0, 1]);
      C = A + C - s * eta;
      xi = xi - s * zeta;
      eta = eta - 2 * s * A;
      continue;
    }
    // N7
    if (gt(Math.abs(zeta), A) || (eq(zeta, A) && lt(2 * xi, eta)) || (eq(zeta, -A) && lt(eta, 0))) {
      const s = Math.sign(zeta);
      mul(p, [1, -s, 0, 0, 1, 0, 0, 0, 1]);
      B = A + B - s * zeta;
      xi = xi - s * eta;
      zeta = zeta - 2 * s * A;
      continue;
    }
    // N8
    const sum = xi + eta + zeta + A + B;
    if (lt(sum, 0) || (eq(sum, 0) && gt(2 * (A + eta) + zeta, 0))) {
      mul(p, [1, 0, 1, 0, 1, 1, 0, 0, 1]);
      C = A + B + C + xi + eta + zeta;
      xi = 2 * B + xi + zeta;
      eta = 2 * A + eta + zeta;
      continue;
    }
    break;
  }
  const metric = transformMetric(g, p);
  return ok({ cell: cellFromMetric(metric), transform: p, metric, steps });
}
