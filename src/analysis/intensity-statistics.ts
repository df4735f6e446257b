import type { ReflectionTable } from '../core';
import type { HklIndex } from './hkl-index';
import { centricEvidence } from './centric-evidence';
import { clamp, erf, normalCdf } from './special-functions';

/**
 * Theoretical values of normalised-intensity statistics for an ideal structure of many
 * equal atoms. Sources:
 * - mean |E^2 - 1|: 2/e = 0.736 acentric, 0.968 centric (Wilson 1949, Acta Cryst. 2, 318-321;
 *   values as tabulated in International Tables Vol. B, ch. 2.1).
 * - cumulative N(z): 1 - exp(-z) acentric, erf(sqrt(z/2)) centric
 *   (Howells, Phillips & Rogers 1950, Acta Cryst. 3, 210-214).
 * - second moment <E^4> = <I^2>/<I>^2: 2 acentric, 3 centric (follows from the Wilson
 *   distributions; 1.5 for a perfect merohedral twin of acentric data).
 * - L-test, L = (I1 - I2)/(I1 + I2) for local pairs: <|L|> = 1/2 and <L^2> = 1/3 untwinned,
 *   3/8 and 1/5 for a perfect twin (Padilla & Yeates 2003, Acta Cryst. D59, 1124-1130).
 */
export const THEORY = {
  meanAbsE2Minus1: { acentric: 2 / Math.E, centric: 0.968 },
  secondMoment: { acentric: 2, centric: 3, perfectTwin: 1.5 },
  lTest: { meanAbsL: { untwinned: 0.5, perfectTwin: 0.375 }, meanL2: { untwinned: 1 / 3, perfectTwin: 0.2 } },
} as const;

/** Acentric cumulative distribution N(z) = 1 - exp(-z) (Howells, Phillips & Rogers 1950). */
export function nzAcentric(z: number): number {
  return z <= 0 ? 0 : 1 - Math.exp(-z);
}
/** Centric cumulative distribution N(z) = erf(sqrt(z/2)) (Howells, Phillips & Rogers 1950). */
export function nzCentric(z: number): number {
  return z <= 0 ? 0 : erf(Math.sqrt(z / 2));
}

/** P(z_true + e <= z) for acentric z_true and e ~ N(0, s^2); exact closed form. */
function nzAcentricNoisy(z: number, s: number): number {
  if (s < 1e-6) return nzAcentric(z);
  const a = normalCdf(z / s);
  const lb = -z + 0.5 * s * s;
  const b = lb < 700 ? Math.exp(lb) * normalCdf((z - s * s) / s) : 0;
  return clamp(a - b, 0, 1);
}

// Quadrature nodes for the centric case: z_true = x^2 with x ~ N(0,1), x >= 0 by symmetry.
const CQ_N = 48;
const CQ_X = new Float64Array(CQ_N), CQ_W = new Float64Array(CQ_N);
{
  const xmax = 6, dx = xmax / CQ_N;
  let s = 0;
  for (let j = 0; j < CQ_N; j++) {
    const x = (j + 0.5) * dx;
    CQ_X[j] = x;
    CQ_W[j] = Math.exp(-0.5 * x * x);
    s += CQ_W[j];
  }
  for (let j = 0; j < CQ_N; j++) CQ_W[j] /= s;
}

/** P(z_true + e <= z) for centric z_true and e ~ N(0, s^2), by quadrature. */
function nzCentricNoisy(z: number, s: number): number {
  if (s < 1e-6) return nzCentric(z);
  let p = 0;
  for (let j = 0; j < CQ_N; j++) p += CQ_W[j] * normalCdf((z - CQ_X[j] * CQ_X[j]) / s);
  return p;
}

/**
 * Largest evidence (nats) intensity statistics may give for or against a centre of symmetry:
 * odds of about 7:1. Pseudo-centrosymmetric structures, heavy atoms on special positions and
 * twinning all imitate the other distribution, so these statistics never decide alone
 * (a judgement, in line with common practice).
 */
