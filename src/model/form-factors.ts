import { FORM_FACTOR_ROWS, ION_FORM_FACTOR_ROWS } from './form-factor-table';

/**
 * X-ray atomic form factors, f(s) = sum_i a_i exp(-b_i s^2) + c, s = sin(theta)/lambda in 1/angstrom:
 * - neutral atoms H..Cf: the four-Gaussian fit of International Tables for Crystallography Vol. C,
 *   Table 6.1.1.4 (meant for s < 2 1/angstrom), stored with a zero fifth Gaussian;
 * - ions: the five-Gaussian fit of Waasmaier & Kirfel (1995) Acta Cryst. A51, 416-431 (s < 6 1/angstrom).
 * One five-term evaluation serves both, so the structure-factor loop has no branch per kind.
 */
export interface FormFactorCoefficients {
  /** Element symbol with standard capitalisation, e.g. 'Fe'. */
  readonly element: string;
  readonly z: number;
  /** Formal charge (0 for the neutral atom). */
  readonly charge: number;
  /** 'Fe' for the neutral atom, 'Fe3+' / 'O2-' / 'Cu1+' for an ion (the CIF type-symbol form). */
  readonly symbol: string;
  /** Which published fit the row comes from. */
  readonly source: FormFactorSource;
  readonly a: readonly [number, number, number, number, number];
  /** Gaussian widths in angstrom^2 (b5 = 0 together with a5 = 0 for the four-Gaussian rows). */
  readonly b: readonly [number, number, number, number, number];
  readonly c: number;
}

/** `itc-6.1.1.4`: International Tables Vol. C Table 6.1.1.4; `waasmaier-kirfel-1995`: Acta Cryst. A51, 416-431. */
export type FormFactorSource = 'itc-6.1.1.4' | 'waasmaier-kirfel-1995';

function coefficients(element: string, z: number, charge: number, symbol: string, source: FormFactorSource, v: readonly number[]): FormFactorCoefficients {
  return { element, z, charge, symbol, source, a: [v[0], v[1], v[2], v[3], v[4]], b: [v[5], v[6], v[7], v[8], v[9]], c: v[10] };
}

const BY_SYMBOL = new Map<string, FormFactorCoefficients>();
for (const [element, z, v] of FORM_FACTOR_ROWS) {
  BY_SYMBOL.set(element.toLowerCase(), coefficients(element, z, 0, element, 'itc-6.1.1.4', v));
}
// Deuterium scatters X-rays as hydrogen does.
BY_SYMBOL.set('d', BY_SYMBOL.get('h')!);

/** Ions keyed by `${element lower case}${charge}`, e.g. 'fe3', 'o-2'. */
const IONS = new Map<string, FormFactorCoefficients>();
for (const [symbol, element, z, charge, v] of ION_FORM_FACTOR_ROWS) {
  IONS.set(element.toLowerCase() + charge, coefficients(element, z, charge, symbol, 'waasmaier-kirfel-1995', v));
}

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
 * Split a CIF type symbol such as `Fe`, `O2-`, `Fe3+`, `Na+`, `Cl1-` (or the sign-first `Fe+3`) into element and charge.
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

/**
 * Coefficients of an element symbol ('Fe'; case-insensitive, 'D' for deuterium) or an ion written as a
 * CIF type symbol ('Fe3+', 'O2-', 'Na+', 'Fe+3'), or undefined when neither table has that row.
 * An ion never falls back to its neutral atom here; see `findIonFormFactor`.
 */
export function findFormFactor(symbol: string): FormFactorCoefficients | undefined {
  const neutral = BY_SYMBOL.get(symbol.trim().toLowerCase());
  if (neutral) return neutral;
  const ts = parseTypeSymbol(symbol);
  return ts && findIonFormFactor(ts.element, ts.charge);
}

/**
 * Coefficients for an element with a formal charge: the neutral atom (International Tables Vol. C
 * Table 6.1.1.4) for charge 0, the ion (Waasmaier & Kirfel 1995) otherwise; undefined when the
 * element or that ion is in neither table.
 */
export function findIonFormFactor(element: string, charge: number): FormFactorCoefficients | undefined {
  const neutral = BY_SYMBOL.get(element.trim().toLowerCase());
  if (!neutral || charge === 0) return neutral;
  return IONS.get(neutral.element.toLowerCase() + charge);
}

/** The CIF type-symbol form of an element and charge: 'Fe', 'Fe3+', 'O2-', 'Cu1+'. */
export function formatTypeSymbol(element: string, charge: number): string {
  return charge === 0 ? element : `${element}${Math.abs(charge)}${charge > 0 ? '+' : '-'}`;
}

/** Form factor in electrons at s = sin(theta)/lambda (1/angstrom). */
export function formFactorAt(coefs: FormFactorCoefficients, s: number): number {
  return formFactorAtStol2(coefs, s * s);
}

/** Form factor in electrons at s^2 = (sin(theta)/lambda)^2; the hot-loop form (five terms for every row). */
export function formFactorAtStol2(coefs: FormFactorCoefficients, stol2: number): number {
  const { a, b } = coefs;
  return a[0] * Math.exp(-b[0] * stol2) + a[1] * Math.exp(-b[1] * stol2) + a[2] * Math.exp(-b[2] * stol2) + a[3] * Math.exp(-b[3] * stol2) +
    a[4] * Math.exp(-b[4] * stol2) + coefs.c;
}

/** Every element symbol in the table (H..Cf), for messages and tests. */
export function formFactorElements(): string[] {
  return FORM_FACTOR_ROWS.map((r) => r[0]);
}

/** Every ion in the table ('H1-', 'Li1+', ... in order of atomic number, then charge), for messages and tests. */
export function formFactorIons(): string[] {
  return ION_FORM_FACTOR_ROWS.map((r) => r[0]);
}
