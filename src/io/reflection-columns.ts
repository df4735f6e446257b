import type { IntensityOrigin } from '../core';

/**
 * Which columns of a reflection file hold h, k, l, the measured value and its sigma.
 * CIF tags follow the IUCr core dictionary (`_refln_*`, `_diffrn_refln_*`) and the
 * mmCIF dictionary (`_refln.*`, `_diffrn_refln.*`); both styles are compared after
 * `normaliseTag` (lower case, `.` -> `_`), so `_refln.index_h` matches `_refln_index_h`.
 */
export const ROLE_SKIP = 0;
export const ROLE_H = 1;
export const ROLE_K = 2;
export const ROLE_L = 3;
export const ROLE_VALUE = 4;
export const ROLE_SIGMA = 5;

export interface ColumnPlan {
  /** One role per column. */
  readonly roles: Int8Array;
  readonly origin: IntensityOrigin;
  /** True for individual observations (_diffrn_refln). */
  readonly unmerged: boolean;
  /** False when the file has values but no sigma column: the reader then fills estimates. */
  readonly hasSigma: boolean;
  /** Human-readable names of the chosen columns (h, k, l, value and sigma when there is one), for messages. */
  readonly chosen: string[];
}

export function normaliseTag(tag: string): string {
  return tag.toLowerCase().replace(/\./g, '_');
}

interface ValuePair { value: string; sigma: readonly string[]; origin: IntensityOrigin }

/** Preferred first: intensities on the F^2 scale, then amplitudes. */
const REFLN_PAIRS: readonly ValuePair[] = [
  { value: '_refln_f_squared_meas', sigma: ['_refln_f_squared_sigma'], origin: 'intensity' },
  { value: '_refln_intensity_meas', sigma: ['_refln_intensity_sigma'], origin: 'intensity' },
  { value: '_refln_f_meas_au', sigma: ['_refln_f_meas_sigma_au'], origin: 'amplitude' },
  { value: '_refln_f_meas', sigma: ['_refln_f_sigma', '_refln_f_meas_sigma'], origin: 'amplitude' },
];
const DIFFRN_PAIRS: readonly ValuePair[] = [
  { value: '_diffrn_refln_intensity_net', sigma: ['_diffrn_refln_intensity_u', '_diffrn_refln_intensity_sigma'], origin: 'intensity' },
];

/** The tag categories that hold reflections, merged first. */
const CATEGORIES = [
  { prefix: '_refln_index_', pairs: REFLN_PAIRS, unmerged: false },
  { prefix: '_diffrn_refln_index_', pairs: DIFFRN_PAIRS, unmerged: true },
] as const;

/** True when a loop (normalised tags) holds Miller indices of reflections. */
export function isReflectionLoop(tags: readonly string[]): boolean {
  return CATEGORIES.some((c) => ['h', 'k', 'l'].every((x) => tags.includes(c.prefix + x)));
}

/**
 * Plan the columns of a CIF reflection loop. `override` (from --columns) names
 * five tags in the order h, k, l, value, sigma, or four (no sigma). A value column
 * without its sigma is accepted (`hasSigma` false). Returns an error message string
 * when the loop lacks what is needed.
 */
export function planCifColumns(tags: readonly string[], override?: readonly string[]): ColumnPlan | string {
  const roles = new Int8Array(tags.length);
  if (override) {
    if (override.length !== 5 && override.length !== 4)
      return `--columns for a CIF file names five tags: h, k, l, value, sigma (or four when there is no sigma; got ${override.length})`;
    const want = override.map(normaliseTag);
    for (let r = 0; r < want.length; r++) {
      const j = tags.indexOf(want[r]);
      if (j < 0) return `tag '${override[r]}' from --columns is not in the reflection loop`;
      roles[j] = r + 1;
    }
    const v = want[3];
    const origin: IntensityOrigin = /(^|_)f(_meas)?(_au)?$/.test(v) ? 'amplitude' : 'intensity';
    return { roles, origin, unmerged: v.startsWith('_diffrn_refln'), hasSigma: want.length === 5, chosen: [...override] };
  }
  for (const cat of CATEGORIES) {
    const hkl = ['h', 'k', 'l'].map((x) => tags.indexOf(cat.prefix + x));
    if (hkl.some((j) => j < 0)) continue;
    for (const pair of cat.pairs) {
      const jv = tags.indexOf(pair.value);
      if (jv < 0) continue;
      const sigmaTag = pair.sigma.find((s) => tags.includes(s));
      roles[hkl[0]] = ROLE_H; roles[hkl[1]] = ROLE_K; roles[hkl[2]] = ROLE_L;
      roles[jv] = ROLE_VALUE;
      // no sigma column: the rows are kept and the reader fills estimated sigmas (with a warning)
      if (sigmaTag === undefined)
        return { roles, origin: pair.origin, unmerged: cat.unmerged, hasSigma: false, chosen: [...hkl.map((j) => tags[j]), pair.value] };
      roles[tags.indexOf(sigmaTag)] = ROLE_SIGMA;
      return { roles, origin: pair.origin, unmerged: cat.unmerged, hasSigma: true, chosen: [...hkl.map((j) => tags[j]), pair.value, sigmaTag] };
    }
    return `the reflection loop has indices but no measured values (looked for ${cat.pairs.map((p) => p.value).join(', ')}; the loop has ${tags.join(', ')})`;
  }
  return 'no loop with _refln_index_h/_k/_l or _diffrn_refln_index_h/_k/_l';
}

