import type { ReflectionTable } from '../core';

/**
 * Resolution shells and normalised intensities.
 *
 * Shells are equal volumes of reciprocal space (equal steps in (sin theta/lambda)^3),
 * so a complete data set puts about the same number of reflections in each; no sort is
 * needed, which keeps a million reflections linear. The mean intensity of each shell,
 * interpolated in log between shell centres, is Sigma(s), the expected intensity of an
 * acentric general reflection (Wilson 1949, Acta Cryst. 2, 318-321). Normalised
 * intensities are E^2 = I / (epsilon Sigma(s)); the statistics use general reflections
 * (epsilon = 1), and the absence model multiplies Sigma by epsilon for reflections on
 * symmetry elements (rank-space-groups.ts).
 */
export interface ResolutionShells {
  readonly count: number;
  /** Upper edge of each shell in (sin theta/lambda)^2, 1/angstrom^2. */
  readonly stol2Max: Float64Array;
  /** Centre of each shell (mean stol^2 of its reflections). */
  readonly stol2Mean: Float64Array;
  /** Reflections used per shell. */
  readonly n: Int32Array;
  /** Mean intensity per shell (general reflections, epsilon = 1). */
  readonly meanI: Float64Array;
  /** Mean I/sigma per shell. */
  readonly meanIOverSigma: Float64Array;
}

/** Shell index of each reflection for `count` equal-volume shells up to stol2Max. */
function shellOf(stol2: number, stol3Max: number, count: number): number {
  const s3 = stol2 * Math.sqrt(stol2);
  const j = Math.floor((s3 / stol3Max) * count);
  return j >= count ? count - 1 : j < 0 ? 0 : j;
}

/**
 * Build shells from the reflections with `use[j] !== 0` (e.g. general reflections only);
 * every reflection still gets a Sigma from `expectedIntensity`.
 * About 80 reflections per shell, between 1 and 20 shells (common practice: enough shells to
 * follow the fall-off, enough reflections per shell for a stable mean).
 */
export function buildShells(table: ReflectionTable, stol2: Float64Array, use?: Uint8Array): ResolutionShells {
  let nUse = 0;
  let max = 0;
  for (let j = 0; j < table.n; j++) {
    if (use && !use[j]) continue;
    nUse++;
    if (stol2[j] > max) max = stol2[j];
  }
  const count = Math.max(1, Math.min(20, Math.floor(nUse / 80)));
  const stol3Max = max > 0 ? max * Math.sqrt(max) * (1 + 1e-9) : 1;
  const sumI = new Float64Array(count), sumS = new Float64Array(count), sumIS = new Float64Array(count);
  const cnt = new Int32Array(count);
  for (let j = 0; j < table.n; j++) {
    if (use && !use[j]) continue;
    const b = shellOf(stol2[j], stol3Max, count);
    cnt[b]++;
    sumI[b] += table.i[j];
    sumS[b] += stol2[j];
    const s = table.sigma[j];
    sumIS[b] += s > 0 ? table.i[j] / s : 0;
  }
  const stol2Max = new Float64Array(count), stol2Mean = new Float64Array(count);
  const meanI = new Float64Array(count), meanIOverSigma = new Float64Array(count);
  for (let b = 0; b < count; b++) {
    stol2Max[b] = Math.pow((stol3Max * (b + 1)) / count, 2 / 3);
    const lo = Math.pow((stol3Max * b) / count, 2 / 3);
    stol2Mean[b] = cnt[b] ? sumS[b] / cnt[b] : 0.5 * (lo + stol2Max[b]);
    meanI[b] = cnt[b] ? sumI[b] / cnt[b] : NaN;
    meanIOverSigma[b] = cnt[b] ? sumIS[b] / cnt[b] : NaN;
  }
  // Empty or non-positive shells take their neighbours' values so that Sigma stays positive.
  fillGaps(meanI, cnt);
  return { count, stol2Max, stol2Mean, n: cnt, meanI, meanIOverSigma };
}

