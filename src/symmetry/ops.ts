import { fail, ok, type Result } from '../core';

/**
 * Symmetry operations in exact integers.
 *
 * Fractional coordinates are columns: x' = R x + t (International Tables Vol. A, Part 1.2).
 * R is a 3x3 integer matrix stored row-major; t is stored as numerators over DEN = 24, which
 * serves every crystallographic translation (halves, thirds, quarters, sixths, and the twelfths
 * of Hall change-of-origin vectors combine into 1/24 at most).
 */
export const DEN = 24;

export interface SymOp {
  /** 3x3 rotation part, row-major, integer entries. */
  readonly r: Int32Array;
  /** Translation numerators over DEN, reduced to 0..DEN-1. */
  readonly t: Int32Array;
}

/** Positive remainder. */
export function mod(a: number, m: number): number {
  const r = a % m;
  return r < 0 ? r + m : r;
}

export function makeOp(r: ArrayLike<number>, t: ArrayLike<number> = [0, 0, 0]): SymOp {
  const rr = new Int32Array(9);
  for (let j = 0; j < 9; j++) rr[j] = r[j];
  const tt = new Int32Array(3);
  for (let j = 0; j < 3; j++) tt[j] = mod(t[j], DEN);
  return { r: rr, t: tt };
}

export const IDENTITY_R: readonly number[] = [1, 0, 0, 0, 1, 0, 0, 0, 1];

export function identityOp(): SymOp {
  return makeOp(IDENTITY_R);
}

/** Pure translation (centring vector), numerators over DEN. */
export function translationOp(t: ArrayLike<number>): SymOp {
  return makeOp(IDENTITY_R, t);
}

/** a * b: first b, then a (x -> Ra (Rb x + tb) + ta). */
export function composeOps(a: SymOp, b: SymOp): SymOp {
  const out = { r: new Int32Array(9), t: new Int32Array(3) };
  composeInto(a, b, out);
  return out;
}

/** composeOps into existing storage (`out` must not be `a` or `b`). */
export function composeInto(a: SymOp, b: SymOp, out: SymOp): void {
  const r = out.r;
  const t = out.t;
  for (let i = 0; i < 3; i++) {
    let s = a.t[i];
    for (let j = 0; j < 3; j++) {
      let v = 0;
      for (let k = 0; k < 3; k++) v += a.r[i * 3 + k] * b.r[k * 3 + j];
      r[i * 3 + j] = v;
      s += a.r[i * 3 + j] * b.t[j];
    }
    t[i] = mod(s, DEN);
  }
}

export function det3(m: ArrayLike<number>): number {
  return (
    m[0] * (m[4] * m[8] - m[5] * m[7]) -
    m[1] * (m[3] * m[8] - m[5] * m[6]) +
    m[2] * (m[3] * m[7] - m[4] * m[6])
  );
}

/** Adjugate (transpose of the cofactor matrix): m * adj(m) = det(m) I. */
export function adjugate3(m: ArrayLike<number>): number[] {
  return [
    m[4] * m[8] - m[5] * m[7], m[2] * m[7] - m[1] * m[8], m[1] * m[5] - m[2] * m[4],
    m[5] * m[6] - m[3] * m[8], m[0] * m[8] - m[2] * m[6], m[2] * m[3] - m[0] * m[5],
    m[3] * m[7] - m[4] * m[6], m[1] * m[6] - m[0] * m[7], m[0] * m[4] - m[1] * m[3],
  ];
}

/** Inverse operation. Rotation parts of symmetry operations have determinant +-1. */
export function invertOp(op: SymOp): SymOp {
  const d = det3(op.r);
  if (d !== 1 && d !== -1) throw new Error(`invertOp: rotation part has determinant ${d}`);
  const adj = adjugate3(op.r);
  const r = new Int32Array(9);
  for (let j = 0; j < 9; j++) r[j] = adj[j] * d;
  const t = new Int32Array(3);
  for (let i = 0; i < 3; i++) {
    let s = 0;
    for (let j = 0; j < 3; j++) s -= r[i * 3 + j] * op.t[j];
    t[i] = mod(s, DEN);
  }
  return { r, t };
}

export function opsEqual(a: SymOp, b: SymOp): boolean {
  for (let j = 0; j < 9; j++) if (a.r[j] !== b.r[j]) return false;
  for (let j = 0; j < 3; j++) if (a.t[j] !== b.t[j]) return false;
  return true;
}

/**
 * Exact hash of an operation as one safe integer: rotation entries -2..2 in base 5,
 * then the three translation numerators in base DEN. Distinct operations get distinct keys.
 */
export function opKey(op: SymOp): number {
  return rotationKey(op.r) * DEN * DEN * DEN + (op.t[0] * DEN + op.t[1]) * DEN + op.t[2];
}