/**
 * Column names accepted in the header row of delimited text (compared in lower
 * case, with spaces, underscores and brackets removed). The obvious ones only.
 */
const TEXT_ALIASES: Record<string, number> = {
  h: ROLE_H, k: ROLE_K, l: ROLE_L,
  i: ROLE_VALUE, int: ROLE_VALUE, intensity: ROLE_VALUE, iobs: ROLE_VALUE, imeas: ROLE_VALUE, imean: ROLE_VALUE, f2: ROLE_VALUE, fsq: ROLE_VALUE, fsquared: ROLE_VALUE,
  sigi: ROLE_SIGMA, sigma: ROLE_SIGMA, sig: ROLE_SIGMA, sigmai: ROLE_SIGMA, sigint: ROLE_SIGMA, sigiobs: ROLE_SIGMA, sigimean: ROLE_SIGMA,
  sigf2: ROLE_SIGMA, sigmaf2: ROLE_SIGMA, sigfsq: ROLE_SIGMA,
};
const TEXT_AMPLITUDE_ALIASES: Record<string, number> = {
  f: ROLE_VALUE, fobs: ROLE_VALUE, fmeas: ROLE_VALUE, fo: ROLE_VALUE,
  sigf: ROLE_SIGMA, sigmaf: ROLE_SIGMA, sigfobs: ROLE_SIGMA, sigfo: ROLE_SIGMA,
};

function aliasKey(name: string): string {
  return name.toLowerCase().replace(/[\s_()\-^]/g, '');
}

/**
 * Plan the columns of delimited text from its header names (or --columns).
 * Unknown names are skipped columns. Returns an error message string when h, k, l or the
 * value is missing, a role is given twice, or intensities and amplitudes are mixed.
 * A missing sigma column is allowed (`hasSigma` false).
 */
export function planTextColumns(names: readonly string[]): ColumnPlan | string {
  const roles = new Int8Array(names.length);
  let amplitude = false;
  let intensity = false;
  const seen = new Map<number, string>();
  for (let j = 0; j < names.length; j++) {
    const key = aliasKey(names[j]);
    let role = TEXT_ALIASES[key];
    if (role !== undefined) { if (role >= ROLE_VALUE) intensity = true; }
    else {
      role = TEXT_AMPLITUDE_ALIASES[key];
      if (role !== undefined) amplitude = true;
    }
    if (role === undefined) continue;
    if (amplitude && intensity) return 'the columns mix intensities (I, sigI) and amplitudes (F, sigF); name one pair';
    if (seen.has(role)) return `columns '${seen.get(role)}' and '${names[j]}' name the same quantity`;
    seen.set(role, names[j]);
    roles[j] = role;
  }
  if (amplitude && intensity) return 'the columns mix intensities (I, sigI) and amplitudes (F, sigF); name one pair';
  const missing = [
    [ROLE_H, 'h'], [ROLE_K, 'k'], [ROLE_L, 'l'], [ROLE_VALUE, 'I (or F)'],
  ].filter(([r]) => !seen.has(r as number)).map(([, n]) => n);
  if (missing.length) return `no column named ${missing.join(', ')} (columns: ${names.join(' ')})`;
  const hasSigma = seen.has(ROLE_SIGMA);
  const chosen = [ROLE_H, ROLE_K, ROLE_L, ROLE_VALUE, ...(hasSigma ? [ROLE_SIGMA] : [])].map((r) => seen.get(r)!);
  return { roles, origin: amplitude ? 'amplitude' : 'intensity', unmerged: false, hasSigma, chosen };
}
