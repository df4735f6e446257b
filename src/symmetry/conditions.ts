import { DEN, isIdentityRotation, mod, type SymOp } from './ops';

/**
 * A reflection condition, exactly (conventions.md section 2): reflection h = (h,k,l) is
 * systematically absent when e.h = 0 for every row e of `zone` and coeffs.h is not divisible
 * by `modulus`. `text` is the condition in the notation of International Tables Vol. A
 * ("h0l: l = 2n", "hkl: h+k = 2n", "00l: l = 4n", "hhl: 2h+l = 4n").
 */
export interface Condition {
  readonly text: string;
  readonly zone: number[][];
  readonly coeffs: [number, number, number];
  readonly modulus: number;
}

type V3 = [number, number, number];

function gcd(a: number, b: number): number {
  a = Math.abs(a);
  b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

function primitive(v: V3): V3 {
  const g = gcd(gcd(v[0], v[1]), v[2]) || 1;
  const w = v.map((x) => x / g) as V3;
  const first = w.find((x) => x !== 0) ?? 0;
  return (first < 0 ? w.map((x) => -x || 0) : w) as V3;
}

function cross(a: V3, b: V3): V3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

const isZero = (v: ArrayLike<number>) => v[0] === 0 && v[1] === 0 && v[2] === 0;

/**
 * The zone {h : h R = h} of a rotation part, as a lattice: its dimension, an integer basis
 * (with names for the text) and the canonical equations (rows e with e.h = 0).
 */
export interface Zone {
  readonly dim: number;
  readonly basis: V3[];
  readonly rows: V3[];
  /** Zone label such as `hkl`, `h0l`, `hhl`, `00l`, `h-h0`. */
  readonly label: string;
  /** Parameter letter of each basis vector (for the condition text). */
  readonly params: string[];
}

const LETTERS = ['h', 'k', 'l'];

function term(coef: number, letter: string): string {
  if (coef === 0) return '';
  if (coef === 1) return letter;
  if (coef === -1) return '-' + letter;
  return coef + letter;
}

function linear(coefs: number[], letters: string[]): string {
  let s = '';
  coefs.forEach((c, i) => {
    const t = term(c, letters[i]);
    if (!t) return;
    s += s && c > 0 ? '+' + t : t;
  });
  return s || '0';
}

/** Integer echelon basis of the row space orthogonal to a direction v (two rows). */
function complementRows(v: V3): V3[] {
  // candidate rows: small integer vectors orthogonal to v; take two whose cross product is +-v
  const cands: V3[] = [];
  for (let a = -2; a <= 2; a++)
    for (let b = -2; b <= 2; b++)
      for (let c = -2; c <= 2; c++) {
        const e: V3 = [a, b, c];
        if (!isZero(e) && dot(e, v) === 0) cands.push(primitive(e));
      }
  // prefer rows with leading unit entries, in echelon order
  const score = (e: V3) => {
    const lead = e.findIndex((x) => x !== 0);
    return lead * 100 + Math.abs(e[0]) + Math.abs(e[1]) + Math.abs(e[2]);
  };
  cands.sort((x, y) => score(x) - score(y) || y[0] - x[0] || y[1] - x[1] || y[2] - x[2]);
  for (let i = 0; i < cands.length; i++)
    for (let j = i + 1; j < cands.length; j++) {
      const c = cross(cands[i], cands[j]);
      if ((c[0] === v[0] && c[1] === v[1] && c[2] === v[2]) || (c[0] === -v[0] && c[1] === -v[1] && c[2] === -v[2]))
        return [cands[i], cands[j]];
    }
  throw new Error(`complementRows: no small basis orthogonal to ${v}`);
}

const zoneCache = new Map<string, Zone | null>();

/** Zone of the rotation part r; null when only h = 0 is fixed. */
export function zoneOfRotation(r: ArrayLike<number>): Zone | null {
  const key = Array.from(r).join(',');
  const hit = zoneCache.get(key);
  if (hit !== undefined) return hit;
  const z = computeZone(r);
  zoneCache.set(key, z);
  return z;
}

function computeZone(r: ArrayLike<number>): Zone | null {
  // h R = h  <=>  h . col_j(R - I) = 0 for each column j
  const cols: V3[] = [0, 1, 2].map((j) => [r[j] - (j === 0 ? 1 : 0), r[3 + j] - (j === 1 ? 1 : 0), r[6 + j] - (j === 2 ? 1 : 0)]);
  const nonzero = cols.filter((c) => !isZero(c));
  if (nonzero.length === 0) return { dim: 3, basis: [[1, 0, 0], [0, 1, 0], [0, 0, 1]], rows: [], label: 'hkl', params: ['h', 'k', 'l'] };
  // rank 1 if all nonzero columns are parallel
  let rank2: V3 | undefined;
  for (let i = 0; i < nonzero.length && !rank2; i++)
    for (let j = i + 1; j < nonzero.length; j++) {
      const c = cross(nonzero[i], nonzero[j]);
      if (!isZero(c)) {
        rank2 = c;
        break;
      }
    }
  if (!rank2) {
    const n = primitive(nonzero[0]);
    return planeZone(n);
  }
  // rank 2 or 3: the zone is spanned by the common orthogonal direction, if every column is orthogonal to it
  const v = primitive(rank2);
  if (cols.some((c) => dot(c, v) !== 0)) return null;
  return lineZone(v);
}

function planeZone(n: V3): Zone {
  // dependent index: the last position with a unit coefficient (so h = k reads "hhl")
  let j = -1;
  for (let p = 2; p >= 0; p--) if (Math.abs(n[p]) === 1) { j = p; break; }
  if (j < 0) throw new Error(`planeZone: normal ${n} has no unit entry`);
  const free = [0, 1, 2].filter((p) => p !== j);
  const basis: V3[] = free.map((p) => {
    const b: V3 = [0, 0, 0];
    b[p] = 1;
    b[j] = -n[p] / n[j] || 0;
    return b;
  });
  const params = free.map((p) => LETTERS[p]);
  // label: free positions keep their letter, the dependent one is expressed through them
  const dep = linear(free.map((p) => -n[p] / n[j] || 0), params);
  const parts = [0, 1, 2].map((p) => (p === j ? (/[+]|.-/.test(dep) ? `(${dep})` : dep) : LETTERS[p]));
  return { dim: 2, basis, rows: [n], label: parts.join(''), params };
}

function lineZone(v: V3): Zone {
  const first = v.findIndex((x) => x !== 0);
  const letter = LETTERS[first];
  const label = v.map((c) => (c === 0 ? '0' : term(c, letter))).join('');
  return { dim: 1, basis: [v], rows: complementRows(v), label, params: [letter] };
}

/** Units modulo m. */
function units(m: number): number[] {
  const u: number[] = [];
  for (let a = 1; a < m; a++) if (gcd(a, m) === 1) u.push(a);
  return u.length ? u : [1];
}

// Candidate coefficient vectors, simplest first: fewest nonzero entries, smallest sum of
// magnitudes, fewest negative entries, then a fixed order.
const CANDIDATES: V3[] = (() => {
  const out: V3[] = [];
  for (let a = -4; a <= 4; a++) for (let b = -4; b <= 4; b++) for (let c = -4; c <= 4; c++) if (a || b || c) out.push([a, b, c]);
  const nz = (v: V3) => v.filter((x) => x !== 0).length;
  const sum = (v: V3) => Math.abs(v[0]) + Math.abs(v[1]) + Math.abs(v[2]);
  const neg = (v: V3) => v.filter((x) => x < 0).length;
  out.sort((x, y) => nz(x) - nz(y) || sum(x) - sum(y) || neg(x) - neg(y) || y[0] - x[0] || y[1] - x[1] || y[2] - x[2]);
  return out;
})();

const conditionCache = new Map<string, Condition | null>();

/**
 * The reflection condition an operation (R, t) imposes, or null when it imposes none:
 * for h in the zone h R = h, the phase shift 2 pi h.t must be a multiple of 2 pi.
 * The result is canonical: the same set of absent reflections always gives the same
 * zone rows, coefficients and modulus (so conditions of different settings compare exactly).
 */
export function conditionOfOp(op: SymOp): Condition | null {
  const key = Array.from(op.r).join(',') + ';' + Array.from(op.t).join(',');
  const hit = conditionCache.get(key);
  if (hit !== undefined) return hit;
  const c = computeCondition(op);
  conditionCache.set(key, c);
  return c;
}

function computeCondition(op: SymOp): Condition | null {
  const zone = zoneOfRotation(op.r);
  if (!zone) return null;
  // values of h.t (numerators over DEN) on the zone basis
  let m = DEN;
  let vals = zone.basis.map((b) => mod(dot(b, op.t), DEN));
  let g = vals.reduce((a, v) => gcd(a, v), m);
  if (vals.every((v) => v === 0)) return null;
  m = m / g;
  vals = vals.map((v) => v / g);
  g = 0;
  // the kernel of v -> u v (u a unit mod m) is the same set: search the simplest coefficients
  const targets = units(m).map((u) => vals.map((v) => mod(u * v, m)).join(','));
  let coeffs: V3 | undefined;
  for (const c of CANDIDATES) {
    const w = zone.basis.map((b) => mod(dot(c, b), m)).join(',');
    if (targets.includes(w)) {
      coeffs = c;
      break;
    }
  }
  if (!coeffs) coeffs = [op.t[0] / (DEN / m), op.t[1] / (DEN / m), op.t[2] / (DEN / m)].map((x) => mod(x, m)) as V3;
  const expr = linear(zone.basis.map((b) => dot(coeffs!, b)), zone.params);
  return {
    text: `${zone.label}: ${expr} = ${m}n`,
    zone: zone.rows.map((r) => [...r]),
    coeffs: [coeffs[0], coeffs[1], coeffs[2]],
    modulus: m,
  };
}

export function conditionKey(c: Condition): string {
  return c.zone.map((r) => r.join(',')).join(';') + '|' + c.coeffs.join(',') + '|' + c.modulus;
}

/** Zone dimension of a condition: 3 integral (hkl), 2 zonal (a plane), 1 serial (a row). */
export function conditionZoneDim(c: Condition): number {
  return 3 - c.zone.length;
}

/**
 * Every distinct condition the operations impose, integral first, then zonal, then serial
 * (the order of International Tables Vol. A), each group in order of first appearance.
 */
export function deriveConditions(ops: readonly SymOp[]): Condition[] {
  const byKey = new Map<string, Condition>();
  for (const o of ops) {
    if (isIdentityRotation(o.r) && isZero(o.t)) continue;
    const c = conditionOfOp(o);
    if (!c) continue;
    const k = conditionKey(c);
    if (!byKey.has(k)) byKey.set(k, c);
  }
  const list = [...byKey.values()];
  return list
    .map((c, i) => ({ c, i }))
    .sort((a, b) => a.c.zone.length - b.c.zone.length || a.i - b.i)
    .map((x) => x.c);
}

/** True when reflection (h,k,l) lies in the condition's zone and breaks it. */
export function breaksCondition(c: Condition, h: number, k: number, l: number): boolean {
  for (const e of c.zone) if (e[0] * h + e[1] * k + e[2] * l !== 0) return false;
  return (c.coeffs[0] * h + c.coeffs[1] * k + c.coeffs[2] * l) % c.modulus !== 0;
}

/**
 * Conditions of one zone combined in the style of International Tables
 * ("hkl: h+k, h+l, k+l = 2n", "hk0: h, k = 2n"); conditions with different moduli stay
 * separate ("00l: l = 4n"). For display only: the Condition objects stay exact.
 */
export function combinedConditionText(conditions: readonly Condition[]): string[] {
  const groups = new Map<string, { zone: string; modulus: number; exprs: string[] }>();
  for (const c of conditions) {
    const colon = c.text.indexOf(': ');
    const zone = c.text.slice(0, colon);
    const rest = c.text.slice(colon + 2);
    const eq = rest.lastIndexOf(' = ');
    const key = zone + '|' + c.modulus;
    const g = groups.get(key) ?? { zone, modulus: c.modulus, exprs: [] };
    g.exprs.push(rest.slice(0, eq));
    groups.set(key, g);
  }
  return [...groups.values()].map((g) => `${g.zone}: ${g.exprs.join(', ')} = ${g.modulus}n`);
}