/** Exact hash of a rotation part (entries must lie in -2..2, true of every setting here). */
export function rotationKey(r: ArrayLike<number>): number {
  let key = 0;
  let bad = false;
  for (let j = 0; j < 9; j++) {
    const v = r[j];
    bad ||= v < -2 || v > 2;
    key = key * 5 + (v + 2);
  }
  if (bad) throw new Error(`rotationKey: entry outside -2..2 in ${Array.from(r)}`);
  return key;
}

export function isIdentityRotation(r: ArrayLike<number>): boolean {
  for (let j = 0; j < 9; j++) if (r[j] !== IDENTITY_R[j]) return false;
  return true;
}

export function isPureTranslation(op: SymOp): boolean {
  return isIdentityRotation(op.r);
}

function gcd(a: number, b: number): number {
  a = Math.abs(a);
  b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

function formatFraction(num: number, den: number): string {
  const g = gcd(num, den);
  return `${num / g}/${den / g}`;
}

/**
 * The `x,y,z` form: `-x+1/2,y,-z`, `x-y,x,z+1/6`. Rotation terms first, then the
 * translation as a reduced fraction in 0..1 (International Tables style).
 */
export function formatTriplet(op: SymOp): string {
  const names = ['x', 'y', 'z'];
  const parts: string[] = [];
  for (let i = 0; i < 3; i++) {
    let s = '';
    for (let j = 0; j < 3; j++) {
      const c = op.r[i * 3 + j];
      if (c === 0) continue;
      const sign = c < 0 ? '-' : s ? '+' : '';
      const mag = Math.abs(c) === 1 ? '' : String(Math.abs(c));
      s += sign + mag + names[j];
    }
    const t = op.t[i];
    if (t !== 0) s += (s ? '+' : '') + formatFraction(t, DEN);
    parts.push(s || '0');
  }
  return parts.join(',');
}

/**
 * Parse an `x,y,z` triplet: `-x+1/2,y,-z`, `x-y,x,z+1/6`, `1/2+x`, `X, Y, Z`, `-y+z,x+z,-x+y+z`,
 * decimals that are exact over 24 (`x+0.5`). A small hand-written parser, no eval.
 * Errors carry the 1-based column within `text`.
 */
export function parseTriplet(text: string): Result<SymOp> {
  const r = new Int32Array(9);
  const t = [0, 0, 0];
  const s = text.toLowerCase();
  let pos = 0;
  let row = 0;
  const where = (p: number) => ({ file: 'operation', column: p + 1 });
  const skipSpace = () => {
    while (pos < s.length && (s[pos] === ' ' || s[pos] === '\t')) pos++;
  };
  // Each row: [sign] term { sign term }, term = number [ '/' number ] [ '*'? letter ] | letter
  for (;;) {
    skipSpace();
    let terms = 0;
    for (;;) {
      skipSpace();
      let sign = 1;
      if (s[pos] === '+' || s[pos] === '-') {
        sign = s[pos] === '-' ? -1 : 1;
        pos++;
        skipSpace();
      } else if (terms > 0) break;
      const start = pos;
      let num: number | undefined;
      let den = 1;
      const numMatch = /^(\d+(?:\.\d+)?|\.\d+)/.exec(s.slice(pos));
      if (numMatch) {
        const str = numMatch[1];
        pos += str.length;
        if (str.includes('.')) {
          const scaled = Number(str) * DEN;
          if (Math.abs(scaled - Math.round(scaled)) > 1e-6)
            return fail(`'${str}' in '${text}' is not a multiple of 1/${DEN}`, where(start));
          num = Math.round(scaled);
          den = DEN;
        } else num = Number(str);
        skipSpace();
        if (s[pos] === '/') {
          pos++;
          skipSpace();
          const denMatch = /^\d+/.exec(s.slice(pos));
          if (!denMatch) return fail(`expected a denominator after '/' in '${text}'`, where(pos));
          pos += denMatch[0].length;
          den *= Number(denMatch[0]);
          if (den === 0) return fail(`division by zero in '${text}'`, where(start));
          skipSpace();
        }
        if (s[pos] === '*') {
          pos++;
          skipSpace();
        }
      }
      const letter = s[pos];
      if (letter === 'x' || letter === 'y' || letter === 'z') {
        if (den !== 1) return fail(`fractional coefficient of ${letter} in '${text}'`, where(start));
        pos++;
        r[row * 3 + (letter.charCodeAt(0) - 120)] += sign * (num ?? 1);
      } else if (num !== undefined) {
        const scaled = (num * DEN) / den;
        if (!Number.isInteger(scaled))
          return fail(`translation ${num}/${den} in '${text}' is not a multiple of 1/${DEN}`, where(start));
        t[row] += sign * scaled;
      } else {
        const what = pos < s.length ? `unexpected '${text[pos]}'` : 'unexpected end';
        return fail(`${what} in operation '${text}'; expected a term such as x, -y, z+1/2`, where(pos));
      }
      terms++;
    }
    if (terms === 0) return fail(`empty component in operation '${text}'`, where(pos));
    skipSpace();
    if (row < 2) {
      if (s[pos] !== ',') {
        const what = pos < s.length ? `unexpected '${text[pos]}'` : 'only ' + (row + 1) + ' of 3 components';
        return fail(`${what} in operation '${text}'; expected three comma-separated components like x,y,z`, where(pos));
      }
      pos++;
      row++;
    } else {
      if (pos < s.length)
        return fail(`unexpected '${text.slice(pos)}' after the third component of '${text}'`, where(pos));
      break;
    }
  }
  const d = det3(r);
  if (d !== 1 && d !== -1)
    return fail(`operation '${text}' is not a symmetry operation (determinant of its matrix is ${d}, not +1 or -1)`, where(0));
  return ok(makeOp(r, t));
}

/** Like parseTriplet but throws (for literals in code and tests). */
export function tripletOp(text: string): SymOp {
  const r = parseTriplet(text);
  if (!r.ok) throw r.error;
  return r.value;
}

/**
 * Change of basis in the convention of International Tables Vol. A, Part 5 (5.1.3):
 * the new basis is (a', b', c') = (a, b, c) P and the new origin is O' = O + p, so
 * coordinates transform as x' = P^-1 (x - p) and an operation (W, w) becomes
 *   W' = P^-1 W P,  w' = P^-1 (w + W p - p).
 *
 * `P` holds integer numerators over `pDen` (row-major 3x3), `p` numerators over DEN.
 * Fails when the result is not integral over DEN (the change of basis does not fit the group).
 */
export function changeBasisOp(
  op: SymOp,
  P: ArrayLike<number>,
  p: ArrayLike<number> = [0, 0, 0],
  pDen = 1,
): Result<SymOp> {
  const d = det3(P);
  if (d === 0) return fail('change of basis is singular (determinant 0)');
  const adj = adjugate3(P);
  // W' = adj(P) W P / det(P)  (the pDen factors cancel)
  const wp = mul3(op.r, P);
  const rNum = mul3(adj, wp);
  const r = new Int32Array(9);
  for (let j = 0; j < 9; j++) {
    if (rNum[j] % d !== 0) return fail('change of basis gives a non-integral rotation matrix');
    r[j] = rNum[j] / d;
  }
  // q = w + W p - p over DEN (p over DEN already); w' = pDen * adj(P) q / det(P)
  const q = [0, 0, 0];
  for (let i = 0; i < 3; i++) {
    let s = op.t[i] - p[i];
    for (let j = 0; j < 3; j++) s += op.r[i * 3 + j] * p[j];
    q[i] = s;
  }
  const t = new Int32Array(3);
  for (let i = 0; i < 3; i++) {
    let s = 0;
    for (let j = 0; j < 3; j++) s += adj[i * 3 + j] * q[j];
    s *= pDen;
    if (s % d !== 0) return fail(`change of basis gives a translation that is not a multiple of 1/${DEN}`);
    t[i] = mod(s / d, DEN);
  }
  return ok({ r, t });
}

/** Product of two 3x3 row-major integer matrices. */
export function mul3(a: ArrayLike<number>, b: ArrayLike<number>): number[] {
  const c = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++)
    for (let j = 0; j < 3; j++) {
      let v = 0;
      for (let k = 0; k < 3; k++) v += a[i * 3 + k] * b[k * 3 + j];
      c[i * 3 + j] = v;
    }
  return c;
}

/** Order of the rotation part (smallest n with R^n = I); 0 if it is not of finite order <= 6. */
export function rotationOrder(r: ArrayLike<number>): number {
  let m: number[] = Array.from(r);
  for (let n = 1; n <= 6; n++) {
    if (isIdentityRotation(m)) return n;
    m = mul3(m, r);
  }
  return 0;
}

/**
 * Rotation type in the notation of International Tables Vol. A, Table 1.2.2.1 (from trace and
 * determinant): 1, 2, 3, 4, 6 for proper rotations, -1, -2 (mirror), -3, -4, -6 for improper.
 */
export function rotationType(r: ArrayLike<number>): number {
  const d = det3(r);
  const tr = r[0] + r[4] + r[8];
  const proper = d * tr; // trace of the proper part
  const n = proper === 3 ? 1 : proper === -1 ? 2 : proper === 0 ? 3 : proper === 1 ? 4 : proper === 2 ? 6 : 0;
  if (n === 0) throw new Error(`rotationType: not a crystallographic rotation (trace ${tr}, det ${d})`);
  return d > 0 ? n : -n;
}
