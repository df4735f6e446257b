import { fail, ok, type CellParams, type Result } from '../core';
import { UnitCell } from './cell';

/**
 * A change of basis in the notation of International Tables Vol. A, Part 5:
 * (a', b', c') = (a, b, c) P, i.e. the columns of P are the new basis vectors
 * written in the old basis. Miller indices are rows and transform as h' = h P;
 * fractional coordinates as x' = P^-1 x.
 *
 * Kept exact: P = num / den with integer numerators (row-major) and a positive
 * integer denominator, always reduced to lowest terms. An origin shift
 * (`a,b,c;1/2,0,0`) is kept in 24ths like the symmetry layer; intensities do not
 * depend on it.
 */
export interface ChangeOfBasis {
  /** P * den, row-major: P[i][j] = num[3 * i + j] / den. */
  readonly num: Int32Array;
  readonly den: number;
  /** Origin shift p in 24ths (new origin = old origin + p), zero for most uses. */
  readonly shift24: Int32Array;
}

/** Exact rational number with positive denominator, lowest terms. */
export interface Rational {
  readonly num: number;
  readonly den: number;
}

export function gcd(a: number, b: number): number {
  a = Math.abs(a);
  b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

function reduce(num: ArrayLike<number>, den: number, shift24?: ArrayLike<number>): ChangeOfBasis {
  let g = Math.abs(den);
  for (let j = 0; j < 9; j++) g = gcd(g, num[j]);
  if (g === 0) g = 1;
  const s = den < 0 ? -1 : 1;
  const out = new Int32Array(9);
  for (let j = 0; j < 9; j++) out[j] = (s * num[j]) / g;
  return { num: out, den: Math.abs(den) / g, shift24: Int32Array.from(shift24 ?? [0, 0, 0]) };
}

/** A change of basis from an integer matrix P (row-major, 9 numbers). */
export function changeOfBasisFromMatrix(p: ArrayLike<number>, den = 1): ChangeOfBasis {
  return reduce(p, den);
}

export const IDENTITY_BASIS: ChangeOfBasis = changeOfBasisFromMatrix([1, 0, 0, 0, 1, 0, 0, 0, 1]);

/** P as floating-point numbers, row-major. */
export function basisMatrix(cob: ChangeOfBasis): number[] {
  return Array.from(cob.num, (x) => x / cob.den);
}

/** det(P) exactly. */
export function basisDeterminant(cob: ChangeOfBasis): Rational {
  const m = cob.num;
  const d =
    m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
  const den = cob.den ** 3;
  const g = gcd(d, den) || 1;
  return { num: d / g, den: den / g };
}

/** True when every element of P is an integer (then integer hkl stay integer). */
export function isIntegralBasis(cob: ChangeOfBasis): boolean {
  return cob.den === 1;
}

/** True when P and P^-1 are both integer: the same lattice in another basis. */
export function isUnimodularBasis(cob: ChangeOfBasis): boolean {
  const d = basisDeterminant(cob);
  return cob.den === 1 && d.den === 1 && Math.abs(d.num) === 1;
}

/** P^-1 exactly; undefined for a singular P. */
export function findInverseBasis(cob: ChangeOfBasis): ChangeOfBasis | undefined {
  const m = cob.num;
  const adj = [
    m[4] * m[8] - m[5] * m[7], m[2] * m[7] - m[1] * m[8], m[1] * m[5] - m[2] * m[4],
    m[5] * m[6] - m[3] * m[8], m[0] * m[8] - m[2] * m[6], m[2] * m[3] - m[0] * m[5],
    m[3] * m[7] - m[4] * m[6], m[1] * m[6] - m[0] * m[7], m[0] * m[4] - m[1] * m[3],
  ];
  const det = m[0] * adj[0] + m[1] * adj[3] + m[2] * adj[6];
  if (det === 0) return undefined;
  // (M / d)^-1 = d adj(M) / det(M); the shift inverts as -P^-1 p (kept in 24ths when exact)
  const inv = reduce(adj.map((x) => x * cob.den), det);
  const s = cob.shift24;
  const shift = [0, 0, 0];
  for (let i = 0; i < 3; i++) {
    let acc = 0;
    for (let j = 0; j < 3; j++) acc -= inv.num[3 * i + j] * s[j];
    shift[i] = acc / inv.den;
  }
  return { ...inv, shift24: Int32Array.from(shift.map((x) => Math.round(x))) };
}

/** P then Q: (a'', b'', c'') = (a, b, c) P Q. */
export function composeBasis(p: ChangeOfBasis, q: ChangeOfBasis): ChangeOfBasis {
  const out = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++) {
      let acc = 0;
      for (let k = 0; k < 3; k++) acc += p.num[3 * i + k] * q.num[3 * k + j];
      out[3 * i + j] = acc;
    }
  return reduce(out, p.den * q.den, p.shift24);
}

