import { fail, ok, type ReflectionTable, type Result } from '../core';
import { computeStructureFactors, type LongJobOptions, type PreparedModel } from './structure-factors';

/**
 * Model against data, with the usual definitions (common practice):
 *   scale k minimises sum w (Io - k Ic)^2, w = 1/sigma^2, so k = sum w Io Ic / sum w Ic^2;
 *   R1 = sum |Fo - Fc| / sum Fo over Io > 2 sigma(Io), Fo = sqrt(Io), Fc = sqrt(k Ic);
 *   wR2 = sqrt( sum w (Io - k Ic)^2 / sum w Io^2 ) over all reflections;
 *   GooF = sqrt( sum w (Io - k Ic)^2 / (n - 1) ), one parameter (the scale).
 * Rows with sigma <= 0 or a non-finite value carry no weight and are left out (and counted).
 */
export interface WorstReflection {
  readonly h: number;
  readonly k: number;
  readonly l: number;
  readonly iObs: number;
  readonly sigma: number;
  /** Calculated intensity on the scale of the data (k Ic). */
  readonly iCalc: number;
  /** (Io - k Ic) / sigma. */
  readonly deviation: number;
}

export interface ModelComparison {
  /** Rows used (positive sigma, finite values). */
  readonly n: number;
  /** Rows left out for sigma <= 0 or non-finite values. */
  readonly excluded: number;
  readonly scale: number;
  readonly r1: number;
  /** Rows with Io > 2 sigma, the ones R1 sums over. */
  readonly r1Count: number;
  readonly wr2: number;
  readonly goof: number;
  /** Per row of the table: k |Fc|^2 on the data's scale (NaN for rows left out). */
  readonly calculated: Float32Array;
  /** Largest |Io - k Ic| / sigma first. */
  readonly worst: WorstReflection[];
}

export interface CompareOptions extends LongJobOptions {
  /** How many worst-fitting reflections to list (default 10). */
  worst?: number;
}

/** Unscaled |F|^2 (electrons^2) for every row of a table: what the viewer shows beside the measured intensity. */
export function calculatedIntensities(pm: PreparedModel, table: ReflectionTable, options: LongJobOptions = {}): Float64Array | undefined {
  const re = new Float64Array(table.n), im = new Float64Array(table.n);
  if (!computeStructureFactors(pm, table.h, table.k, table.l, re, im, options)) return undefined;
  for (let j = 0; j < table.n; j++) re[j] = re[j] * re[j] + im[j] * im[j];
  return re;
}

export function compareModelWithData(pm: PreparedModel, table: ReflectionTable, options: CompareOptions = {}): Result<ModelComparison> {
  const ic = calculatedIntensities(pm, table, options);
  if (!ic) return fail('comparison cancelled');
  return compareIntensities(ic, table, options.worst ?? 10);
}

/** The statistics from given calculated intensities (unscaled) beside the table's measured ones. */
export function compareIntensities(ic: ArrayLike<number>, table: ReflectionTable, nWorst = 10): Result<ModelComparison> {
  const { n: rows, i: io, sigma } = table;
  const usable = (j: number) => sigma[j] > 0 && Number.isFinite(sigma[j]) && Number.isFinite(io[j]) && Number.isFinite(ic[j]);
  let swoc = 0, swcc = 0, n = 0;
  for (let j = 0; j < rows; j++) {
    if (!usable(j)) continue;
    const w = 1 / (sigma[j] * sigma[j]);
    swoc += w * io[j] * ic[j];
    swcc += w * ic[j] * ic[j];
    n++;
  }
  if (n === 0) return fail(`no reflection with a positive sigma in ${table.meta.source} (${rows} rows)`, { file: table.meta.source });
  if (!(swcc > 0)) return fail('the model gives zero intensity at every reflection of the data', { file: table.meta.source });
  const k = swoc / swcc;
  let sumFo = 0, sumDF = 0, r1Count = 0, swd2 = 0, swo2 = 0;
  const calculated = new Float32Array(rows).fill(Number.NaN);
  const dev = new Float64Array(rows).fill(-1);
  for (let j = 0; j < rows; j++) {
    if (!usable(j)) continue;
    const kc = k * ic[j];
    calculated[j] = kc;
    const s = sigma[j];
    const w = 1 / (s * s);
    const d = io[j] - kc;
    swd2 += w * d * d;
    swo2 += w * io[j] * io[j];
    dev[j] = Math.abs(d) / s;
    if (io[j] > 2 * s) {
      const fo = Math.sqrt(io[j]);
      sumFo += fo;
      sumDF += Math.abs(fo - Math.sqrt(Math.max(kc, 0)));
      r1Count++;
    }
  }
  const order = Array.from({ length: rows }, (_, j) => j).filter((j) => dev[j] >= 0);
  order.sort((a, b) => dev[b] - dev[a]);
  const worst = order.slice(0, Math.max(0, nWorst)).map((j) => ({
    h: table.h[j], k: table.k[j], l: table.l[j], iObs: io[j], sigma: sigma[j], iCalc: calculated[j], deviation: (io[j] - calculated[j]) / sigma[j],
  }));
  return ok({
    n,
    excluded: rows - n,
    scale: k,
    r1: r1Count > 0 ? sumDF / sumFo : Number.NaN,
    r1Count,
    wr2: swo2 > 0 ? Math.sqrt(swd2 / swo2) : Number.NaN,
    goof: n > 1 ? Math.sqrt(swd2 / (n - 1)) : Number.NaN,
    calculated,
    worst,
  });
}
