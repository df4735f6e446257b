import { FORM_FACTOR_ROWS } from './form-factor-table';

/**
 * X-ray atomic form factors from the four-Gaussian-plus-constant fit of
 * International Tables for Crystallography Vol. C, Table 6.1.1.4:
 *   f(s) = sum_i a_i exp(-b_i s^2) + c,   s = sin(theta)/lambda in 1/angstrom.
 * The fit is meant for s < 2 1/angstrom.
 */
export interface FormFactorCoefficients {
  /** Element symbol with standard capitalisation, e.g. 'Fe'. */
  readonly element: string;
  readonly z: number;
  readonly a: readonly [number, number, number, number];
  /** Gaussian widths in angstrom^2. */
  readonly b: readonly [number, number, number, number];
  readonly c: number;
}

const BY_SYMBOL = new Map<string, FormFactorCoefficients>();
for (const [element, z, v] of FORM_FACTOR_ROWS) {
  BY_SYMBOL.set(element.toLowerCase(), { element, z, a: [v[0], v[1], v[2], v[3]], b: [v[4], v[5], v[6], v[7]], c: v[8] });
}
// Deuterium scatters X-rays as hydrogen does.
BY_SYMBOL.set('d', BY_SYMBOL.get('h')!);

/** The four-Gaussian fit holds up to this sin(theta)/lambda (1/angstrom), i.e. d >= 0.25 angstrom. */
export const FORM_FACTOR_S_MAX = 2;

/** A warning when reflections reach beyond the fit's range, else undefined. */
export function formFactorRangeWarning(dmin: number): string | undefined {
  const s = 1 / (2 * dmin);
  return s > FORM_FACTOR_S_MAX
    ? `d_min ${dmin} A reaches sin(theta)/lambda = ${s.toFixed(2)} 1/A, beyond the form-factor fit's range (${FORM_FACTOR_S_MAX} 1/A, d >= 0.25 A); values there are extrapolated`
    : undefined;
}

/** A parsed `_atom_site_type_symbol`: element plus formal charge (0 for a neutral atom). */
export interface TypeSymbol {
  readonly element: string;
  readonly charge: number;
}

/**
 * Split a CIF type symbol such as `Fe`, `O2-`, `Fe3+`, `Na+`, `Cl1-` into element and charge.
 * Returns undefined when the text is not of that form or names no element in the table.
 */
export function parseTypeSymbol(text: string): TypeSymbol | undefined {
  // `O2-` (the CIF form) and the occasional `O-2`
  const m = /^([A-Za-z]{1,2})(?:(\d*)([+-])|([+-])(\d+))?$/.exec(text.trim());
  if (!m) return undefined;
  const coefs = BY_SYMBOL.get(m[1].toLowerCase());
  if (!coefs) return undefined;
  const sign = m[3] ?? m[4];
  const digits = m[2] || m[5];
  const magnitude = sign ? (digits ? Number(digits) : 1) : 0;
  return { element: coefs.element, charge: sign === '-' ? -magnitude : magnitude };
}

/** Coefficients of an element symbol (case-insensitive, 'D' for deuterium), or undefined. */
export function findFormFactor(element: string): FormFactorCoefficients | undefined {
  return BY_SYMBOL.get(element.trim().toLowerCase());
}

/** Form factor in electrons at s = sin(theta)/lambda (1/angstrom). */
export function formFactorAt(coefs: FormFactorCoefficients, s: number): number {
  return formFactorAtStol2(coefs, s * s);
}

/** Form factor in electrons at s^2 = (sin(theta)/lambda)^2; the hot-loop form. */
export function formFactorAtStol2(coefs: FormFactorCoefficients, stol2: number): number {
  const { a, b } = coefs;
  return a[0] * Math.exp(-b[0] * stol2) + a[1] * Math.exp(-b[1] * stol2) + a[2] * Math.exp(-b[2] * stol2) + a[3] * Math.exp(-b[3] * stol2) + coefs.c;
}

/** Every element symbol in the table (H..Cf), for messages and tests. */
export function formFactorElements(): string[] {
  return FORM_FACTOR_ROWS.map((r) => r[0]);
}