/**
 * h' = h P for one reflection, written into `out`; returns false (and leaves
 * `out` undefined in meaning) when h' is not integral. No allocation.
 */
export function transformHkl(cob: ChangeOfBasis, h: number, k: number, l: number, out: Int32Array | number[]): boolean {
  const m = cob.num;
  const d = cob.den;
  const x = h * m[0] + k * m[3] + l * m[6];
  const y = h * m[1] + k * m[4] + l * m[7];
  const z = h * m[2] + k * m[5] + l * m[8];
  if (d !== 1 && (x % d !== 0 || y % d !== 0 || z % d !== 0)) return false;
  out[0] = x / d;
  out[1] = y / d;
  out[2] = z / d;
  return true;
}

/** Cell parameters from a metric tensor G (row-major). */
export function cellFromMetric(g: ArrayLike<number>): CellParams {
  const a = Math.sqrt(g[0]);
  const b = Math.sqrt(g[4]);
  const c = Math.sqrt(g[8]);
  const d = 180 / Math.PI;
  const ang = (x: number) => Math.acos(Math.max(-1, Math.min(1, x))) * d;
  // 12 significant digits: far below any measured precision, and it keeps 12.94 from printing as 12.939999999999994
  const r = (x: number) => Number(x.toPrecision(12));
  return { a: r(a), b: r(b), c: r(c), alpha: r(ang(g[5] / (b * c))), beta: r(ang(g[2] / (a * c))), gamma: r(ang(g[1] / (a * b))) };
}

/** G' = P^T G P for a real matrix P (row-major). */
export function transformMetric(g: ArrayLike<number>, p: ArrayLike<number>): number[] {
  const gp = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++) {
      let acc = 0;
      for (let k = 0; k < 3; k++) acc += g[3 * i + k] * p[3 * k + j];
      gp[3 * i + j] = acc;
    }
  const out = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++) {
      let acc = 0;
      for (let k = 0; k < 3; k++) acc += p[3 * k + i] * gp[3 * k + j];
      out[3 * i + j] = acc;
    }
  return out;
}

/** The cell in the new basis: G' = P^T G P. */
export function transformCell(cell: CellParams, cob: ChangeOfBasis): CellParams {
  return cellFromMetric(transformMetric(new UnitCell(cell).metric, basisMatrix(cob)));
}

function formatRational(num: number, den: number): string {
  const g = gcd(num, den) || 1;
  const n = num / g;
  const d = den / g;
  return d === 1 ? String(n) : `${n}/${d}`;
}

