import type { ReflectionTable } from '../core';
import type { HklIndex } from './hkl-index';
import { invertOp, isIdentityRotation, makeOp, rotationOrder } from '../symmetry';
import { clamp, logNormalCdf, logNormalPdf } from './special-functions';

/** A proper rotation acting on Miller indices as h' = h R (R row-major, integer). */
export type Rotation = Int32Array | readonly number[];

export function rotationKeyText(r: ArrayLike<number>): string {
  return Array.from(r).join(',');
}

/** Agreement of I(h) with I(hR) for one rotation R over the pairs present in the data. */
export interface RotationAgreement {
  readonly r: number[];
  /** Axis order (2, 3, 4, 6) and a short description of the axis direction, e.g. "2 along [010]". */
  readonly label: string;
  /** Pairs of different reflections related by R (Friedel mates counted as the same position). */
  readonly pairs: number;
  /** Pearson correlation of normalised intensities over the pairs (NaN with < 3 pairs). */
  readonly cc: number;
  /** Correlation expected if R were exact symmetry, given the measurement errors. */
  readonly ccExpected: number;
  /** Reflections whose R-image is a different position (so a pair would be possible). */
  readonly distinct: number;
  /** No pair although many were possible: the file was probably reduced (merged) under R. */
  readonly merged: boolean;
  /** log-likelihood (nats) of the agreement if R is symmetry minus if it is not. */
  readonly logOdds: number;
}

export function inverseRotation(r: ArrayLike<number>): number[] {
  return Array.from(invertOp(makeOp(r)).r);
}

/** Direction of the rotation axis in direct space (the fixed vector of R acting on columns). */
function axisLabel(r: ArrayLike<number>): string {
  const n = rotationOrder(r);
  // The axis is the null space of (R - I); try small integer vectors.
  let best = '';
  outer: for (let s = 1; s <= 2; s++)
    for (let u = -s; u <= s; u++)
      for (let v = -s; v <= s; v++)
        for (let w = -s; w <= s; w++) {
          if (u === 0 && v === 0 && w === 0) continue;
          const x = r[0] * u + r[1] * v + r[2] * w, y = r[3] * u + r[4] * v + r[5] * w, z = r[6] * u + r[7] * v + r[8] * w;
          if (x === u && y === v && z === w) {
            const sgn = [u, v, w].find((q) => q !== 0)! < 0 ? -1 : 1;
            best = `[${[u * sgn, v * sgn, w * sgn].map((q) => (q < 0 ? `-${-q}` : `${q}`)).join('')}]`;
            break outer;
          }
        }
  return `${n}-fold along ${best || '?'}`;
}

/**
 * Keep one of each {R, R^-1} pair (they relate the same pairs of reflections) and drop the identity.
 */
export function distinctRotations(rotations: readonly ArrayLike<number>[]): number[][] {
  const seen = new Set<string>();
  const out: number[][] = [];
  for (const r of rotations) {
    if (isIdentityRotation(r)) continue;
    const k = rotationKeyText(r), ki = rotationKeyText(inverseRotation(r));
    if (seen.has(k) || seen.has(ki)) continue;
    seen.add(k);
    out.push(Array.from(r));
  }
  return out;
}

/**
 * The reflections sampled for one rotation and their partners: row j, the partner row q
 * (-1 when there is none to compare with) and whether R fixes h up to sign.
 */
interface RotationSample {
  readonly j: Int32Array;
  readonly q: Int32Array;
  readonly fixed: Uint8Array;
  readonly count: number;
}

/**
 * Sampled pairs per rotation, kept between calls of `rotationAgreements` that share the table,
 * the index, the rotations and `use` (only the normalisation and the sigma scale change), so
 * the random index lookups are done once.
 */
export interface RotationPairCache {
  samples?: RotationSample[];
}

function sampleRotation(table: ReflectionTable, r: readonly number[], index: HklIndex, stride: number, use?: Uint8Array): RotationSample {
  const n = table.n;
  const cap = Math.ceil(n / stride);
  const J = new Int32Array(cap), Q = new Int32Array(cap), F = new Uint8Array(cap);
  const involution = rotationOrder(r) === 2;
  let count = 0;
  for (let j = 0; j < n; j += stride) {
    if (use && !use[j]) continue;
    const h = table.h[j], k = table.k[j], l = table.l[j];
    const h2 = h * r[0] + k * r[3] + l * r[6];
    const k2 = h * r[1] + k * r[4] + l * r[7];
    const l2 = h * r[2] + k * r[5] + l * r[8];
    const q = index.findWithFriedel(h2, k2, l2);
    J[count] = j;
    Q[count] = q < 0 || q === j || (involution && q < j) || (use && !use[q]) ? -1 : q;
    F[count] = (h2 === h && k2 === k && l2 === l) || (h2 === -h && k2 === -k && l2 === -l) ? 1 : 0;
    count++;
  }
  return { j: J, q: Q, fixed: F, count };
}

/**
 * Agreement statistics per rotation.
 *
 * The correlation (shown to the user) compares normalised intensities E^2 clipped to [-2, 12];
 * its value expected under exact symmetry is var(true E^2)/var(observed E^2) from the errors.
 * The evidence itself is a likelihood ratio per pair (see `pairLogOdds`), because a correlation
 * is dominated by the strong reflections and stays high under pseudo-symmetry, while the
 * differences measured against their errors do not. Each rotation's log-odds is limited to
 * +-30 nats. Pass the same `cache` to calls that differ only in e2, sE, expected and k.
 */