export const CENTRIC_LOG_ODDS_CAP = 2;

export const NZ_GRID = [0.05, 0.1, 0.15, 0.2, 0.25, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0] as const;

export interface IntensityStatistics {
  /** General (acentric-candidate) reflections used. */
  readonly n: number;
  readonly meanAbsE2Minus1: number;
  /** <E^4>, corrected for measurement error: (<I^2> - <sigma^2>) / <I>^2 on the E scale. */
  readonly secondMoment: number;
  /** Cumulative distribution at NZ_GRID: observed, ideal acentric/centric, and both blurred by the measurement errors. */
  readonly nz: {
    readonly z: readonly number[];
    readonly observed: number[];
    readonly acentric: number[];
    readonly centric: number[];
    readonly acentricWithErrors: number[];
    readonly centricWithErrors: number[];
  };
  /** Fraction of "centric-like" behaviour fitted to the whole N(z) curve: 0 acentric, 1 centric. */
  readonly centricFraction: number;
  /** log-likelihood ratio (natural log) centric : acentric from N(z) and the second moment, tempered. */
  readonly centricLogOdds: number;
  readonly probabilityCentric: number;
  /** Centrosymmetric share q of the best-fitting non-centrosymmetric model (centric-evidence.ts). */
  readonly centricSubstructure: number;
  readonly lTest: { readonly pairs: number; readonly meanAbsL: number; readonly meanL2: number };
}

/**
 * Statistics of normalised intensities over the reflections with `use[j] !== 0`, which
 * should be general reflections (acentric in every non-centrosymmetric candidate).
 * `e2[j]` is E^2 and `sE[j]` its standard uncertainty from the measurement.
 *
 * The centric/acentric evidence uses the whole N(z) curve and the second moment, each
 * compared with the theory blurred by the actual measurement errors; its uncertainty has
 * a model term (tau) besides the sampling term, because real structures (few or heavy
 * atoms, pseudo-symmetry, twinning) depart from the ideal curves. The tau values are a
 * judgement (common practice: treat these statistics as indicative, not decisive).
 */
