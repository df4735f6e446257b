import type { SpaceGroupSetting } from './settings';
import { DEN } from './ops';

/**
 * Per-reflection symmetry. Miller indices are rows: operation (R, t) maps h to h R and shifts
 * the phase by 2 pi h.t (International Tables Vol. B, 1.4.2).
 */

/**
 * Systematically absent: some operation (R, t) of the full group (centring included) fixes h
 * (h R = h) while h.t is not an integer. Index 000 is never absent.
 */
export function isSystematicallyAbsent(setting: SpaceGroupSetting, h: number, k: number, l: number): boolean {
  for (const o of setting.ops) {
    const r = o.r;
    if (h * r[0] + k * r[3] + l * r[6] !== h) continue;
    if (h * r[1] + k * r[4] + l * r[7] !== k) continue;
    if (h * r[2] + k * r[5] + l * r[8] !== l) continue;
    if ((h * o.t[0] + k * o.t[1] + l * o.t[2]) % DEN !== 0) return true;
  }
  return false;
}

/**
 * Epsilon factor: the number of point-group operations (rotation parts, centring not counted)
 * that leave h unchanged, h R = h. The expected intensity of h in Wilson statistics is
 * epsilon times the mean (Wilson 1949; International Tables Vol. B, 2.1). For 000 it is the
 * point-group order. Same quantity as gemmi's epsilon_factor_without_centering.
 */
export function epsilonFactor(setting: SpaceGroupSetting, h: number, k: number, l: number): number {
  let n = 0;
  for (const r of setting.rotations) {
    if (h * r[0] + k * r[3] + l * r[6] === h && h * r[1] + k * r[4] + l * r[7] === k && h * r[2] + k * r[5] + l * r[8] === l) n++;
  }
  return n;
}

/** Centric: some operation maps h to -h (h R = -h), so the phase is restricted to two values. */
export function isCentric(setting: SpaceGroupSetting, h: number, k: number, l: number): boolean {
  for (const r of setting.rotations) {
    if (h * r[0] + k * r[3] + l * r[6] === -h && h * r[1] + k * r[4] + l * r[7] === -k && h * r[2] + k * r[5] + l * r[8] === -l) return true;
  }
  return false;
}

/**
 * Indices of h under every rotation part, h R, written into `out` as (h,k,l) triples
 * (length 3 * rotations.length). Pass `setting.laueRotations` to include Friedel mates.
 * Duplicates are kept (h fixed by several operations appears several times).
 */
export function rotatedIndices(rotations: readonly Int32Array[], h: number, k: number, l: number, out?: Int32Array): Int32Array {
  const res = out ?? new Int32Array(rotations.length * 3);
  for (let j = 0; j < rotations.length; j++) {
    const r = rotations[j];
    res[3 * j] = h * r[0] + k * r[3] + l * r[6];
    res[3 * j + 1] = h * r[1] + k * r[4] + l * r[7];
    res[3 * j + 2] = h * r[2] + k * r[5] + l * r[8];
  }
  return res;
}

/** Distinct symmetry-equivalent indices of h under the given rotations, as [h,k,l] triples. */
export function equivalentIndices(rotations: readonly Int32Array[], h: number, k: number, l: number): [number, number, number][] {
  const all = rotatedIndices(rotations, h, k, l);
  const seen = new Set<string>();
  const out: [number, number, number][] = [];
  for (let j = 0; j < rotations.length; j++) {
    const t: [number, number, number] = [all[3 * j], all[3 * j + 1], all[3 * j + 2]];
    const key = t.join(',');
    if (!seen.has(key)) {
      seen.add(key);
      out.push(t);
    }
  }
  return out;
}

/** Phase shift of operation (R, t) at h, in turns (h.t as a fraction of 1, numerator over DEN). */
export function phaseShiftNumerator(t: Int32Array, h: number, k: number, l: number): number {
  const s = (h * t[0] + k * t[1] + l * t[2]) % DEN;
  return s < 0 ? s + DEN : s;
}

type IndexColumn = ArrayLike<number>;

/**
 * Absence flags of one setting over columns of indices (1 = systematically absent), e.g. the
 * h, k, l columns of a ReflectionTable. Uses the setting's derived conditions; for all settings
 * at once use classifyReflections. `out` (length >= n) is reused when given.
 */
export function absentFlags(setting: SpaceGroupSetting, h: IndexColumn, k: IndexColumn, l: IndexColumn, n: number, out?: Uint8Array): Uint8Array {
  const res = out && out.length >= n ? out : new Uint8Array(n);
  const conds = setting.conditions;
  const nc = conds.length;
  // flatten once: up to two zone rows, coefficients and modulus per condition
  const rows = new Int32Array(nc * 6);
  const nRows = new Int32Array(nc);
  const co = new Int32Array(nc * 3);
  const mo = new Int32Array(nc);
  conds.forEach((c, j) => {
    nRows[j] = c.zone.length;
    c.zone.forEach((e, r) => rows.set(e, 6 * j + 3 * r));
    co.set(c.coeffs, 3 * j);
    mo[j] = c.modulus;
  });
  for (let i = 0; i < n; i++) {
    const hi = h[i], ki = k[i], li = l[i];
    let absent = 0;
    for (let j = 0; j < nc && !absent; j++) {
      let inZone = true;
      for (let r = 0; r < nRows[j]; r++) {
        const o = 6 * j + 3 * r;
        if (Math.imul(rows[o], hi) + Math.imul(rows[o + 1], ki) + Math.imul(rows[o + 2], li) !== 0) { inZone = false; break; }
      }
      if (inZone && (Math.imul(co[3 * j], hi) + Math.imul(co[3 * j + 1], ki) + Math.imul(co[3 * j + 2], li)) % mo[j] !== 0) absent = 1;
    }
    res[i] = absent;
  }
  return res;
}

/** Epsilon factor of every reflection (see epsilonFactor). `out` (length >= n) is reused when given. */
export function epsilonColumn(setting: SpaceGroupSetting, h: IndexColumn, k: IndexColumn, l: IndexColumn, n: number, out?: Uint8Array): Uint8Array {
  const res = out && out.length >= n ? out : new Uint8Array(n);
  for (let i = 0; i < n; i++) res[i] = epsilonFactor(setting, h[i], k[i], l[i]);
  return res;
}

/** Centric flag of every reflection (1 = centric, see isCentric). `out` (length >= n) is reused when given. */
export function centricColumn(setting: SpaceGroupSetting, h: IndexColumn, k: IndexColumn, l: IndexColumn, n: number, out?: Uint8Array): Uint8Array {
  const res = out && out.length >= n ? out : new Uint8Array(n);
  for (let i = 0; i < n; i++) res[i] = isCentric(setting, h[i], k[i], l[i]) ? 1 : 0;
  return res;
}
