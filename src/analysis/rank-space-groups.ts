import { fail, fillEstimatedSigmas, ok, SIGMA_ESTIMATE_RULE, type CellParams, type ReflectionTable, type Result } from '../core';
import { makeCell, stolSquaredColumn, changeOfBasisFromMatrix, formatChangeOfBasis, findBravaisCandidates, HOLOHEDRY_ORDER, basisMatrix } from '../lattice';
import { allSettings, changeBasisOp, opKey, type SpaceGroupSetting } from '../symmetry';
import { absenceEvidence, compileForbids, conditionKey, MISSING_CLASS_MIN_ZONE, missingClassLogOdds, type AbsenceEvidence, type ConditionEvidence, type ConditionLike } from './absence-evidence';
import { candidateSettings, DEFAULT_TOLERANCE, metricLogPenalty, type MetricTolerance } from './candidates';
import { HklIndex } from './hkl-index';
import { intensityStatistics, THEORY } from './intensity-statistics';
import { distinctRotations, inverseRotation, MERGED_ROTATION_LOG_ODDS, rotationAgreements, rotationKeyText, type RotationPairCache } from './laue-evidence';
import { mergeIdentical } from './merge';
import { buildShells, expectedIntensityColumn, wilsonPlot } from './normalisation';
import { sigmaScaleFromNegatives, sigmaScaleFromPairs } from './sigma-scale';
import { normalCdf, softmax } from './special-functions';

export interface RankOptions {
  /** Cell to use instead of the one in the file. */
  readonly cell?: CellParams;
  /** Enantiopure (chiral) sample: Sohncke groups only. */
  readonly chiral?: boolean;
  /** Metric tolerance for candidate settings (defaults: 2 % lengths, 1.5 degrees). */
  readonly tolerance?: Partial<MetricTolerance>;
  /** Settings to consider (default: every setting of the table). */
  readonly settings?: readonly SpaceGroupSetting[];
}

/** Progress callback: fraction done (0..1) and the stage. Return false to cancel. */
export type RankProgress = (fraction: number, stage: string) => boolean | void;

/**
 * The result of `rankSpaceGroups`, in the same shape as `lacuna rank --json`
 * (snake_case keys, plain numbers and arrays). Documented in DEVELOPERS.md.
 */
export interface RankResult {
  input: {
    source: string;
    reflections: number;
    observations: number;
    merged_from_unmerged: boolean;
    r_int: number | null;
    sigmas_estimated: boolean;
    negative_fraction: number;
    d_min: number;
    d_max: number;
    completeness: number | null;
  };
  cell: CellParams;
  tolerance: MetricTolerance;
  laue: {
    classes: LaueClassReport[];
    rotations: {
      rotation: string; label: string; pairs: number; cc: number | null; cc_expected: number;
      merged: boolean; log_odds: number;
    }[];
  };
  statistics: {
    sigma_scale: number;
    sigma_scale_source: string;
    wilson_b: number;
    wilson_ln_scale: number;
    general_reflections: number;
    mean_abs_e2_minus_1: number;
    second_moment: number;
    theory: typeof THEORY;
    nz: { z: number[]; observed: number[]; acentric: number[]; centric: number[]; acentric_with_errors: number[]; centric_with_errors: number[] };
    centric_fraction: number;
    centric_log_odds: number;
    probability_centric: number;
    l_test: { pairs: number; mean_abs_l: number; mean_l2: number };
    shells: { d_min: number; n: number; mean_i: number; mean_i_over_sigma: number }[];
  };
  conditions: ConditionReport[];
  candidates: CandidateReport[];
  classes: ClassReport[];
  absences_removed: boolean;
  warnings: string[];
  caution: string;
}

export interface LaueClassReport {
  symbol: string;
  axes: string;
  probability: number;
  probability_from_symmetry: number;
  log_likelihood: number;
  settings: number;
}

export interface ConditionReport {
  text: string;
  zone: number[][];
  coeffs: number[];
  modulus: number;
  n: number;
  mean_i_over_sigma: number | null;
  n_strong: number;
  probability_absent: number;
  n_zone: number;
  weak_violations: number;
  forbidden_class_missing: boolean;
  log_odds: number;
}

export interface CandidateReport {
  number: number;
  hm: string;
  hall: string;
  /**
   * Probability of this candidate's class of settings that the data cannot tell apart
   * (same Laue class, same absences, same centricity): that is what intensities can decide,
   * so candidates are sorted by it. Members of one class share it.
   */
  probability: number;
  /** This setting's own share: the class probability split by the prior within the class. */
  setting_probability: number;
  class_id: number;
  laue: string;
  crystal_system: string;
  centrosymmetric: boolean;
  sohncke: boolean;
  standard: boolean;
  change_of_basis: string | null;
  metric_deviation: { length_percent: number; angle_deg: number };
  evidence: { laue: number; absences: number; missing_classes: number; centric: number };
  conditions: { text: string; n: number; mean_i_over_sigma: number | null; n_strong: number; probability_absent: number; forbidden_class_missing: boolean }[];
  against: { h: number; k: number; l: number; i_over_sigma: number; condition: string }[];
}

export interface ClassReport {
  id: number;
  probability: number;
  members: string[];
  separated_by: string | null;
}

export const RANK_CAUTION =
  'A space group chosen from systematic absences and intensity statistics is a hypothesis: structure solution and refinement must confirm it.';

const MIN_REFLECTIONS = 20;

/** Sigmas the analysis can use: the file's, or estimates where it gave none (or none valid). */
function estimateSigmas(table: ReflectionTable): { table: ReflectionTable; estimated: boolean; patched: number } {
  if (table.meta.sigmaEstimated) return { table, estimated: true, patched: 0 };
  let bad = 0;
  for (let j = 0; j < table.n; j++) if (!(table.sigma[j] > 0) || !Number.isFinite(table.sigma[j])) bad++;
  if (bad === 0) return { table, estimated: false, patched: 0 };
  const sigma = Float32Array.from(table.sigma);
  fillEstimatedSigmas(table.i, sigma, table.n, true);
  return { table: { ...table, sigma }, estimated: bad === table.n, patched: bad };
}

/** Proper rotation parts (R or -R with det +1) of a setting: its Laue group modulo inversion. */
function properRotations(s: SpaceGroupSetting): number[][] {
  const seen = new Set<string>();
  const out: number[][] = [];
  for (const r of s.rotations) {
    const d = r[0] * (r[4] * r[8] - r[5] * r[7]) - r[1] * (r[3] * r[8] - r[5] * r[6]) + r[2] * (r[3] * r[7] - r[4] * r[6]);
    const p = d > 0 ? Array.from(r) : Array.from(r, (v) => -v);
    const k = rotationKeyText(p);
    if (!seen.has(k)) { seen.add(k); out.push(p); }
  }
  return out;
}