export function intensityStatistics(
  table: ReflectionTable, e2: Float64Array, sE: Float64Array, use: Uint8Array, index: HklIndex,
): IntensityStatistics {
  const nAll = table.n;
  let n = 0, sAbs = 0, sE2 = 0, sE4 = 0, sVar = 0;
  for (let j = 0; j < nAll; j++) {
    if (!use[j]) continue;
    n++;
    const z = e2[j];
    sAbs += Math.abs(z - 1);
    sE2 += z;
    sE4 += z * z;
    sVar += sE[j] * sE[j];
  }
  const meanE2 = n ? sE2 / n : NaN;
  const secondMoment = n ? (sE4 / n - sVar / n) / (meanE2 * meanE2) : NaN;

  // Subsample for the blurred theory curves (they need per-reflection quadrature).
  const stride = Math.max(1, Math.floor(n / 4000));
  const obs = new Float64Array(NZ_GRID.length), aN = new Float64Array(NZ_GRID.length), cN = new Float64Array(NZ_GRID.length);
  let m = 0, seen = 0;
  for (let j = 0; j < nAll; j++) {
    if (!use[j]) continue;
    // histogram by first grid point at or above z; cumulated below
    let g0 = 0;
    while (g0 < NZ_GRID.length && e2[j] > NZ_GRID[g0]) g0++;
    if (g0 < NZ_GRID.length) obs[g0]++;
    if (seen++ % stride) continue;
    m++;
    const s = sE[j];
    for (let g = 0; g < NZ_GRID.length; g++) {
      aN[g] += nzAcentricNoisy(NZ_GRID[g], s);
      cN[g] += nzCentricNoisy(NZ_GRID[g], s);
    }
  }
  for (let g = 1; g < NZ_GRID.length; g++) obs[g] += obs[g - 1];
  const observed = Array.from(obs, (v) => (n ? v / n : NaN));
  const acentricWithErrors = Array.from(aN, (v) => (m ? v / m : NaN));
  const centricWithErrors = Array.from(cN, (v) => (m ? v / m : NaN));

  // Least-squares centric fraction over the curve.
  let num = 0, den = 0;
  for (let g = 0; g < NZ_GRID.length; g++) {
    const d = centricWithErrors[g] - acentricWithErrors[g];
    num += (observed[g] - acentricWithErrors[g]) * d;
    den += d * d;
  }
  const centricFraction = n >= 10 && den > 0 ? clamp(num / den, -1, 2) : 0.5;

  let centricLogOdds = 0;
  const ce = centricEvidence(e2, sE, use);
  if (n >= 10) {
    // The likelihood treats reflections as independent draws from an ideal distribution;
    // real structures (few atoms, pseudo-symmetry) depart from it, so it counts as if from at
    // most 200 reflections, and never beyond the cap. Fewer than 500 general reflections:
    // proportionally lower cap (thin evidence stays uncertain).
    const tempered = ce.logOdds * Math.min(1, 200 / Math.max(ce.n, 1));
    const cap = CENTRIC_LOG_ODDS_CAP * Math.min(1, n / 500);
    centricLogOdds = clamp(tempered, -cap, cap);
  }

  const lTest = lStatistic(table, use, index);
  // <|L|> well below 1/2 means twinning, which makes any structure look more acentric:
  // the centric/acentric curves then mislead, so their evidence is halved. (Above 1/2 is
  // expected for centric data, so no conclusion is drawn there.)
  if (lTest.pairs >= 100 && lTest.meanAbsL < 0.44) centricLogOdds *= 0.5;
  return {
    n,
    meanAbsE2Minus1: n ? sAbs / n : NaN,
    secondMoment,
    nz: {
      z: NZ_GRID,
      observed,
      acentric: NZ_GRID.map(nzAcentric),
      centric: NZ_GRID.map(nzCentric),
      acentricWithErrors,
      centricWithErrors,
    },
    centricFraction,
    centricLogOdds,
    probabilityCentric: 1 / (1 + Math.exp(-centricLogOdds)),
    centricSubstructure: ce.bestQ,
    lTest,
  };
}

/**
 * L-test (Padilla & Yeates 2003): L = (I1 - I2)/(I1 + I2) for pairs of reflections whose
 * indices differ by a short even step (local pairs; even steps avoid most effects of
 * translational pseudo-symmetry; the diagonal steps keep rhombohedral centring), both in use.
 * Pairs with I1 + I2 <= 0 are skipped.
 */
const L_STEPS = [[2, 0, 0], [0, 2, 0], [0, 0, 2], [2, 2, 0], [2, 0, 2]] as const;
function lStatistic(table: ReflectionTable, use: Uint8Array, index: HklIndex) {
  let pairs = 0, sAbs = 0, s2 = 0;
  // 200,000 reflections give <|L|> to +-0.001; a stride keeps large data sets linear and fast
  const stride = Math.max(1, Math.floor(table.n / 200_000));
  for (let j = 0; j < table.n; j += stride) {
    if (!use[j]) continue;
    const h = table.h[j], k = table.k[j], l = table.l[j];
    for (const d of L_STEPS) {
      const q = index.find(h + d[0], k + d[1], l + d[2]);
      if (q < 0 || !use[q]) continue;
      const a = table.i[j], b = table.i[q];
      if (a + b <= 0) continue;
      const L = clamp((a - b) / (a + b), -1, 1);
      pairs++;
      sAbs += Math.abs(L);
      s2 += L * L;
    }
  }
  return { pairs, meanAbsL: pairs ? sAbs / pairs : NaN, meanL2: pairs ? s2 / pairs : NaN };
}
