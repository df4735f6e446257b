import type { ReflectionTable } from '../core';
import { clamp, logNormalCdf } from './special-functions';

const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/** A reflection condition as the symmetry layer and `lacuna groups` give it. */
export interface ConditionLike {
  readonly text: string;
  readonly zone: readonly (readonly number[])[];
  readonly coeffs: readonly number[];
  readonly modulus: number;
}

export function conditionKey(c: ConditionLike): string {
  return `${c.zone.map((e) => e.join(',')).join(';')}|${c.coeffs.join(',')}|${c.modulus}`;
}

/** A fast test for one condition (flat integer arrays, no allocation per call). */
export function compileForbids(c: ConditionLike): (h: number, k: number, l: number) => boolean {
  const rows = Int32Array.from(c.zone.flat());
  const c0 = c.coeffs[0], c1 = c.coeffs[1], c2 = c.coeffs[2], m = c.modulus;
  return (h, k, l) => {
    for (let e = 0; e < rows.length; e += 3) if (rows[e] * h + rows[e + 1] * k + rows[e + 2] * l !== 0) return false;
    return (c0 * h + c1 * k + c2 * l) % m !== 0;
  };
}

/** Is h in the zone of the condition and forbidden by it? (conventions, section 2) */
export function forbids(c: ConditionLike, h: number, k: number, l: number): boolean {
  for (const e of c.zone) if (e[0] * h + e[1] * k + e[2] * l !== 0) return false;
  const v = c.coeffs[0] * h + c.coeffs[1] * k + c.coeffs[2] * l;
  return v % c.modulus !== 0;
}

/** Per-condition evidence over the data. */
export interface ConditionEvidence {
  readonly condition: ConditionLike;
  /** Observed reflections in the condition's zone. */
  readonly nZone: number;
  /** Observed reflections the condition forbids ("tested"). */
  readonly n: number;
  readonly meanIOverSigma: number;
  /** Forbidden reflections with I/sigma >= 3. */
  readonly nStrong: number;
  /** Forbidden reflections with 3 <= I/sigma < 6 (weak violations, e.g. multiple diffraction). */
  readonly nWeakViolations: number;
  /** Sum over forbidden reflections of log p(I | absent) - log p(I | present), nats. */
  readonly logOddsIntensities: number;
  /**
   * Evidence (nats) from a forbidden class with no observations at all while the zone is well
   * sampled: files whose absences were filtered out before they were written.
   */
  readonly logOddsMissing: number;
  /** True when the zone has observations but none in the forbidden class. */
  readonly forbiddenClassMissing: boolean;
  readonly probabilityAbsent: number;
  /** Rows of the strongest forbidden reflections (by I/sigma), strongest first, at most 10. */
  readonly strongest: number[];
}

export interface AbsenceEvidence {
  readonly conditions: ConditionEvidence[];
  /** Map from condition key to its index in `conditions`. */
  readonly indexOf: Map<string, number>;
  /** Distinct sets of conditions that forbid a reflection, with the summed log-odds of those reflections. */
  readonly patterns: { ids: number[]; logOdds: number; count: number }[];
  /** Per-reflection log-odds absent : present (NaN for reflections no condition forbids). */
  readonly reflectionLogOdds: Float64Array;
}

export interface AbsenceModel {
  /** Robust scale of sigma (true error = k sigma). */
  readonly k: number;
  /** Share of "absent" reflections allowed a weak violation (a broader error, x4). */
  readonly violationFraction: number;
}

/** log of the acentric Wilson density (mean S) convolved with N(0, s^2), at I (French & Wilson 1978). */
function logAcentricWithError(I: number, s: number, S: number): number {
  return -Math.log(S) - I / S + (s * s) / (2 * S * S) + logNormalCdf((I - (s * s) / S) / s);
}

const CQ = 48;

/**
 * log of the centric Wilson density, p(J) = exp(-J/(2S))/sqrt(2 pi S J), convolved with
 * N(0, s^2), at I. With J = S w^2 the integrand is smooth; the error kernel confines w to
 * [sqrt((I - 7s)/S), sqrt((I + 7s)/S)], integrated by the midpoint rule in log space.
 */