/** Screw-axis swaps that turn a symbol into its mirror image. */
function describeSeparation(members: SpaceGroupSetting[]): string | null {
  if (members.length < 2) return null;
  const numbers = new Set(members.map((m) => m.number));
  if (numbers.size === 1) return 'the same space-group type in different settings; pick either';
  const enantio = members.some((a) => a.enantiomorph && members.some((b) => b.hm === a.enantiomorph));
  const parts: string[] = [];
  if (enantio)
    parts.push('enantiomorphic pair: only the absolute structure (anomalous scattering, Flack parameter) separates them');
  const pgs = new Set(members.map((m) => m.pointGroup));
  if (pgs.size > 1 || !enantio)
    parts.push(
      'same Laue class, same absences and same centric/acentric statistics: intensities cannot separate them; ' +
        'solve and refine in each (or use a physical test such as second-harmonic generation or pyroelectricity)',
    );
  return parts.join('; ');
}

/** Change of basis from a setting to the standard setting of its type, if a simple one exists. */
function findChangeToStandard(s: SpaceGroupSetting, standard: SpaceGroupSetting): string | null {
  // compare operation by operation and stop at the first that is not in the standard setting
  const target = new Set(standard.ops.map(opKey));
  const tryP = (P: number[], p: number[]): boolean => {
    const d = Math.abs(P[0] * (P[4] * P[8] - P[5] * P[7]) - P[1] * (P[3] * P[8] - P[5] * P[6]) + P[2] * (P[3] * P[7] - P[4] * P[6]));
    // a larger new cell adds centring translations that the transformed operations do not list
    if (s.ops.length * d !== standard.ops.length) return false;
    for (const o of s.ops) {
      const r = changeBasisOp(o, P, p);
      if (!r.ok || r.value.r.some((v) => v < -2 || v > 2) || !target.has(opKey(r.value))) return false;
    }
    return true;
  };
  const mats: number[][] = [];
  const vals = [-1, 0, 1];
  for (let m = 0; m < 19683; m++) {
    const P: number[] = [];
    let x = m;
    for (let j = 0; j < 9; j++) { P.push(vals[x % 3]); x = Math.floor(x / 3); }
    const d = P[0] * (P[4] * P[8] - P[5] * P[7]) - P[1] * (P[3] * P[8] - P[5] * P[6]) + P[2] * (P[3] * P[7] - P[4] * P[6]);
    if (d === 1) mats.push(P);
  }
  // identity-like matrices first (fewest changes), then the rest
  const weight = (P: number[]) => P.filter((v) => v !== 0).length * 10 + P.filter((v, j) => v !== (j % 4 === 0 ? 1 : 0)).length;
  mats.sort((a, b) => weight(a) - weight(b));
  const zero = [0, 0, 0];
  // rhombohedral axes to the hexagonal (obverse) setting, International Tables Vol. A, Part 5
  if (s.ext === 'R') {
    const P = [1, 0, 1, -1, 1, 1, 0, -1, 1];
    if (tryP(P, zero)) return formatChangeOfBasis(changeOfBasisFromMatrix(P));
  }
  for (const P of mats) if (tryP(P, zero)) return formatChangeOfBasis(changeOfBasisFromMatrix(P));
  // origin shift only (origin choices)
  for (let a = 0; a < 8; a++)
    for (let b = 0; b < 8; b++)
      for (let c = 0; c < 8; c++) {
        const p = [3 * a, 3 * b, 3 * c];
        if (tryP([1, 0, 0, 0, 1, 0, 0, 0, 1], p)) {
          const f = (v: number) => (v === 0 ? '0' : `${v / 3}/8`.replace('4/8', '1/2').replace('2/8', '1/4').replace('6/8', '3/4'));
          return `a,b,c;${p.map(f).join(',')}`;
        }
      }
  return null;
}

/**
 * Rank the space-group settings the data allow.
 *
 * Evidence combined per candidate setting (natural-log units):
 * - Laue class: agreement of symmetry-related intensities per rotation (laue-evidence.ts),
 *   rotations the file was evidently merged under, and a soft metric penalty;
 * - absences: per-reflection log-odds absent:present summed over the reflections the
 *   candidate forbids (exact for overlapping conditions), plus the missing-class evidence of
 *   filtered files (absence-evidence.ts);
 * - centrosymmetry: the N(z) and second-moment log-odds (intensity-statistics.ts), added to
 *   centrosymmetric candidates.
 * Prior: uniform over Laue classes the metric allows, then over classes of indistinguishable
 * candidates within each, then over the settings of a class.
 * Probabilities are the normalised posteriors. Linear in the number of reflections.
 */
export function rankSpaceGroups(input: ReflectionTable, options: RankOptions = {}, onProgress?: RankProgress): Result<RankResult> {
  const progress = (f: number, stage: string) => {
    if (onProgress && onProgress(f, stage) === false) throw new RankCancelled();
  };
  try {
    return rankInner(input, options, progress);
  } catch (e) {
    if (e instanceof RankCancelled) return fail('ranking cancelled');
    throw e;
  }
}

class RankCancelled extends Error {}

