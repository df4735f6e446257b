import { fail, ok, type Result } from '../core';
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

/** One index of a zone label: `h`, `-h`, `0` stand alone; `(2h)`, `(-h-k)` get parentheses. */
function wrapTerm(t: string): string {
  return /^-?[hkl]$|^0$/.test(t) ? t : `(${t})`;
}

/**
 * The Hermite normal form basis (two rows, echelon, positive pivots, entries above the second
 * pivot reduced) of the integer rows orthogonal to a primitive direction v: unique, so equal
 * zones get equal rows.
 */
function complementRows(v: V3): V3[] {
  const cands: V3[] = [];
  const B = 3;
  for (let a = -B; a <= B; a++)
    for (let b = -B; b <= B; b++)
      for (let c = -B; c <= B; c++) {
        const e: V3 = [a, b, c];
        if (!isZero(e) && dot(e, v) === 0) cands.push(e);
      }
  const pivot = (e: V3) => e.findIndex((x) => x !== 0);
  for (const e1 of cands) {
    const p1 = pivot(e1);
    if (e1[p1] <= 0) continue;
    for (const e2 of cands) {
      const p2 = pivot(e2);
      if (p2 <= p1 || e2[p2] <= 0 || e1[p2] < 0 || e1[p2] >= e2[p2]) continue;
      const c = cross(e1, e2);
      const same = c[0] === v[0] && c[1] === v[1] && c[2] === v[2];
      const opposite = c[0] === -v[0] && c[1] === -v[1] && c[2] === -v[2];
      if (same || opposite) return [e1, e2];
    }
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
  const parts = [0, 1, 2].map((p) => (p === j ? wrapTerm(dep) : LETTERS[p]));
  return { dim: 2, basis, rows: [n], label: parts.join(''), params };
}

function lineZone(v: V3): Zone {
  const first = v.findIndex((x) => x !== 0);
  const letter = LETTERS[first];
  const label = v.map((c) => (c === 0 ? '0' : wrapTerm(term(c, letter)))).join('');
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
  return canonicalCondition(zone, zone.basis.map((b) => dot(b, op.t)), DEN);
}

/**
 * The condition "sum_q vals[q] a_q = 0 mod m" on the zone points sum_q a_q basis[q], in
 * canonical form, or null when every point of the zone satisfies it.
 */
function canonicalCondition(zone: Zone, values: number[], modulus: number): Condition | null {
  let vals = values.map((v) => mod(v, modulus));
  if (vals.every((v) => v === 0)) return null;
  const g = vals.reduce((a, v) => gcd(a, v), modulus);
  const m = modulus / g;
  vals = vals.map((v) => v / g);
  // u v (u a unit mod m) has the same kernel, so the same absent set: take the simplest coefficients
  const targets = units(m).map((u) => vals.map((v) => mod(u * v, m)).join(','));
  let coeffs: V3 | undefined;
  for (const c of CANDIDATES) {
    const w = zone.basis.map((b) => mod(dot(c, b), m)).join(',');
    if (targets.includes(w)) {
      coeffs = c;
      break;
    }
  }
  if (!coeffs) throw new Error(`canonicalCondition: no small coefficients for ${vals} mod ${m} on zone ${zone.label}`);
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
 * (the order of International Tables Vol. A); zones in ITA's order (0kl, h0l, hk0, hhl, ...),
 * conditions of one zone by coefficients (h first). A condition implied by the others of the same zone
 * (00l: l = 2n beside 00l: l = 4n) is left out, as in International Tables; the absent set
 * is unchanged by that.
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
  const kept = dropRedundant(list);
  return kept.sort(
    (a, b) =>
      a.zone.length - b.zone.length ||
      zoneRank(a) - zoneRank(b) ||
      zoneLabel(a).localeCompare(zoneLabel(b)) ||
      b.coeffs[0] - a.coeffs[0] || b.coeffs[1] - a.coeffs[1] || b.coeffs[2] - a.coeffs[2],
  );
}

/** Zones in the order International Tables list them; others after, by label. */
const ZONE_ORDER = ['hkl', '0kl', 'h0l', 'hk0', 'hhl', 'h-hl', 'hkk', 'hk-k', 'hkh', 'hk-h', 'h00', '0k0', '00l', 'hh0', 'h-h0', 'hhh'];

function zoneLabel(c: Condition): string {
  return c.text.slice(0, c.text.indexOf(':'));
}

function zoneRank(c: Condition): number {
  const r = ZONE_ORDER.indexOf(zoneLabel(c));
  return r < 0 ? ZONE_ORDER.length : r;
}

function zoneKey(c: Condition): string {
  return c.zone.map((r) => r.join(',')).join(';');
}

/**
 * Within each zonal or serial zone, drop conditions whose absent set lies inside the union of the others'
 * (00l: l = 2n beside 00l: l = 4n; 0kl: k+l = 2n beside 0kl: k = 2n and 0kl: l = 2n), the
 * ones with more terms first. Tested over one period of the zone's points.
 */
function dropRedundant(list: Condition[]): Condition[] {
  const byZone = new Map<string, Condition[]>();
  for (const c of list) {
    const z = zoneKey(c);
    const g = byZone.get(z) ?? [];
    g.push(c);
    byZone.set(z, g);
  }
  const removed = new Set<Condition>();
  for (const group of byZone.values()) {
    // integral conditions stay as the lattice gives them (F: h+k, h+l, k+l = 2n, as ITA prints)
    if (group.length < 2 || group[0].zone.length === 0) continue;
    const basis = zoneFromRows(group[0].zone);
    let period = 1;
    for (const c of group) period = lcm(period, c.modulus);
    const points = periodPoints(basis, period);
    const nz = (c: Condition) => c.coeffs.filter((x) => x !== 0).length;
    const order = [...group].sort((a, b) => nz(b) - nz(a) || a.modulus - b.modulus);
    for (const a of order) {
      const others = group.filter((b) => b !== a && !removed.has(b));
      const covered = points.every((p) => dot(a.coeffs, p) % a.modulus === 0 || others.some((b) => dot(b.coeffs, p) % b.modulus !== 0));
      if (covered) removed.add(a);
    }
  }
  return list.filter((c) => !removed.has(c));
}

function lcm(a: number, b: number): number {
  return (a / gcd(a, b)) * b;
}

/** The zone points sum_q a_q basis[q] with 0 <= a_q < period. */
function periodPoints(basis: V3[], period: number): V3[] {
  const out: V3[] = [];
  const d = basis.length;
  const idx = new Array<number>(d).fill(0);
  for (;;) {
    const p: V3 = [0, 0, 0];
    for (let q = 0; q < d; q++) for (let i = 0; i < 3; i++) p[i] += idx[q] * basis[q][i];
    out.push(p);
    let q = 0;
    while (q < d && ++idx[q] === period) idx[q++] = 0;
    if (q === d) break;
  }
  return out;
}

/** Basis of the zone lattice {h : e.h = 0 for every row e}. */
function zoneFromRows(rows: number[][]): V3[] {
  if (rows.length === 0) return [[1, 0, 0], [0, 1, 0], [0, 0, 1]];
  if (rows.length === 1) return planeZone(primitive(rows[0] as V3)).basis;
  return [primitive(cross(rows[0] as V3, rows[1] as V3))];
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

/**
 * Read conditions written in the notation of International Tables ("h0l: l = 2n",
 * "hkl: h+k, h+l, k+l = 2n", "hhl: 2h+l = 4n", "h-hl: h+l = 3n", "(-2k)kl: l = 2n") into
 * exact, canonical Condition objects (one per expression). Fails with the column of the
 * problem.
 */
export function parseConditionText(text: string): Result<Condition[]> {
  const where = (col: number) => ({ file: 'condition', column: col + 1 });
  const colon = text.indexOf(':');
  if (colon < 0) return fail(`condition '${text}' needs a zone before ':', e.g. 'h0l: l = 2n'`, where(0));
  const label = text.slice(0, colon).trim();
  const tokens = label.match(/\([^()]*\)|-?[1-9]\d*[hkl]|-?[hkl]|0/g) ?? [];
  if (tokens.join('') !== label.replace(/\s+/g, '') || tokens.length !== 3)
    return fail(`zone '${label}' in '${text}' is not three indices such as hkl, h0l, hhl, h-hl, 00l`, where(0));
  const forms: Map<string, number>[] = [];
  for (const t of tokens) {
    const f = parseLinear(t.replace(/^\(|\)$/g, ''));
    if (!f) return fail(`index '${t}' of zone '${label}' is not a linear expression in h, k, l`, where(0));
    forms.push(f);
  }
  const letters = [...new Set(forms.flatMap((f) => [...f.keys()]))];
  const basis: V3[] = letters.map((p) => forms.map((f) => f.get(p) ?? 0) as V3);
  const rest = text.slice(colon + 1);
  const m = /^\s*(.+?)\s*=\s*(\d+)\s*n\s*$/.exec(rest);
  if (!m) return fail(`expected 'expression = Nn' after the zone in '${text}'`, where(colon + 1));
  const modulus = Number(m[2]);
  if (modulus < 2) return fail(`modulus ${modulus} in '${text}' must be at least 2`, where(colon + 1));
  let zone: Zone;
  if (letters.length === 3) zone = computeZone([1, 0, 0, 0, 1, 0, 0, 0, 1])!;
  else if (letters.length === 2) {
    const n = cross(basis[0], basis[1]);
    if (isZero(n)) return fail(`zone '${label}' is degenerate`, where(0));
    zone = planeZone(primitive(n));
  } else if (letters.length === 1) zone = lineZone(primitive(basis[0]));
  else return fail(`zone '${label}' has no free index`, where(0));
  const out: Condition[] = [];
  for (const exprText of m[1].split(',')) {
    const e = parseLinear(exprText.trim());
    if (!e || [...e.keys()].some((p) => !letters.includes(p)))
      return fail(`'${exprText.trim()}' in '${text}' is not a linear expression in the zone's indices (${letters.join(', ')})`, where(colon + 1));
    // integer coefficients c on hkl with c.b_p = e_p for the label's basis vectors
    const want = letters.map((p) => e.get(p) ?? 0);
    const c = CANDIDATES.find((cand) => basis.every((b, q) => dot(cand, b) === want[q]));
    if (!c) return fail(`cannot express '${exprText.trim()}' on zone '${label}'`, where(colon + 1));
    const cond = canonicalCondition(zone, zone.basis.map((b) => dot(c, b)), modulus);
    if (cond) out.push(cond);
  }
  return ok(out);
}

/** `h`, `-2h+k`, `h-k`, `2h+l` -> coefficient per letter; undefined if malformed. */
function parseLinear(s: string): Map<string, number> | undefined {
  const terms = s.replace(/\s+/g, '').match(/[+-]?\d*[hkl]|[+-]?\d+/g);
  if (!terms || terms.join('') !== s.replace(/\s+/g, '')) return undefined;
  const f = new Map<string, number>();
  for (const t of terms) {
    const mm = /^([+-]?)(\d*)([hkl]?)$/.exec(t)!;
    const coef = (mm[1] === '-' ? -1 : 1) * (mm[2] ? Number(mm[2]) : 1);
    if (!mm[3]) {
      if (coef !== 0) return undefined; // a constant other than 0 is no zone index
      continue;
    }
    f.set(mm[3], (f.get(mm[3]) ?? 0) + coef);
  }
  return f;
}