function logCentricWithError(I: number, s: number, S: number): number {
  const lo = Math.sqrt(Math.max(0, (I - 7 * s) / S));
  const hi = Math.max(Math.sqrt(Math.max(0, (I + 7 * s) / S)), lo + Math.sqrt(s / S) * 0.5, 1e-6);
  const dw = (hi - lo) / CQ;
  let m = -Infinity;
  const terms = new Float64Array(CQ);
  for (let i = 0; i < CQ; i++) {
    const w = lo + (i + 0.5) * dw;
    const u = (I - S * w * w) / s;
    const t = -0.5 * w * w - 0.5 * u * u;
    terms[i] = t;
    if (t > m) m = t;
  }
  let sum = 0;
  for (let i = 0; i < CQ; i++) sum += Math.exp(terms[i] - m);
  // 2/sqrt(2 pi) for the two signs of w, 1/(s sqrt(2 pi)) for the error density
  return m + Math.log(sum * dw) + Math.log(2 / Math.sqrt(2 * Math.PI)) - Math.log(s) - LOG_SQRT_2PI;
}

/**
 * log p(I | absent) - log p(I | present) for one reflection.
 * Present: the Wilson distribution of its shell (mean S, already multiplied by epsilon),
 * convolved with the error N(0, (k sigma)^2) (French & Wilson 1978, Acta Cryst. A34,
 * 517-525): acentric, or half acentric and half centric for a reflection in a zone
 * perpendicular to a 2-fold (`centricWeight` = 0.5), where centric groups of the class make
 * it centric and the others do not.
 * Absent: I ~ N(0, (k sigma)^2), mixed with a small fraction of N(0, (4 k sigma)^2) for weak
 * violations such as multiple diffraction.
 * Limited to [-12, +4] nats: one reflection never decides alone (a zinger or an overlap can
 * sit on an absent position), and a very precise zero is only so much more likely under
 * "absent" than under "weak but present" once the model's own errors are allowed for.
 */
export function reflectionLogOdds(I: number, sigma: number, S: number, model: AbsenceModel, centricWeight = 0): number {
  const s = Math.max(model.k * sigma, 1e-9 * Math.max(S, 1));
  const Sp = Math.max(S, 1e-30);
  const eps = model.violationFraction;
  let lp = logAcentricWithError(I, s, Sp);
  if (centricWeight > 0) {
    const lc = logCentricWithError(I, s, Sp);
    const mx = Math.max(lp, lc);
    lp = mx + Math.log((1 - centricWeight) * Math.exp(lp - mx) + centricWeight * Math.exp(lc - mx));
  }
  // log[(1-eps) N(I; 0, s^2) + eps N(I; 0, (4s)^2)], one exp and one log unless far in the tail
  const u2 = (I / s) * (I / s);
  const la = u2 < 1400
    ? Math.log((1 - eps) * Math.exp(-0.5 * u2) + 0.25 * eps * Math.exp(-u2 / 32)) - Math.log(s) - LOG_SQRT_2PI
    : Math.log(0.25 * eps) - u2 / 32 - Math.log(s) - LOG_SQRT_2PI;
  return clamp(la - lp, -12, 4);
}

/** Per-condition weight and cap of the "missing forbidden class" evidence. */
export const MISSING_CLASS_WEIGHT = 0.5;
export const MISSING_CLASS_CAP = 10;
/** Zone size from which a missing class is reported as such (the evidence itself counts from one reflection). */
export const MISSING_CLASS_MIN_ZONE = 3;

/**
 * Evidence (nats) that a forbidden class with no observation among the nZone of its zone is
 * absent: weighted (1/m)^N, capped. One or two reflections on a short screw axis still count,
 * for little: a 4_1 axis with one axial orbit is the only trace of the absences in a filtered file.
 */
export function missingClassLogOdds(nZone: number, modulus: number): number {
  return nZone > 0 ? Math.min(MISSING_CLASS_CAP, MISSING_CLASS_WEIGHT * nZone * Math.log(modulus)) : 0;
}

/**
 * Evaluate every distinct condition once per reflection, grouped by zone so that a reflection
 * outside a zone costs one dot product for all conditions of that zone. Linear in reflections.
 *
 * Missing-class evidence: if the N observed reflections of a zone all fall in the allowed class
 * of a condition with modulus m, a uniformly sampled zone would have produced that with
 * probability (1/m)^N if the forbidden class were present. Files filtered by their depositor
 * make this the only trace of the absences, but it mirrors the depositor's choice as much as
 * the crystal, so it enters with weight 1/2 and at most 10 nats per condition (a judgement).
 * `stride` > 1 evaluates every stride-th reflection only (a quick first look on large data).
 */
