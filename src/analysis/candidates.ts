import type { CellParams } from '../core';
import type { SpaceGroupSetting } from '../symmetry';

/**
 * Which settings fit the cell: a setting's rotations must preserve the metric,
 * R^T G R = G (International Tables Vol. A, Part 1.3). The cell the setting would impose is
 * the group average of R^T G R; its lengths and angles are compared with the given cell.
 */
export interface MetricTolerance {
  /** Largest relative length difference, percent. Default 2 (common practice for a first screen). */
  readonly lengthPercent: number;
  /** Largest angle difference, degrees. Default 1.5. */
  readonly angleDeg: number;
}

export const DEFAULT_TOLERANCE: MetricTolerance = { lengthPercent: 2, angleDeg: 1.5 };

export interface MetricFit {
  readonly lengthPercent: number;
  readonly angleDeg: number;
}

function metricOf(c: CellParams): number[] {
  const r = Math.PI / 180;
  const ab = c.a * c.b * Math.cos(c.gamma * r), ac = c.a * c.c * Math.cos(c.beta * r), bc = c.b * c.c * Math.cos(c.alpha * r);
  return [c.a * c.a, ab, ac, ab, c.b * c.b, bc, ac, bc, c.c * c.c];
}

function paramsOf(g: number[]): CellParams {
  const a = Math.sqrt(g[0]), b = Math.sqrt(g[4]), c = Math.sqrt(g[8]);
  const d = 180 / Math.PI;
  return { a, b, c, alpha: Math.acos(g[5] / (b * c)) * d, beta: Math.acos(g[2] / (a * c)) * d, gamma: Math.acos(g[1] / (a * b)) * d };
}

/** Deviation of the cell from the metric the rotations impose. */
export function metricFit(cell: CellParams, rotations: readonly ArrayLike<number>[]): MetricFit {
  const g = metricOf(cell);
  const avg = new Array<number>(9).fill(0);
  for (const R of rotations) {
    // (R^T G R)_ij = sum_kl R_ki G_kl R_lj
    for (let i = 0; i < 3; i++)
      for (let j = 0; j < 3; j++) {
        let s = 0;
        for (let k = 0; k < 3; k++) for (let l = 0; l < 3; l++) s += R[k * 3 + i] * g[k * 3 + l] * R[l * 3 + j];
        avg[i * 3 + j] += s / rotations.length;
      }
  }
  const p = paramsOf(avg);
  const lengthPercent = 100 * Math.max(Math.abs(p.a - cell.a) / cell.a, Math.abs(p.b - cell.b) / cell.b, Math.abs(p.c - cell.c) / cell.c);
  const angleDeg = Math.max(Math.abs(p.alpha - cell.alpha), Math.abs(p.beta - cell.beta), Math.abs(p.gamma - cell.gamma));
  return { lengthPercent, angleDeg };
}

/**
 * Soft penalty (nats) for a metric that fits only approximately: refined cells are precise
 * to a few hundredths of a degree, so 0.25 degree or 0.4 % of misfit counts against a
 * setting by half a nat each (a judgement, common practice in spirit: the cell is a hint,
 * the intensities decide).
 */
export function metricLogPenalty(f: MetricFit): number {
  return -0.5 * ((f.angleDeg / 0.25) ** 2 + (f.lengthPercent / 0.4) ** 2);
}

export function fitsMetric(f: MetricFit, tol: MetricTolerance): boolean {
  return f.lengthPercent <= tol.lengthPercent && f.angleDeg <= tol.angleDeg;
}

export interface CandidateSetting {
  readonly setting: SpaceGroupSetting;
  readonly fit: MetricFit;
}

export function candidateSettings(all: readonly SpaceGroupSetting[], cell: CellParams, tol: MetricTolerance): CandidateSetting[] {
  const cache = new Map<string, MetricFit>();
  const out: CandidateSetting[] = [];
  for (const s of all) {
    const key = s.rotations.map((r) => Array.from(r).join(',')).sort().join(';');
    let f = cache.get(key);
    if (!f) { f = metricFit(cell, s.rotations); cache.set(key, f); }
    if (fitsMetric(f, tol)) out.push({ setting: s, fit: f });
  }
  return out;
}