function rankInner(input: ReflectionTable, options: RankOptions, progress: (f: number, s: string) => void): Result<RankResult> {
  const src = input.meta.source;
  const warnings: string[] = [];
  // rows the reader refused explain a short table; name them so the user knows where to look
  const m = input.meta;
  const refused = m.rejectedCount > 0
    ? ` (${m.rejectedCount} of the ${m.rowsInFile} rows in the file were rejected: ${Object.entries(m.rejectedByReason).map(([r, c]) => `${c} ${r}`).join(', ')})`
    : '';
  if (input.n === 0) return fail(`no reflections to analyse${refused}: nothing can be concluded about the space group`, { file: src });
  if (input.n < MIN_REFLECTIONS)
    return fail(
      `only ${input.n} reflection${input.n === 1 ? '' : 's'}${refused}: too few to test reflection conditions or intensity statistics (at least ${MIN_REFLECTIONS} needed)`,
      { file: src },
      'Use the full data set (merged or unmerged) from the integration.',
    );
  let allZero = true;
  for (let j = 0; j < input.n; j++) if (input.i[j] !== 0) { allZero = false; break; }
  if (allZero)
    return fail('every intensity is zero: neither absences nor the Laue class can be judged from these data', { file: src }, 'Check that the measured intensity column was exported (placeholder or calculated columns hold zeros).');

  const cellParams = options.cell ?? input.meta.cell;
  if (!cellParams)
    return fail('the file gives no unit cell, and ranking needs one (candidate settings must fit the metric)', { file: src }, 'Give it with --cell a,b,c,alpha,beta,gamma.');
  const cellR = makeCell(cellParams, { file: src });
  if (!cellR.ok) return cellR;
  const cell = cellR.value;

  // --- sigmas, merging
  const est = estimateSigmas(input);
  let table = est.table;
  if (est.estimated) warnings.push(`the file gives no standard uncertainties: they were estimated (${SIGMA_ESTIMATE_RULE}), so the absence probabilities (and every probability below) are less reliable`);
  else if (est.patched) warnings.push(`${est.patched} reflections had a zero or missing sigma; an estimate was used for them`);
  let index = new HklIndex(table);
  let rInt: number | null = null;
  let mergedFromUnmerged = false;
  let kFromRepeats = NaN;
  const observations = table.n;
  if (index.duplicates > 0 || table.meta.unmerged) {
    const m = mergeIdentical(table);
    table = m.table;
    index = new HklIndex(table);
    mergedFromUnmerged = true;
    rInt = Number.isFinite(m.rInt) ? m.rInt : null;
    kFromRepeats = m.sigmaScale;
    warnings.push(
      `unmerged input: ${m.observations} observations merged into ${m.unique} unique indices` +
        (rInt !== null ? ` (R_int = ${rInt.toFixed(3)} over ${m.repeated} repeated indices)` : '') +
        '; symmetry-equivalent indices were kept apart for the Laue-class test',
    );
  }
  const n = table.n;
  progress(0.1, 'candidates');

  // --- candidates
  const tol: MetricTolerance = { ...DEFAULT_TOLERANCE, ...options.tolerance };
  let cands = candidateSettings(options.settings ?? allSettings(), cell, tol);
  if (options.chiral) cands = cands.filter((c) => c.setting.sohncke);
  if (cands.length === 0)
    return fail(
      `no space-group setting fits the cell ${fmtCell(cell)} within ${tol.lengthPercent} % and ${tol.angleDeg} degrees`,
      { file: src },
      'Check the cell, or widen the tolerance.',
    );
  const maxSystem = cands.reduce((a, c) => Math.max(a, c.setting.rotations.length), 1);
  if (maxSystem === 1 || cands.every((c) => c.setting.crystalSystem === 'triclinic'))
    warnings.push('the cell metric allows only triclinic groups within the tolerance; only P 1 and P -1 are compared');

  // --- proper rotations and Laue classes
  const candRot = cands.map((c) => properRotations(c.setting));
  const union = distinctRotations(candRot.flat());
  const laueKeyOf = (rots: number[][]) => rots.map(rotationKeyText).sort().join(';');
  const laueKeys = candRot.map(laueKeyOf);

  // --- general reflections (not fixed up to sign by any candidate rotation)
  const stol2 = stolSquaredColumn(cell, table);
  const general = new Uint8Array(n);
  // hR = +-h holds for R exactly when it holds for R^-1, so the union without inverses suffices
  const unionAll = union;
  for (let j = 0; j < n; j++) {
    const h = table.h[j], k = table.k[j], l = table.l[j];
    let g = 1;
    if (h === 0 && k === 0 && l === 0) g = 0;
    for (let q = 0; g && q < unionAll.length; q++) {
      const r = unionAll[q];
      const h2 = h * r[0] + k * r[3] + l * r[6], k2 = h * r[1] + k * r[4] + l * r[7], l2 = h * r[2] + k * r[5] + l * r[8];
      if ((h2 === h && k2 === k && l2 === l) || (h2 === -h && k2 === -k && l2 === -l)) g = 0;
    }
    general[j] = g;
  }

  // --- distinct conditions of the candidates
  const condList: ConditionLike[] = [];
  const condIndex = new Map<string, number>();
  const candConds = cands.map((c) =>
    c.setting.conditions.map((cond) => {
      const key = conditionKey(cond);
      let id = condIndex.get(key);
      if (id === undefined) { id = condList.length; condIndex.set(key, id); condList.push(cond); }
      return id;
    }),
  );

  // --- sigma scale: repeats, else negatives (refined from symmetry pairs below)
  let k = 1, kSource = 'assumed 1 (too few repeats, pairs or negative intensities to estimate it)';
  if (Number.isFinite(kFromRepeats)) { k = kFromRepeats; kSource = 'repeated measurements'; }
  else {
    const neg = sigmaScaleFromNegatives(table);
    if (Number.isFinite(neg.k)) { k = neg.k; kSource = `${neg.negatives} negative intensities`; }
  }

  // --- pass 1 normalisation
  let use = general.slice();
  let shells = buildShells(table, stol2, use);
  let expected = expectedIntensityColumn(shells, stol2, n);
  const e2 = new Float64Array(n), sE = new Float64Array(n);
  const normalise = () => {
    for (let j = 0; j < n; j++) { e2[j] = table.i[j] / expected[j]; sE[j] = (k * table.sigma[j]) / expected[j]; }
  };
  normalise();
  progress(0.3, 'Laue class');

  // --- absences, pass 1: reflections forbidden by a clearly obeyed condition (lattice centring
  // above all) are left out of the normalisation, the statistics and the Laue test, where pairs
  // of zeros would agree trivially and dilute the shell means.
  const model = { k, violationFraction: 0.03 };
  // a sample of 200,000 reflections is plenty to see which conditions clearly hold
  let abs = absenceEvidence(table, expected, condList, model, Math.max(1, Math.floor(n / 200_000)), undefined, general);
  // "clearly obeyed": near-certain, and hardly any strong reflection among those it forbids
  // (a class mixing absent and present reflections can still score high on the many zeros)
  const clearConditions = () => abs.conditions
    .filter((c) => c.probabilityAbsent > 0.999 && c.n >= 10 && c.nStrong <= Math.max(2, 0.02 * c.n))
    .map((c) => c.condition);
  // A general reflection lies in no zone of any candidate, so only the zoneless (centring)
  // conditions can forbid it; the zonal ones are tested on the special reflections only.
  const excludeClear = () => {
    const clear = clearConditions().filter((c) => c.zone.length === 0).map(compileForbids);
    let changed = 0;
    // use[j] is 0 for special reflections (it starts as `general` and only takes general[j] or 0)
    for (let j = 0; j < n; j++) {
      if (!use[j] && !general[j]) continue;
      let out = false;
      for (let q = 0; q < clear.length && !out; q++) out = clear[q](table.h[j], table.k[j], table.l[j]);
      const u = out ? 0 : general[j];
      if (u !== use[j]) { use[j] = u; changed++; }
    }
    return changed;
  };
  const laueUse = new Uint8Array(n).fill(1);
  const refreshLaueUse = () => {
    const conds = clearConditions();
    const all = conds.map(compileForbids);
    const zoneless = conds.filter((c) => c.zone.length === 0).map(compileForbids);
    for (let j = 0; j < n; j++) {
      const clear = general[j] ? zoneless : all;
      let out = false;
      for (let q = 0; q < clear.length && !out; q++) out = clear[q](table.h[j], table.k[j], table.l[j]);
      laueUse[j] = out ? 0 : 1;
    }
  };
  if (excludeClear() > 0) {
    shells = buildShells(table, stol2, use);
    expected = expectedIntensityColumn(shells, stol2, n);
    normalise();
  }
  refreshLaueUse();
  // --- Laue evidence
  const pairCache: RotationPairCache = {};
  let agreements = rotationAgreements(table, e2, sE, union, index, expected, k, laueUse, pairCache);
  const inClass = (key: string, r: number[]) => {
    const set = key.split(';');
    return set.includes(rotationKeyText(r)) || set.includes(rotationKeyText(inverseRotation(r)));
  };
  // refine k from pairs of rotations that clearly hold
  if (!Number.isFinite(kFromRepeats)) {
    const good = agreements.filter((a) => a.logOdds > 3).map((a) => a.r);
    if (good.length) {
      const p = sigmaScaleFromPairs(table, good, index);
      if (Number.isFinite(p.k)) {
        const changed = Math.abs(p.k - k) > 0.1 * k;
        k = p.k; kSource = `${p.pairs} weak symmetry-equivalent pairs`;
        model.k = k;
        normalise();
        if (changed) agreements = rotationAgreements(table, e2, sE, union, index, expected, k, laueUse, pairCache);
      }
    }
  }
  // A class can be the one the file was merged under only if its asymmetric unit holds as
  // many reflections as the file has: lattice points in the resolution sphere,
  // (4/3) pi (1/d_min)^3 V, times the share the (clearly obeyed or filtered) centring
  // allows, over the Laue group order. Without this, rotations of a larger group would look
  // "merged" merely because the file's asymmetric unit happens to hold no pair for them.
  let folded = 0, s2max = 0;
  for (let j = 0; j < n; j++) {
    const q = index.find(-table.h[j], -table.k[j], -table.l[j]);
    if (q < 0 || q > j) folded++;
    if (stol2[j] > s2max) s2max = stol2[j];
  }
  const centring = abs.conditions.filter((c) => c.condition.zone.length === 0 &&
    (c.forbiddenClassMissing || (c.probabilityAbsent > 0.999 && c.nStrong <= Math.max(2, 0.02 * c.n))));
  const centringTests = centring.map((c) => compileForbids(c.condition));
  let allowedPoints = 0;
  for (let h = -6; h <= 6; h++)
    for (let kk = -6; kk <= 6; kk++)
      for (let l = -6; l <= 6; l++) if (!centringTests.some((f) => f(h, kk, l))) allowedPoints++;
  const latticePoints = (4 / 3) * Math.PI * (2 * Math.sqrt(s2max)) ** 3 * cell.volume * (allowedPoints / 13 ** 3);
  // share of the class's asymmetric unit the file fills if it was merged under that class
  const fillOf = (key: string) => (latticePoints > 0 ? (folded * 2 * key.split(';').length) / latticePoints : Infinity);
  // merged under a class: the file fills most of that class's asymmetric unit (a smaller
  // share points to a larger group whose asymmetric unit happens to hold no pairs for this
  // class's rotations). The estimate ignores the smaller orbits of special reflections, so it
  // can exceed 1 for small cells of high symmetry; only a clear excess rules the class out.
  const mergedPlausible = (key: string) => { const f = fillOf(key); return f >= 0.6 && f <= 2; };

  const laueClasses = new Map<string, { members: number[]; ll: number }>();
  laueKeys.forEach((key, c) => {
    let e = laueClasses.get(key);
    if (!e) {
      let ll = metricLogPenalty(cands[c].fit);
      const canBeMerged = mergedPlausible(key);
      for (const a of agreements) {
        if (!inClass(key, a.r)) continue;
        ll += a.logOdds + (a.merged && canBeMerged ? MERGED_ROTATION_LOG_ODDS : 0);
      }
      e = { members: [], ll };
      laueClasses.set(key, e);
    }
    e.members.push(c);
  });
  progress(0.5, 'absences');

  // --- absences, pass 2 with the final sigma scale and normalisation. A reflection on a
  // symmetry axis or plane is expected epsilon times stronger if present (Wilson 1949); epsilon
  // is counted over the proper rotations of the Laue class the symmetry evidence favours.
  let bestLaue = '';
  let bestLl = -Infinity;
  for (const [key, e] of laueClasses) if (e.ll > bestLl) { bestLl = e.ll; bestLaue = key; }
  const bestRot = bestLaue ? bestLaue.split(';').map((t) => t.split(',').map(Number)) : [];
  const withEpsilon = () => {
    const out = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      let eps = 1;
      if (!general[j]) {
        eps = 0;
        const h = table.h[j], kk = table.k[j], l = table.l[j];
        for (const r of bestRot)
          if (h * r[0] + kk * r[3] + l * r[6] === h && h * r[1] + kk * r[4] + l * r[7] === kk && h * r[2] + kk * r[5] + l * r[8] === l) eps++;
        eps = Math.max(1, eps);
      }
      out[j] = expected[j] * eps;
    }
    return out;
  };
  // reflections perpendicular to a 2-fold of that class are centric in some of its groups
  const centricZone = new Uint8Array(n);
  for (let j = 0; j < n; j++) {
    if (general[j]) continue;
    const h = table.h[j], kk = table.k[j], l = table.l[j];
    for (const r of bestRot)
      if (h * r[0] + kk * r[3] + l * r[6] === -h && h * r[1] + kk * r[4] + l * r[7] === -kk && h * r[2] + kk * r[5] + l * r[8] === -l) { centricZone[j] = 1; break; }
  }
  abs = absenceEvidence(table, withEpsilon(), condList, model, 1, centricZone, general);
  const changedNow = excludeClear();
  if (changedNow > 0) {
    shells = buildShells(table, stol2, use);
    expected = expectedIntensityColumn(shells, stol2, n);
    normalise();
    // the shell means move by the share of reflections that changed; re-weigh only if it matters
    if (changedNow > 0.01 * n) abs = absenceEvidence(table, withEpsilon(), condList, model, 1, centricZone, general);
  }
  // A file reduced to one asymmetric unit holds one reflection per orbit, so a zone may be
  // empty only because its reflections are stored under an equivalent index. Then the
  // missing-class test looks at orbits: a class counts as missing only if no stored
  // reflection has an equivalent in it.
  const bestMerged = bestLaue !== '' && agreements.some((a) => a.merged && inClass(bestLaue, a.r)) && fillOf(bestLaue) <= 2;
  if (bestMerged) abs = withOrbitMissingClasses(abs, table, bestRot);
  progress(0.7, 'statistics');

  // --- intensity statistics on general, non-absent reflections
  const statsRaw = intensityStatistics(table, e2, sE, use, index);
  // A file of "observed" reflections only (an I/sigma cutoff, or negatives dropped) lacks the
  // weak end of the distribution that tells centric from acentric: halve that evidence.
  let nNeg = 0, nWeakObs = 0;
  for (let j = 0; j < n; j++) {
    if (table.i[j] < 0) nNeg++;
    if (table.sigma[j] > 0 && table.i[j] < table.sigma[j]) nWeakObs++;
  }
  const cutOff = n >= 200 && nNeg === 0 && nWeakObs < 0.01 * n;
  const stats = cutOff
    ? { ...statsRaw, centricLogOdds: 0.5 * statsRaw.centricLogOdds, probabilityCentric: 1 / (1 + Math.exp(-0.5 * statsRaw.centricLogOdds)) }
    : statsRaw;
  if (cutOff)
    warnings.push(
      `no negative intensities and only ${nWeakObs} reflections below 1 sigma: the file seems to hold "observed" reflections only ` +
        '(a cutoff), which removes the weak end of the intensity distribution; the centric/acentric evidence was halved',
    );
  const wilson = wilsonPlot(shells);

  // --- candidate scores
  // Each distinct condition as the bit set of the indices (|h|,|k|,|l| <= 6) it forbids: enough
  // for moduli up to 6 and every zone of the table. Subsets and candidate signatures follow
  // from word operations.
  const SAMPLE_WORDS = Math.ceil(13 ** 3 / 32);
  const condBits = condList.map((c) => {
    const f = compileForbids(c);
    const bits = new Uint32Array(SAMPLE_WORDS);
    let q = 0;
    for (let h = -6; h <= 6; h++)
      for (let kk = -6; kk <= 6; kk++)
        for (let l = -6; l <= 6; l++, q++) if (f(h, kk, l)) bits[q >>> 5] |= 1 << (q & 31);
    return bits;
  });
  const isSubset = (a: number, b: number) => {
    const A = condBits[a], B = condBits[b];
    for (let w = 0; w < SAMPLE_WORDS; w++) if ((A[w] & ~B[w]) !== 0) return false;
    return true;
  };
  // --- indistinguishability classes
  const candBits = cands.map((_, ci) => {
    const bits = new Uint32Array(SAMPLE_WORDS);
    for (const id of candConds[ci]) for (let w = 0; w < SAMPLE_WORDS; w++) bits[w] |= condBits[id][w];
    return bits;
  });
  const sig = cands.map((c, ci) => `${laueKeys[ci]}|${c.setting.centrosymmetric}|${Array.from(candBits[ci], (x) => x.toString(36)).join('.')}`);
  const classIdOfSig = new Map<string, number>();
  const classMembers: number[][] = [];
  sig.forEach((s, ci) => {
    let id = classIdOfSig.get(s);
    if (id === undefined) { id = classMembers.length; classIdOfSig.set(s, id); classMembers.push([]); }
    classMembers[id].push(ci);
  });
  // Prior: uniform over the Laue classes the metric allows, then over the classes of
  // indistinguishable candidates within each, then over the settings of a class, so that a
  // family with many settings (P 2 2 2, P m m 2, P 2 m m, P m 2 m) gains nothing by number.
  const classesInLaue = new Map<string, Set<number>>();
  sig.forEach((_, ci) => {
    const key = laueKeys[ci];
    if (!classesInLaue.has(key)) classesInLaue.set(key, new Set());
    classesInLaue.get(key)!.add(classIdOfSig.get(sig[ci])!);
  });
  const missingConds = abs.conditions.map((c, id) => (c.logOddsMissing > 0 ? id : -1)).filter((id) => id >= 0);
  // Points of each missing condition's zone over whole periods (-12..11 covers every modulus
  // up to 6 an exact number of times), origin excluded: the shares of the zone a candidate and
  // the condition leave allowed follow by counting.
  const missingZonePoints = new Map<number, Int32Array>();
  for (const id of missingConds) {
    const zone = condList[id].zone;
    const pts: number[] = [];
    for (let h = -12; h < 12; h++)
      for (let kk = -12; kk < 12; kk++)
        for (let l = -12; l < 12; l++) {
          if (h === 0 && kk === 0 && l === 0) continue;
          if (zone.every((e) => e[0] * h + e[1] * kk + e[2] * l === 0)) pts.push(h, kk, l);
        }
    missingZonePoints.set(id, Int32Array.from(pts));
  }
  // per missing condition: the zone points each condition forbids, as bit sets (made on first use)
  const zoneForbidden = new Map<number, (Uint32Array | undefined)[]>();
  const forbiddenInZone = (id: number, q: number): Uint32Array => {
    let row = zoneForbidden.get(id);
    if (!row) { row = new Array<Uint32Array | undefined>(condList.length); zoneForbidden.set(id, row); }
    let bits = row[q];
    if (!bits) {
      const pts = missingZonePoints.get(id)!;
      const f = compileForbids(condList[q]);
      bits = new Uint32Array(Math.ceil(pts.length / 96));
      for (let e = 0, p = 0; e < pts.length; e += 3, p++) if (f(pts[e], pts[e + 1], pts[e + 2])) bits[p >>> 5] |= 1 << (p & 31);
      row[q] = bits;
    }
    return bits;
  };
  const popcount = (x: number) => {
    x -= (x >>> 1) & 0x55555555;
    x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
    return (Math.imul((x + (x >>> 4)) & 0x0f0f0f0f, 0x01010101) >>> 24);
  };
  /**
   * The share of a missing class's evidence that counts against a candidate: with C the zone
   * positions the candidate allows and A those the condition allows, the N observed reflections
   * all falling in A has probability (|A and C| / |C|)^N under the candidate, against (1/m)^N
   * when it forbids nothing there. A 4_2 axis (00l: l = 2n) thus leaves half of the evidence of
   * a missing l = 4n class unexplained (log 2 of log 4), not all of it.
   */
  const unexplainedShare = (id: number, ci: number): number => {
    const nPts = missingZonePoints.get(id)!.length / 3;
    const own = forbiddenInZone(id, id);
    const mine = candConds[ci].map((q) => forbiddenInZone(id, q));
    let nC = 0, nAC = 0;
    for (let w = 0; w < own.length; w++) {
      let cf = 0;
      for (const m of mine) cf |= m[w];
      // bits past the last point are zero in every set, so count them as allowed and subtract below
      const allowedC = ~cf >>> 0;
      nC += popcount(allowedC);
      nAC += popcount((allowedC & ~own[w]) >>> 0);
    }
    const pad = own.length * 32 - nPts;
    nC -= pad;
    nAC -= pad;
    if (nC <= 0 || nAC <= 0) return 1;
    return Math.max(0, Math.min(1, Math.log(nC / nAC) / Math.log(condList[id].modulus)));
  };
  const scores = cands.map((c, ci) => {
    const mine = new Set(candConds[ci]);
    let absLo = 0;
    for (const p of abs.patterns) if (p.ids.some((id) => mine.has(id))) absLo += p.logOdds;
    // Missing-class evidence: a class of positions absent from the file that this candidate
    // does not forbid must be missing by chance; each such class counts against it, the
    // largest classes only (a class inside another missing class adds nothing), for the share
    // the candidate's own conditions leave unexplained.
    const bits = candBits[ci];
    const unexplained = missingConds.filter((id) => {
      const cb = condBits[id];
      for (let w = 0; w < SAMPLE_WORDS; w++) if ((cb[w] & ~bits[w]) !== 0) return true;
      return false;
    });
    let missLo = 0;
    unexplained.forEach((a, ia) => {
      const redundant = unexplained.some((b, ib) => b !== a && isSubset(a, b) && (!isSubset(b, a) || ib < ia));
      if (!redundant) missLo -= abs.conditions[a].logOddsMissing * unexplainedShare(a, ci);
    });
    const laue = laueClasses.get(laueKeys[ci])!;
    const centric = c.setting.centrosymmetric ? stats.centricLogOdds : 0;
    const cls = classIdOfSig.get(sig[ci])!;
    const logPrior = -Math.log(classesInLaue.get(laueKeys[ci])!.size) - Math.log(classMembers[cls].length);
    const logPost = laue.ll + logPrior + absLo + missLo + centric;
    return { laue: laue.ll, absLo, missLo, centric, logPost };
  });
  const probs = softmax(scores.map((s) => s.logPost));

  const classProb = classMembers.map((m) => m.reduce((a, ci) => a + probs[ci], 0));
  const classOf = new Int32Array(cands.length);
  classMembers.forEach((m, id) => m.forEach((ci) => (classOf[ci] = id)));
  progress(0.85, 'report');

  // --- reports
  const all = allSettings();
  const standardOf = new Map<number, SpaceGroupSetting>();
  for (const s of all) if (!standardOf.has(s.number)) standardOf.set(s.number, s);

  // Classes of indistinguishable candidates are what the data decide: order by class
  // probability, then by candidate within a class.
  const order = cands.map((_, ci) => ci).sort((a, b) => classProb[classOf[b]] - classProb[classOf[a]] || probs[b] - probs[a] || cands[a].setting.index - cands[b].setting.index);
  // class ids in order of first appearance
  const classRank = new Map<number, number>();
  for (const ci of order) if (!classRank.has(classOf[ci])) classRank.set(classOf[ci], classRank.size);

  // Probability that each condition holds, judged on the reflections it forbids beyond those
  // the best candidate already forbids (all of them for the best candidate's own conditions):
  // otherwise "h+k+l = 2n" would look obeyed in F-centred data, where most of the reflections
  // it forbids are absent for another reason.
  const bestSet = new Set(candConds[order[0]]);
  const condProbability = abs.conditions.map((c, id) => {
    let lo = c.logOddsMissing;
    for (const p of abs.patterns) {
      if (!p.ids.includes(id)) continue;
      if (!bestSet.has(id) && p.ids.some((q) => bestSet.has(q))) continue;
      lo += p.logOdds;
    }
    return 1 / (1 + Math.exp(-Math.max(-700, Math.min(700, lo))));
  });
  const condReports: ConditionReport[] = abs.conditions.map((c, j) => ({
    text: c.condition.text,
    zone: c.condition.zone.map((e) => [...e]),
    coeffs: [...c.condition.coeffs],
    modulus: c.condition.modulus,
    n: c.n,
    mean_i_over_sigma: Number.isFinite(c.meanIOverSigma) ? round(c.meanIOverSigma, 2) : null,
    n_strong: c.nStrong,
    probability_absent: round(condProbability[j], 4),
    n_zone: c.nZone,
    weak_violations: c.nWeakViolations,
    forbidden_class_missing: c.forbiddenClassMissing,
    log_odds: round(c.logOddsIntensities + c.logOddsMissing, 2),
  }));
  const candidates: CandidateReport[] = order.map((ci, rank) => {
    const s = cands[ci].setting;
    const std = standardOf.get(s.number)!;
    const isStd = std.hm === s.hm;
    const ids = [...new Set(candConds[ci])];
    const against: CandidateReport['against'] = [];
    const seen = new Set<number>();
    for (const id of ids)
      for (const row of abs.conditions[id].strongest) {
        if (seen.has(row)) continue;
        seen.add(row);
        against.push({
          h: table.h[row], k: table.k[row], l: table.l[row],
          i_over_sigma: round(table.i[row] / table.sigma[row], 1), condition: condList[id].text,
        });
      }
    against.sort((a, b) => b.i_over_sigma - a.i_over_sigma);
    return {
      number: s.number,
      hm: s.hm,
      hall: s.hall,
      probability: round(classProb[classOf[ci]], 5),
      setting_probability: round(probs[ci], 5),
      class_id: classRank.get(classOf[ci])!,
      laue: s.laue,
      crystal_system: s.crystalSystem,
      centrosymmetric: s.centrosymmetric,
      sohncke: s.sohncke,
      standard: isStd,
      change_of_basis: !isStd && rank === 0 ? findChangeToStandard(s, std) : null,
      metric_deviation: { length_percent: round(cands[ci].fit.lengthPercent, 3), angle_deg: round(cands[ci].fit.angleDeg, 3) },
      evidence: {
        laue: round(scores[ci].laue, 2),
        absences: round(scores[ci].absLo, 2),
        missing_classes: round(scores[ci].missLo, 2),
        centric: round(scores[ci].centric, 2),
      },
      conditions: ids.map((id) => {
        const c = abs.conditions[id];
        return {
          text: condList[id].text,
          n: c.n,
          mean_i_over_sigma: Number.isFinite(c.meanIOverSigma) ? round(c.meanIOverSigma, 2) : null,
          n_strong: c.nStrong,
          probability_absent: round(condProbability[id], 4),
          forbidden_class_missing: c.forbiddenClassMissing,
        };
      }),
      against: against.slice(0, 5),
    };
  });
  const classes: ClassReport[] = [...classRank.entries()]
    .sort((a, b) => a[1] - b[1])
    .map(([cid, id]) => {
      const members = classMembers[cid].map((ci) => cands[ci].setting);
      return { id, probability: round(classProb[cid], 5), members: members.map((m) => m.hm), separated_by: describeSeparation(members) };
    });

  // Laue classes report
  const laueEntries = [...laueClasses.entries()];
  const laueSym = softmax(laueEntries.map(([, e]) => e.ll));
  const laueReports: LaueClassReport[] = laueEntries
    .map(([key, e], j) => {
      const s = cands[e.members[0]].setting;
      const axes = union.filter((r) => inClass(key, r)).map((r) => agreements.find((a) => a.r === r)!.label);
      return {
        symbol: s.laue,
        axes: axes.length ? axes.join(', ') : 'no rotation axes',
        probability: round(e.members.reduce((a, ci) => a + probs[ci], 0), 5),
        probability_from_symmetry: round(laueSym[j], 5),
        log_likelihood: round(e.ll, 2),
        settings: e.members.length,
      };
    })
    .sort((a, b) => b.probability - a.probability);

  // --- warnings about thin evidence
  const top = order[0];
  const topS = cands[top].setting;
  let dMin = Infinity, dMax = 0, negatives = 0;
  for (let j = 0; j < n; j++) {
    if (stol2[j] > 0) { const d = 0.5 / Math.sqrt(stol2[j]); if (d < dMin) dMin = d; if (d > dMax) dMax = d; }
    if (table.i[j] < 0) negatives++;
  }
  const completeness = estimateCompleteness(table, candRot[top], cell.volume, s2max, topS);
  if (completeness !== null && completeness < 0.7)
    warnings.push(`completeness is about ${(100 * completeness).toFixed(0)} % in Laue class ${topS.laue}: missing reflections may hide violations of the conditions`);
  if (n < 500) warnings.push(`only ${n} reflections: the statistics are thin and the probabilities should be read as rough`);
  const negFrac = negatives / n;
  if (negFrac > 0.3) warnings.push(`${(100 * negFrac).toFixed(0)} % of the intensities are negative: the data are weak or the background over-subtracted`);
  const topIds = [...new Set(candConds[top])];
  for (const id of topIds) {
    const c = abs.conditions[id];
    if (c.n > 0 && c.n < 5 && !c.forbiddenClassMissing)
      warnings.push(`the condition ${condList[id].text} rests on only ${c.n} measured reflection${c.n > 1 ? 's' : ''}`);
    if (c.n === 0 && !c.forbiddenClassMissing)
      warnings.push(`the condition ${condList[id].text} is untested: no reflection of its zone was measured`);
    // 3-6 sigma among absent reflections beyond what the Gaussian tail of their errors gives
    const tail = c.n * (normalCdf(-3 / k) - normalCdf(-6 / k));
    if (c.nWeakViolations > tail + 3 * Math.sqrt(tail) + 1 && c.nStrong <= Math.max(2, 0.05 * c.n))
      warnings.push(`${c.nWeakViolations} reflection${c.nWeakViolations > 1 ? 's' : ''} forbidden by ${condList[id].text} show${c.nWeakViolations > 1 ? '' : 's'} 3-6 sigma: weak violations of the kind multiple diffraction produces`);
  }
  const missingTop = topIds.filter((id) => abs.conditions[id].forbiddenClassMissing);
  const absencesRemoved = missingTop.some((id) => abs.conditions[id].nZone >= 10);
  if (absencesRemoved)
    warnings.push(
      'absences appear to have been removed from this file: no reflection at all was found where ' +
        missingTop.map((id) => condList[id].text).join(', ') + ' forbids one, while the zones are well sampled. ' +
        'That pattern was counted as evidence, with reduced weight, since it mirrors whoever filtered the file',
    );
  const topLaueKey = laueKeys[top];
  const topRotations = agreements.filter((a) => inClass(topLaueKey, a.r));
  if (topRotations.length > 0 && topRotations.every((a) => a.pairs === 0))
    warnings.push(
      `the file holds no pair of reflections related by the rotations of Laue class ${topS.laue}: it was evidently reduced to one ` +
        'asymmetric unit, so the Laue class rests on how the file was merged and on the cell, not on tested intensities',
    );
  for (const a of agreements) {
    if (!inClass(topLaueKey, a.r) && a.pairs >= 20 && a.cc > 0.5)
      warnings.push(`pseudo-symmetry: the ${a.label} outside the chosen Laue class still relates intensities with CC = ${a.cc.toFixed(2)} over ${a.pairs} pairs`);
  }
  if (stats.lTest.pairs >= 50 && stats.lTest.meanAbsL < 0.44)
    warnings.push(`the L-test gives <|L|> = ${stats.lTest.meanAbsL.toFixed(3)} (0.5 untwinned, 0.375 perfect twin; Padilla & Yeates 2003): possible twinning, which also masks centric/acentric statistics (a heavy atom dominating the intensities, e.g. on a special position, lowers <|L|> too)`);
  if (stats.n < 100) warnings.push(`only ${stats.n} general reflections for the centric/acentric test: treat it as weak evidence`);
  // A lattice of higher symmetry in another basis (e.g. a C-centred monoclinic lattice indexed
  // on its reduced triclinic cell) cannot be tested in these axes: say how to reindex.
  // best metric fit in these axes per holohedry order
  const bestFitHere = new Map<number, number>();
  cands.forEach((c, ci) => {
    const order = 2 * candRot[ci].length;
    bestFitHere.set(order, Math.min(bestFitHere.get(order) ?? Infinity, c.fit.angleDeg));
  });
  const signedPermutation = (m: number[]) =>
    [0, 1, 2].every((i) => [0, 1, 2].filter((j) => m[3 * i + j] !== 0).length === 1 && [0, 1, 2].some((j) => Math.abs(m[3 * i + j]) === 1));
  const bravais = findBravaisCandidates(cell.params(), { toleranceDeg: tol.angleDeg });
  if (bravais.ok) {
    const better = bravais.value.candidates.find((b) => {
      const order = HOLOHEDRY_ORDER[b.bravais];
      if (signedPermutation(basisMatrix(b.transform))) return false;
      const here = [...bestFitHere.entries()].filter(([o]) => o >= order).reduce((a, [, f]) => Math.min(a, f), Infinity);
      return b.deviationDeg < here - 0.1;
    });
    if (better)
      warnings.push(
        `in another basis the lattice metric fits ${better.bravais} (deviation ${better.deviationDeg.toFixed(2)} degrees), which these axes cannot show: ` +
          `reindex with the change of basis ${formatChangeOfBasis(better.transform)} (lacuna reindex) and rank again`,
      );
  }
  // The best class and the next differ only by a centre of symmetry: say which way and how weakly.
  const second = order.find((ci) => classOf[ci] !== classOf[top]);
  if (second !== undefined && laueKeys[second] === laueKeys[top] && cands[second].setting.centrosymmetric !== topS.centrosymmetric &&
      sig[second].split('|')[2] === sig[top].split('|')[2]) {
    const other = cands[second].setting;
    warnings.push(
      `${topS.hm} and ${other.hm} have the same Laue class and the same absences; only the centre of symmetry separates them, ` +
        `and the intensity statistics (probability centrosymmetric ${stats.probabilityCentric.toFixed(2)}) are a weak guide: ` +
        'pseudo-centrosymmetric structures and heavy atoms imitate centric statistics. Try both in structure solution',
    );
  }
  const topClassP = classProb[classOf[top]];
  if (topClassP < 0.5) warnings.push(`the data do not single out one group: the best class of indistinguishable candidates has probability ${topClassP.toFixed(2)}`);
  progress(1, 'done');

  return ok({
    input: {
      source: src,
      reflections: n,
      observations,
      merged_from_unmerged: mergedFromUnmerged,
      r_int: rInt === null ? null : round(rInt, 4),
      sigmas_estimated: est.estimated,
      negative_fraction: round(negFrac, 4),
      d_min: round(dMin, 3),
      d_max: round(dMax, 3),
      completeness: completeness === null ? null : round(completeness, 3),
    },
    cell: cell.params(),
    tolerance: tol,
    laue: {
      classes: laueReports,
      rotations: agreements.map((a) => ({
        rotation: rotationKeyText(a.r), label: a.label, pairs: a.pairs, cc: Number.isFinite(a.cc) ? round(a.cc, 3) : null,
        cc_expected: round(a.ccExpected, 3), merged: a.merged, log_odds: round(a.logOdds, 2),
      })),
    },
    statistics: {
      sigma_scale: round(k, 3),
      sigma_scale_source: kSource,
      wilson_b: round(wilson.b, 2),
      wilson_ln_scale: round(wilson.lnScale, 3),
      general_reflections: stats.n,
      mean_abs_e2_minus_1: round(stats.meanAbsE2Minus1, 3),
      second_moment: round(stats.secondMoment, 3),
      theory: THEORY,
      nz: {
        z: [...stats.nz.z], observed: stats.nz.observed.map((v) => round(v, 3)), acentric: stats.nz.acentric.map((v) => round(v, 3)),
        centric: stats.nz.centric.map((v) => round(v, 3)), acentric_with_errors: stats.nz.acentricWithErrors.map((v) => round(v, 3)),
        centric_with_errors: stats.nz.centricWithErrors.map((v) => round(v, 3)),
      },
      centric_fraction: round(stats.centricFraction, 3),
      centric_log_odds: round(stats.centricLogOdds, 2),
      probability_centric: round(stats.probabilityCentric, 4),
      l_test: { pairs: stats.lTest.pairs, mean_abs_l: round(stats.lTest.meanAbsL, 3), mean_l2: round(stats.lTest.meanL2, 3) },
      shells: Array.from({ length: shells.count }, (_, b) => ({
        d_min: round(0.5 / Math.sqrt(shells.stol2Max[b]), 3), n: shells.n[b], mean_i: round(shells.meanI[b], 3),
        mean_i_over_sigma: round(shells.meanIOverSigma[b], 2),
      })),
    },
    conditions: condReports,
    candidates,
    classes,
    absences_removed: absencesRemoved,
    warnings,
    caution: RANK_CAUTION,
  });
}