export function absenceEvidence(
  table: ReflectionTable, expected: Float64Array, conditions: readonly ConditionLike[], model: AbsenceModel,
  stride = 1, centricZone?: Uint8Array, general?: Uint8Array,
): AbsenceEvidence {
  const n = table.n;
  const nc = conditions.length;
  const indexOf = new Map<string, number>();
  conditions.forEach((c, j) => indexOf.set(conditionKey(c), j));
  // group conditions by zone
  const zoneKeys = new Map<string, number>();
  const zones: (readonly (readonly number[])[])[] = [];
  const zoneOf = new Int32Array(nc);
  conditions.forEach((c, j) => {
    const zk = c.zone.map((e) => e.join(',')).join(';');
    let z = zoneKeys.get(zk);
    if (z === undefined) { z = zones.length; zoneKeys.set(zk, z); zones.push(c.zone); }
    zoneOf[j] = z;
  });
  const condsOfZone: number[][] = zones.map(() => []);
  for (let j = 0; j < nc; j++) condsOfZone[zoneOf[j]].push(j);
  const zoneRows = zones.map((z) => z.map((e) => [e[0], e[1], e[2]]));
  const coeffs = conditions.map((c) => [c.coeffs[0], c.coeffs[1], c.coeffs[2]]);
  const moduli = conditions.map((c) => c.modulus);

  const nZone = new Int32Array(zones.length);
  const nForb = new Int32Array(nc), nStrong = new Int32Array(nc), nWeak = new Int32Array(nc);
  const sumIs = new Float64Array(nc), sumLo = new Float64Array(nc);
  const strongest: number[][] = conditions.map(() => []);
  // I/sigma a reflection must beat to enter a condition's list of the ten strongest
  const strongMin = new Float64Array(nc).fill(-Infinity);
  const perReflection = new Float64Array(n).fill(NaN);
  // Patterns are keyed by a number: the bit set of the conditions (exact up to 52 conditions),
  // else by a hash of the bit set in 32-bit words, with the words compared on a hit (cubic
  // cells have about 60 conditions; no string per reflection).
  const numericKeys = nc <= 52;
  const pow2 = Float64Array.from({ length: Math.min(nc, 53) }, (_, c) => 2 ** c);
  const patternByNumber = new Map<number, { ids: number[]; logOdds: number; count: number }>();
  type WordPattern = { words: Uint32Array; p: { ids: number[]; logOdds: number; count: number } };
  const patternByHash = new Map<number, WordPattern[]>();
  const patternsInOrder: { ids: number[]; logOdds: number; count: number }[] = [];
  const words = new Uint32Array(numericKeys ? 0 : Math.ceil(nc / 32));
  const zoneFlat = zoneRows.map((rows) => Int32Array.from(rows.flat()));
  const condsOfZoneFlat = condsOfZone.map((c) => Int32Array.from(c));
  const coeffFlat = Int32Array.from(coeffs.flat());
  const modFlat = Int32Array.from(moduli);
  // m - 1 for a power-of-two modulus (x & (m - 1) is 0 exactly when m divides x, negative x too), else -1
  const modMask = Int32Array.from(moduli, (md) => ((md & (md - 1)) === 0 ? md - 1 : -1));
  // conditions forbidding the current reflection: a scratch array and its count (no allocation)
  const ids = new Int32Array(nc);
  let nIds = 0;
  // Reflections that only lattice-centring conditions (no zone) forbid can number half a
  // million; beyond 50,000 of them the log-odds is evaluated for every m-th one and counted
  // m times (the counts and I/sigma figures stay exact; the sums are far beyond any doubt).
  const zoneless = zoneFlat.map((r) => r.length === 0);
  // the zones a general reflection can lie in: only those without rows (the whole lattice)
  const zonelessZones = Int32Array.from(zoneless.flatMap((x, z) => (x ? [z] : [])));
  const m = Math.max(1, Math.floor(n / stride / 50_000));
  let zonelessSeen = 0;

  for (let j = 0; j < n; j += stride) {
    const h = table.h[j], k = table.k[j], l = table.l[j];
    nIds = 0;
    let key = 0;
    let onlyZoneless = true;
    // a reflection fixed by no rotation lies in no zone but the whole lattice
    const isGeneral = general !== undefined && general[j] === 1;
    const nz = isGeneral ? zonelessZones.length : zoneFlat.length;
    for (let w = 0; w < words.length; w++) words[w] = 0;
    for (let zi = 0; zi < nz; zi++) {
      const z = isGeneral ? zonelessZones[zi] : zi;
      const rows = zoneFlat[z];
      let inZone = true;
      for (let e = 0; e < rows.length; e += 3) {
        if (rows[e] * h + rows[e + 1] * k + rows[e + 2] * l !== 0) { inZone = false; break; }
      }
      if (!inZone) continue;
      nZone[z]++;
      const cz = condsOfZoneFlat[z];
      for (let q = 0; q < cz.length; q++) {
        const c = cz[q];
        const v = coeffFlat[3 * c] * h + coeffFlat[3 * c + 1] * k + coeffFlat[3 * c + 2] * l;
        if (modMask[c] >= 0 ? (v & modMask[c]) !== 0 : v % modFlat[c] !== 0) {
          ids[nIds++] = c;
          if (!zoneless[z]) onlyZoneless = false;
          if (numericKeys) key += pow2[c];
          else words[c >>> 5] |= 1 << (c & 31);
        }
      }
    }
    if (nIds === 0) continue;
    const sig = table.sigma[j];
    const I = table.i[j];
    let lo = 0, weight = 1;
    if (!onlyZoneless || m === 1 || zonelessSeen++ % m === 0) {
      lo = reflectionLogOdds(I, sig, expected[j], model, centricZone && centricZone[j] ? 0.5 : 0);
      perReflection[j] = lo;
      if (onlyZoneless) weight = m;
    }
    const ios = sig > 0 ? I / sig : 0;
    for (let q = 0; q < nIds; q++) {
      const c = ids[q];
      nForb[c]++;
      sumIs[c] += ios;
      sumLo[c] += weight * lo;
      if (ios >= 3) nStrong[c]++;
      if (ios >= 3 && ios < 6) nWeak[c]++;
      if (ios > strongMin[c]) strongMin[c] = insertStrongest(strongest[c], j, ios, table);
    }
    let p;
    if (numericKeys) {
      p = patternByNumber.get(key);
      if (!p) { p = { ids: sortedIds(ids, nIds), logOdds: 0, count: 0 }; patternByNumber.set(key, p); }
    } else {
      let hash = 0;
      for (let w = 0; w < words.length; w++) hash = (Math.imul(hash, 0x9e3779b1) ^ words[w]) >>> 0;
      let bucket = patternByHash.get(hash);
      if (!bucket) { bucket = []; patternByHash.set(hash, bucket); }
      let found: WordPattern | undefined;
      for (let b = 0; b < bucket.length && !found; b++) {
        const bw = bucket[b].words;
        let same = true;
        for (let w = 0; w < words.length; w++) if (bw[w] !== words[w]) { same = false; break; }
        if (same) found = bucket[b];
      }
      if (!found) {
        found = { words: words.slice(), p: { ids: sortedIds(ids, nIds), logOdds: 0, count: 0 } };
        bucket.push(found);
        patternsInOrder.push(found.p);
      }
      p = found.p;
    }
    p.logOdds += weight * lo;
    p.count++;
  }

  const out: ConditionEvidence[] = conditions.map((c, j) => {
    const nz = nZone[zoneOf[j]];
    const missing = nForb[j] === 0 && nz >= MISSING_CLASS_MIN_ZONE;
    const logOddsMissing = nForb[j] === 0 ? missingClassLogOdds(nz, c.modulus) : 0;
    const total = sumLo[j] + logOddsMissing;
    return {
      condition: c,
      nZone: nz,
      n: nForb[j],
      meanIOverSigma: nForb[j] ? sumIs[j] / nForb[j] : NaN,
      nStrong: nStrong[j],
      nWeakViolations: nWeak[j],
      logOddsIntensities: sumLo[j],
      logOddsMissing,
      forbiddenClassMissing: missing,
      probabilityAbsent: 1 / (1 + Math.exp(-clamp(total, -700, 700))),
      strongest: strongest[j],
    };
  });
  return { conditions: out, indexOf, patterns: [...patternByNumber.values(), ...patternsInOrder], reflectionLogOdds: perReflection };
}

/** The first `count` entries of `ids` as a sorted plain array. */
function sortedIds(ids: Int32Array, count: number): number[] {
  return Array.from(ids.subarray(0, count)).sort((a, b) => a - b);
}

/** Insert row j (with I/sigma v) into a list of at most ten rows, strongest first; returns the new entry threshold. */
function insertStrongest(list: number[], j: number, v: number, table: ReflectionTable): number {
  const ios = (r: number) => (table.sigma[r] > 0 ? table.i[r] / table.sigma[r] : 0);
  let p = list.length;
  while (p > 0 && ios(list[p - 1]) < v) p--;
  list.splice(p, 0, j);
  if (list.length > 10) list.pop();
  return list.length === 10 ? ios(list[9]) : -Infinity;
}