/** `a,b,-a-c` notation of P (with `;x,y,z` origin shift when it is not zero). */
export function formatChangeOfBasis(cob: ChangeOfBasis): string {
  const letters = ['a', 'b', 'c'];
  const parts: string[] = [];
  for (let j = 0; j < 3; j++) {
    let s = '';
    for (let i = 0; i < 3; i++) {
      const n = cob.num[3 * i + j];
      if (n === 0) continue;
      const mag = formatRational(Math.abs(n), cob.den);
      s += (n < 0 ? '-' : s ? '+' : '') + (mag === '1' ? '' : mag) + letters[i];
    }
    parts.push(s || '0');
  }
  let text = parts.join(',');
  if (cob.shift24.some((x) => x !== 0)) text += ';' + Array.from(cob.shift24, (x) => formatRational(x, 24)).join(',');
  return text;
}

/** P as rows of numbers (JSON-friendly), e.g. [[1,0,-1],[0,1,0],[0,0,-1]]. */
export function basisRows(cob: ChangeOfBasis): number[][] {
  const m = basisMatrix(cob);
  return [m.slice(0, 3), m.slice(3, 6), m.slice(6, 9)];
}

/**
 * Parse a change of basis: either ITA Part 5 notation (`a,b,-a-c`,
 * `1/2a+1/2b,-1/2a+1/2b,c`, `a-b,a+b,c;0,0,1/2`) or the nine elements of P row
 * by row (`1,0,-1, 0,1,0, 0,0,-1`, brackets allowed). Exact rationals only.
 * `label` names the source in error messages (e.g. `--transform`).
 */
export function parseChangeOfBasis(text: string, label = 'transform'): Result<ChangeOfBasis> {
  const src = text.trim();
  if (src === '') return fail('empty change of basis', { file: label }, "Write it like 'a,b,-a-c' or as nine numbers.");
  if (!/[abc]/.test(src)) return parseMatrixForm(src, label);
  const [basisText, shiftText, extra] = src.split(';');
  if (extra !== undefined) return fail(`more than one ';' in '${src}'`, { file: label });
  const comps = basisText.split(',');
  if (comps.length !== 3)
    return fail(`'${src}' has ${comps.length} part${comps.length === 1 ? '' : 's'} before ';', expected three (new a, b, c)`, { file: label }, "Example: 'a,b,-a-c'.");
  const rows: Rational[][] = [];
  let column = 1;
  for (let j = 0; j < 3; j++) {
    const r = parseLinear(comps[j], true, label, column);
    if (!r.ok) return r;
    if (r.value.constant.num !== 0)
      return fail(`new basis vector ${'abc'[j]}' = '${comps[j].trim()}' has a constant term; put an origin shift after ';'`, { file: label, line: 1, column });
    rows.push(r.value.coeffs);
    column += comps[j].length + 1;
  }
  let shift: Rational[] = [{ num: 0, den: 1 }, { num: 0, den: 1 }, { num: 0, den: 1 }];
  if (shiftText !== undefined) {
    const parts = shiftText.split(',');
    if (parts.length !== 3) return fail(`origin shift '${shiftText.trim()}' needs three numbers`, { file: label, line: 1, column });
    shift = [];
    for (const p of parts) {
      const r = parseLinear(p, false, label, column);
      if (!r.ok) return r;
      shift.push(r.value.constant);
      column += p.length + 1;
    }
  }
  // common denominator; column j of P holds the coefficients of the new vector j
  let den = 1;
  for (const row of rows) for (const q of row) den = (den * q.den) / gcd(den, q.den);
  const num = new Array<number>(9).fill(0);
  for (let j = 0; j < 3; j++) for (let i = 0; i < 3; i++) num[3 * i + j] = (rows[j][i].num * den) / rows[j][i].den;
  const shift24: number[] = [];
  for (const q of shift) {
    const v = (q.num * 24) / q.den;
    if (!Number.isInteger(v)) return fail(`origin shift ${q.num}/${q.den} is not a multiple of 1/24`, { file: label });
    shift24.push(v);
  }
  const cob = reduce(num, den, shift24);
  return checkNonSingular(cob, src, label);
}