function fillGaps(meanI: Float64Array, cnt: Int32Array): void {
  const count = meanI.length;
  let firstGood = -1;
  for (let b = 0; b < count; b++) if (cnt[b] > 0 && meanI[b] > 0) { firstGood = b; break; }
  if (firstGood < 0) { meanI.fill(1); return; }
  for (let b = 0; b < firstGood; b++) meanI[b] = meanI[firstGood];
  for (let b = firstGood + 1; b < count; b++) if (!(cnt[b] > 0 && meanI[b] > 0)) meanI[b] = meanI[b - 1];
}

/**
 * Expected intensity Sigma at stol^2 (epsilon = 1): log-linear interpolation between
 * shell centres, constant beyond the outer centres.
 */
export function expectedIntensity(shells: ResolutionShells, stol2: number): number {
  const c = shells.stol2Mean, m = shells.meanI, n = shells.count;
  if (n === 1 || stol2 <= c[0]) return m[0];
  if (stol2 >= c[n - 1]) return m[n - 1];
  let b = 0;
  while (b < n - 2 && stol2 > c[b + 1]) b++;
  const t = (stol2 - c[b]) / (c[b + 1] - c[b] || 1);
  return Math.exp((1 - t) * Math.log(m[b]) + t * Math.log(m[b + 1]));
}

/** Sigma for every reflection (epsilon = 1), written into `out`. */
export function expectedIntensityColumn(shells: ResolutionShells, stol2: Float64Array, n: number, out = new Float64Array(n)): Float64Array {
  for (let j = 0; j < n; j++) out[j] = expectedIntensity(shells, stol2[j]);
  return out;
}

/**
 * Form factor of carbon, four Gaussians plus a constant, used as the "average atom"
 * of the Wilson plot (International Tables Vol. C, Table 6.1.1.4; coefficients quoted
 * from memory of that table).
 */
function carbonF(stol2: number): number {
  return 2.31 * Math.exp(-20.8439 * stol2) + 1.02 * Math.exp(-10.2075 * stol2) +
    1.5886 * Math.exp(-0.5687 * stol2) + 0.865 * Math.exp(-51.6512 * stol2) + 0.2156;
}

export interface WilsonPlot {
  /** Points: stol^2 and ln(<I> / f_C^2). */
  readonly stol2: number[];
  readonly lnRatio: number[];
  /** Overall isotropic displacement parameter B in angstrom^2 (slope = -2B). */
  readonly b: number;
  /** Absolute-scale factor: <I> = scale * N f^2 exp(-2B s^2), with N carbon-like atoms unknown, so up to N. */
  readonly lnScale: number;
  /** Shells used in the fit (those beyond 0.1 1/angstrom^2 ... i.e. d < 1.58 angstrom when available). */
  readonly shellsUsed: number;
}

/**
 * Wilson plot (Wilson 1942, Nature 150, 152; Wilson 1949, Acta Cryst. 2, 318-321):
 * ln(<I>/f^2) = ln(scale) - 2 B s^2 with s = sin(theta)/lambda. Fitted by least squares
 * over shells beyond s^2 = 0.0625 (d < 2 angstrom; the low-resolution part is dominated by
 * molecular structure, common practice); all shells when fewer than three lie there.
 */
export function wilsonPlot(shells: ResolutionShells): WilsonPlot {
  const xs: number[] = [], ys: number[] = [];
  for (let b = 0; b < shells.count; b++) {
    if (!(shells.n[b] > 0 && shells.meanI[b] > 0)) continue;
    const s2 = shells.stol2Mean[b];
    const f = carbonF(s2);
    xs.push(s2);
    ys.push(Math.log(shells.meanI[b] / (f * f)));
  }
  let sel = xs.map((x) => x > 0.0625);
  if (sel.filter(Boolean).length < 3) sel = xs.map(() => true);
  let sx = 0, sy = 0, sxx = 0, sxy = 0, n = 0;
  xs.forEach((x, j) => {
    if (!sel[j]) return;
    n++; sx += x; sy += ys[j]; sxx += x * x; sxy += x * ys[j];
  });
  const den = n * sxx - sx * sx;
  const slope = n >= 2 && den > 0 ? (n * sxy - sx * sy) / den : 0;
  const icept = n > 0 ? (sy - slope * sx) / n : 0;
  return { stol2: xs, lnRatio: ys, b: -slope / 2, lnScale: icept, shellsUsed: n };
}