export function rotationAgreements(
  table: ReflectionTable, e2: Float64Array, sE: Float64Array, rotations: readonly number[][], index: HklIndex,
  expected: Float64Array, k: number, use?: Uint8Array, cache: RotationPairCache = {},
): RotationAgreement[] {
  const n = table.n;
  // 20,000 reflections per rotation give correlations to +-0.01 and a log-odds far beyond its
  // +-30 limit; more would only cost time
  const stride = Math.max(1, Math.floor(n / 20_000));
  if (!cache.samples || cache.samples.length !== rotations.length)
    cache.samples = rotations.map((r) => sampleRotation(table, r, index, stride, use));
  const samples = cache.samples;
  const pairJ = new Int32Array(MAX_LIKELIHOOD_PAIRS), pairQ = new Int32Array(MAX_LIKELIHOOD_PAIRS);
  return rotations.map((r, ri) => {
    const { j: J, q: Q, fixed: F, count } = samples[ri];
    let pairs = 0, distinct = 0, listed = 0;
    let sx = 0, sy = 0, sxx = 0, syy = 0, sxy = 0, sNoise = 0;
    for (let s = 0; s < count; s++) {
      const j = J[s], q = Q[s];
      if (q >= 0 && listed < MAX_LIKELIHOOD_PAIRS) { pairJ[listed] = j; pairQ[listed] = q; listed++; }
      // reflections the rotation fixes (up to sign) say nothing about it in the correlation
      if (F[s]) continue;
      distinct++;
      if (q < 0) continue;
      const x = clamp(e2[j], -2, 12), y = clamp(e2[q], -2, 12);
      pairs++;
      sx += x; sy += y; sxx += x * x; syy += y * y; sxy += x * y;
      sNoise += 0.5 * (sE[j] * sE[j] + sE[q] * sE[q]);
    }
    let cc = NaN, ccExpected = 0.9;
    if (pairs >= 3) {
      const vx = sxx / pairs - (sx / pairs) ** 2, vy = syy / pairs - (sy / pairs) ** 2;
      const cov = sxy / pairs - (sx / pairs) * (sy / pairs);
      cc = vx > 0 && vy > 0 ? cov / Math.sqrt(vx * vy) : 0;
      const v = 0.5 * (vx + vy);
      ccExpected = v > 0 ? clamp((v - sNoise / pairs) / v, 0.2, 0.97) : 0.2;
    }
    const merged = pairs === 0 && distinct >= 20;
    const logOdds = pairs >= 1 ? clamp(pairLogOddsSum(table, expected, k, pairJ, pairQ, listed), -30, 30) : 0;
    return { r, label: axisLabel(r), pairs, cc, ccExpected, distinct, merged, logOdds };
  });
}

/** Evidence (nats) that a rotation belongs to the Laue group because the file was merged under it. */
export const MERGED_ROTATION_LOG_ODDS = 1.5;

/**
 * log p(I1, I2 | same true intensity) - log p(I1) p(I2) (independent), for acentric Wilson
 * intensities with mean S and Gaussian errors s1, s2. With J ~ exp(-J/S)/S:
 * same: N(I1 - I2; 0, s1^2 + s2^2) * int p(J) N(J; mu, v) dJ, mu and v the error-weighted mean
 * and its variance; independent: the product of the French & Wilson (1978) marginals.
 * Limited to [-4, +4] per pair so that a few outliers (zingers, overlaps) do not decide.
 */
export function pairLogOdds(I1: number, s1: number, I2: number, s2: number, S: number): number {
  const v1 = s1 * s1, v2 = s2 * s2, vs = v1 + v2;
  const mu = (I1 * v2 + I2 * v1) / vs, v = (v1 * v2) / vs, sv = Math.sqrt(v);
  const lSame = logNormalPdf(I1 - I2, Math.sqrt(vs)) + logWilsonGauss(mu, sv, S);
  const lInd = logWilsonGauss(I1, s1, S) + logWilsonGauss(I2, s2, S);
  return clamp(lSame - lInd, -4, 4);
}

/** log of int_0^inf exp(-J/S)/S N(x - J; 0, s^2) dJ (acentric Wilson convolved with an error). */
function logWilsonGauss(x: number, s: number, S: number): number {
  return -Math.log(S) - x / S + (s * s) / (2 * S * S) + logNormalCdf((x - (s * s) / S) / s);
}

/** 5,000 pairs put the likelihood sum far beyond its +-30 limit whenever the rotation is decided at all. */
const MAX_LIKELIHOOD_PAIRS = 5_000;

/**
 * Sum of pair log-odds over the listed pairs (rows pairJ[p], pairQ[p]) of h and hR. Errors:
 * k sigma plus 3 % of the intensity (a proportional error from absorption and scaling,
 * common practice).
 */
function pairLogOddsSum(
  table: ReflectionTable, expected: Float64Array, k: number, pairJ: Int32Array, pairQ: Int32Array, count: number,
): number {
  let sum = 0;
  for (let p = 0; p < count; p++) {
    const j = pairJ[p], q = pairQ[p];
    const I1 = table.i[j], I2 = table.i[q];
    const e1 = Math.hypot(k * table.sigma[j], 0.03 * Math.max(I1, 0)) || 1e-6;
    const e2 = Math.hypot(k * table.sigma[q], 0.03 * Math.max(I2, 0)) || 1e-6;
    const S = Math.max(0.5 * (expected[j] + expected[q]), 1e-30);
    sum += pairLogOdds(I1, e1, I2, e2, S);
  }
  return sum;
}