function round(x: number, digits: number): number {
  if (!Number.isFinite(x)) return x;
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

function fmtCell(c: CellParams): string {
  return [c.a, c.b, c.c, c.alpha, c.beta, c.gamma].map((v) => +v.toFixed(3)).join(', ');
}

/**
 * Completeness within the resolution sphere in the Laue class of `setting`: distinct
 * reflections modulo the Laue group over the expected number of lattice points,
 * (4/3) pi (1/d_min)^3 V / (|Laue group| * centring multiplicity).
 */
function estimateCompleteness(table: ReflectionTable, proper: number[][], volume: number, s2max: number, setting: SpaceGroupSetting): number | null {
  if (!(s2max > 0)) return null;
  const rots = proper.concat(proper.map((r) => r.map((v) => -v)));
  const seen = new Set<number>();
  const stride = table.n > 100_000 ? Math.ceil(table.n / 100_000) : 1;
  for (let j = 0; j < table.n; j += stride) {
    const h = table.h[j], k = table.k[j], l = table.l[j];
    let best = Infinity;
    for (const r of rots) {
      const key = ((h * r[0] + k * r[3] + l * r[6] + 2048) * 4096 + (h * r[1] + k * r[4] + l * r[7] + 2048)) * 4096 + (h * r[2] + k * r[5] + l * r[8] + 2048);
      if (key < best) best = key;
    }
    seen.add(best);
  }
  const dStarMax = 2 * Math.sqrt(s2max);
  const lattice = ((4 / 3) * Math.PI * dStarMax ** 3 * volume) / (rots.length * (1 + setting.centringVectors.length));
  // subsampling counts distinct orbits among the sampled rows only; scale back
  const unique = seen.size * stride;
  return lattice > 0 ? Math.min(1, unique / lattice) : null;
}

/**
 * Recount the missing-class evidence over orbits of the proper rotations `rots` (with Friedel
 * mates): a stored reflection stands for all its equivalents.
 */
function withOrbitMissingClasses(abs: AbsenceEvidence, table: ReflectionTable, rots: number[][]): AbsenceEvidence {
  const conds = abs.conditions.map((c) => c.condition);
  const nc = conds.length;
  const zoneRows = conds.map((c) => Int32Array.from(c.zone.flat()));
  const nZone = new Int32Array(nc), nForb = new Int32Array(nc);
  const zoneHit = new Uint8Array(nc), forbHit = new Uint8Array(nc);
  for (let j = 0; j < table.n; j++) {
    zoneHit.fill(0);
    forbHit.fill(0);
    const h0 = table.h[j], k0 = table.k[j], l0 = table.l[j];
    for (const r of rots) {
      const h = h0 * r[0] + k0 * r[3] + l0 * r[6], k = h0 * r[1] + k0 * r[4] + l0 * r[7], l = h0 * r[2] + k0 * r[5] + l0 * r[8];
      for (let c = 0; c < nc; c++) {
        const rows = zoneRows[c];
        let inZone = true;
        for (let e = 0; e < rows.length; e += 3) if (rows[e] * h + rows[e + 1] * k + rows[e + 2] * l !== 0) { inZone = false; break; }
        if (!inZone) continue;
        zoneHit[c] = 1;
        const co = conds[c].coeffs;
        if ((co[0] * h + co[1] * k + co[2] * l) % conds[c].modulus !== 0) forbHit[c] = 1;
      }
    }
    for (let c = 0; c < nc; c++) { nZone[c] += zoneHit[c]; nForb[c] += forbHit[c]; }
  }
  const conditions = abs.conditions.map((c, id): ConditionEvidence => {
    const missing = nForb[id] === 0 && nZone[id] >= MISSING_CLASS_MIN_ZONE;
    const logOddsMissing = nForb[id] === 0 ? missingClassLogOdds(nZone[id], c.condition.modulus) : 0;
    const total = c.logOddsIntensities + logOddsMissing;
    return {
      ...c,
      nZone: nZone[id],
      forbiddenClassMissing: missing,
      logOddsMissing,
      probabilityAbsent: 1 / (1 + Math.exp(-Math.max(-700, Math.min(700, total)))),
    };
  });
  return { ...abs, conditions };
}