function checkNonSingular(cob: ChangeOfBasis, src: string, label: string): Result<ChangeOfBasis> {
  const d = basisDeterminant(cob);
  if (d.num === 0) return fail(`the change of basis '${src}' is singular (determinant 0): the new vectors lie in one plane`, { file: label });
  return ok(cob);
}

function parseMatrixForm(src: string, label: string): Result<ChangeOfBasis> {
  const tokens = src.replace(/[[\]()]/g, ' ').split(/[\s,;]+/).filter((t) => t !== '');
  if (tokens.length !== 9)
    return fail(`'${src}' is neither a change of basis like 'a,b,-a-c' nor nine matrix elements (found ${tokens.length} numbers)`, { file: label });
  const qs: Rational[] = [];
  for (const t of tokens) {
    const q = parseRational(t);
    if (!q) return fail(`'${t}' is not an integer or fraction in the matrix '${src}'`, { file: label });
    qs.push(q);
  }
  let den = 1;
  for (const q of qs) den = (den * q.den) / gcd(den, q.den);
  return checkNonSingular(reduce(qs.map((q) => (q.num * den) / q.den), den), src, label);
}

function parseRational(t: string): Rational | undefined {
  const m = /^([+-]?\d+)(?:\/(\d+))?$/.exec(t);
  if (!m) return undefined;
  const den = m[2] === undefined ? 1 : Number(m[2]);
  if (den === 0) return undefined;
  const num = Number(m[1]);
  const g = gcd(num, den) || 1;
  return { num: num / g, den: den / g };
}

function addQ(x: Rational, y: Rational): Rational {
  const den = x.den * y.den;
  const num = x.num * y.den + y.num * x.den;
  const g = gcd(num, den) || 1;
  return { num: num / g, den: den / g };
}

/** A sum of terms like `-1/2a`, `2*b`, `c/2`, `+1/4`. */
function parseLinear(
  text: string,
  lettersAllowed: boolean,
  label: string,
  column0: number,
): Result<{ coeffs: Rational[]; constant: Rational }> {
  const coeffs: Rational[] = [{ num: 0, den: 1 }, { num: 0, den: 1 }, { num: 0, den: 1 }];
  let constant: Rational = { num: 0, den: 1 };
  const s = text.replace(/\s+/g, '');
  if (s === '') return fail('empty component', { file: label, line: 1, column: column0 });
  const term = /([+-]?)(\d+(?:\/\d+)?)?(\*)?([abc])?(?:\/(\d+))?/y;
  let pos = 0;
  let first = true;
  while (pos < s.length) {
    term.lastIndex = pos;
    const m = term.exec(s);
    if (!m || m[0] === '' || (!first && m[1] === '') || (m[2] === undefined && m[4] === undefined) || (m[3] && (!m[2] || !m[4])) || (m[5] !== undefined && m[4] === undefined))
      return fail(`cannot read '${s.slice(pos)}' in '${text.trim()}'`, { file: label, line: 1, column: column0 + pos }, "Write terms like 'a', '-b', '1/2c', 'a+b'.");
    let q = m[2] === undefined ? { num: 1, den: 1 } : parseRational(m[2]);
    if (!q) return fail(`bad number '${m[2]}'`, { file: label, line: 1, column: column0 + pos });
    if (m[5] !== undefined) {
      const d = Number(m[5]);
      if (d === 0) return fail('division by zero', { file: label, line: 1, column: column0 + pos });
      q = { num: q.num, den: q.den * d };
    }
    if (m[1] === '-') q = { num: -q.num, den: q.den };
    if (m[4] !== undefined) {
      if (!lettersAllowed) return fail(`origin shift '${text.trim()}' must be numbers only`, { file: label, line: 1, column: column0 + pos });
      const idx = 'abc'.indexOf(m[4]);
      coeffs[idx] = addQ(coeffs[idx], q);
    } else {
      constant = addQ(constant, q);
    }
    pos += m[0].length;
    first = false;
  }
  return ok({ coeffs, constant });
}
