import { emptyMeta, fail, ok, ReflectionTableBuilder, type ReflectionTable, type Result } from '../core';
import { MODEL_TDEN, type CrystalModel, type ModelOp } from './crystal-model';
import { computeStructureFactors, prepareModel, type LongJobOptions } from './structure-factors';
import { SeededRandom } from './seeded-random';
import { hemisphereIndices } from './hemisphere';
import { distinctRotations } from '../symmetry';

/**
 * Measured-looking data from a model, deterministic for a given seed.
 *
 * True intensities are k |F|^2 with k chosen so that their mean over the generated
 * reflections is `meanIntensity`. Each observation gets sigma^2 = I + background + (p I)^2
 * (counting statistics, background, and a proportional error: common practice) and
 * Io = I + sigma * N(0, 1), so negative intensities occur for weak reflections as they do in
 * real data. Systematically absent reflections have I = 0, except `violations` of them
 * that get a weak intensity, as multiple diffraction produces in real measurements.
 *
 * Merged output: every h,k,l with d >= dmin in one hemisphere (Friedel mates merged;
 * symmetry equivalents kept, each with its own noise). Unmerged output: each reflection of
 * the Laue group's unique set observed 1..(2 multiplicity - 1) times at random
 * symmetry equivalents (and Friedel mates), each observation with its own noise.
 */
export interface SimulationOptions extends LongJobOptions {
  /** Resolution limit in angstrom. */
  dmin: number;
  seed: number;
  unmerged?: boolean;
  /** Mean true intensity (default 1000). */
  meanIntensity?: number;
  /** Background variance term (default 20). */
  background?: number;
  /** Proportional error p (default 0.02). */
  p?: number;
  /** Fraction of reflections left out at random, 0..1 (default 0). */
  incompleteness?: number;
  /** Number of absent reflections given a weak intensity (default 0). */
  violations?: number;
  /** Mean observations per unique reflection when unmerged (default 4). */
  multiplicity?: number;
  /** Wavelength for the file header, angstrom (default 0.71073). */
  wavelength?: number;
  /** Source label for the table's meta. */
  source?: string;
}

export interface SimulationResult {
  readonly table: ReflectionTable;
  /** k: true I = k |F|^2. */
  readonly scale: number;
  /** Systematically absent reflections among the generated ones (before violations). */
  readonly absent: number;
  /** The absent reflections that were given a weak intensity. */
  readonly violations: { h: number; k: number; l: number; intensity: number }[];
}

/** Store at 0.01 so that what a file writer prints and a reader reads back is the same number. */
const round2 = (x: number) => Math.round(x * 100) / 100 + 0; // + 0 turns -0 into 0

export function simulateData(model: CrystalModel, o: SimulationOptions): Result<SimulationResult> {
  const { dmin, seed } = o;
  if (!(dmin > 0)) return fail(`the resolution limit must be positive (got ${dmin} angstrom)`);
  if (!Number.isFinite(seed)) return fail(`the seed must be a number (got ${seed})`);
  const meanI = o.meanIntensity ?? 1000, bg = o.background ?? 20, p = o.p ?? 0.02;
  const incompleteness = o.incompleteness ?? 0, nViol = Math.floor(o.violations ?? 0), mult = o.multiplicity ?? 4;
  if (!(meanI > 0)) return fail('the mean intensity must be positive');
  if (!(bg >= 0) || !(p >= 0)) return fail('background and p must not be negative');
  if (!(incompleteness >= 0 && incompleteness < 1)) return fail('incompleteness is a fraction from 0 up to (not including) 1');
  if (!(nViol >= 0)) return fail('the number of violations must not be negative');
  if (!(mult >= 1)) return fail('the multiplicity must be at least 1');

  const cell = model.cell;
  const rots = distinctRotations(model.ops);
  const list = hemisphereIndices(cell, dmin, o.unmerged ? (h, k, l) => isLaueRepresentative(rots, h, k, l) : undefined);
  if (!list.ok) return list;
  const { h: hs, k: ks, l: ls } = list.value;
  const n = hs.length;
  const re = new Float64Array(n), im = new Float64Array(n);
  if (!computeStructureFactors(prepareModel(model), hs, ks, ls, re, im, o)) return fail('simulation cancelled');
  const absent = new Uint8Array(n);
  let sum = 0, nPresent = 0, nAbsent = 0;
  for (let j = 0; j < n; j++) {
    if (isAbsentByOps(model.ops, hs[j], ks[j], ls[j])) { absent[j] = 1; nAbsent++; continue; }
    sum += re[j] * re[j] + im[j] * im[j];
    nPresent++;
  }
  if (!(sum > 0)) return fail('the model gives zero intensity everywhere');
  const scale = meanI / (sum / nPresent);
  const truth = new Float64Array(n);
  for (let j = 0; j < n; j++) truth[j] = absent[j] ? 0 : scale * (re[j] * re[j] + im[j] * im[j]);

  const rng = new SeededRandom(seed);
  // weak violations at absent positions: a few sigma of background
  const violations: SimulationResult['violations'] = [];
  if (nViol > 0 && nAbsent > 0) {
    const absentIdx: number[] = [];
    for (let j = 0; j < n; j++) if (absent[j]) absentIdx.push(j);
    for (let v = 0; v < Math.min(nViol, absentIdx.length); v++) {
      const pick = v + rng.below(absentIdx.length - v);
      [absentIdx[v], absentIdx[pick]] = [absentIdx[pick], absentIdx[v]];
      const j = absentIdx[v];
      truth[j] = (3 + 3 * rng.uniform()) * Math.sqrt(bg + 1) + 0.005 * meanI;
      violations.push({ h: hs[j], k: ks[j], l: ls[j], intensity: truth[j] });
    }
  }

  const b = new ReflectionTableBuilder(o.unmerged ? n * mult : n);
  const observe = (hh: number, kk: number, ll: number, i: number) => {
    const s = Math.sqrt(i + bg + p * p * i * i);
    b.push(hh, kk, ll, round2(i + s * rng.normal()), Math.max(round2(s), 0.01));
  };
  for (let j = 0; j < n; j++) {
    if (incompleteness > 0 && rng.uniform() < incompleteness) continue;
    if (!o.unmerged) { observe(hs[j], ks[j], ls[j], truth[j]); continue; }
    const m = 1 + rng.below(2 * Math.round(mult) - 1);
    for (let r = 0; r < m; r++) {
      const R = rots[rng.below(rots.length)];
      const sign = rng.uniform() < 0.5 ? -1 : 1;
      const h = sign * (hs[j] * R[0] + ks[j] * R[3] + ls[j] * R[6]);
      const k = sign * (hs[j] * R[1] + ks[j] * R[4] + ls[j] * R[7]);
      const l = sign * (hs[j] * R[2] + ks[j] * R[5] + ls[j] * R[8]);
      observe(h, k, l, truth[j]);
    }
  }
  const meta = emptyMeta(o.source ?? `simulated from ${model.source}`);
  meta.cell = cell.params();
  meta.wavelength = o.wavelength ?? 0.71073;
  meta.unmerged = Boolean(o.unmerged);
  meta.rowsInFile = b.n;
  return ok({ table: b.finish(meta), scale, absent: nAbsent, violations });
}

/** True when h,k,l is the largest (lexicographically) of its equivalents in the hemisphere under the rotations and Friedel's law. */
function isLaueRepresentative(rots: readonly ArrayLike<number>[], h: number, k: number, l: number): boolean {
  for (const R of rots) {
    const a = h * R[0] + k * R[3] + l * R[6], b = h * R[1] + k * R[4] + l * R[7], c = h * R[2] + k * R[5] + l * R[8];
    for (const s of [1, -1]) {
      const x = s * a, y = s * b, z = s * c;
      // only members of the same hemisphere compete (the orbit's maximum may lie outside it)
      const inHemisphere = z > 0 || (z === 0 && (y > 0 || (y === 0 && x > 0)));
      if (inHemisphere && (x > h || (x === h && (y > k || (y === k && z > l))))) return false;
    }
  }
  return true;
}

/**
 * Systematic absence from the operations themselves: some (R, t) with h R = h and h.t not an
 * integer makes F(h) vanish for any structure (International Tables Vol. A, reflection conditions).
 */
export function isAbsentByOps(ops: readonly ModelOp[], h: number, k: number, l: number): boolean {
  for (const op of ops) {
    const R = op.r;
    if (h * R[0] + k * R[3] + l * R[6] !== h || h * R[1] + k * R[4] + l * R[7] !== k || h * R[2] + k * R[5] + l * R[8] !== l) continue;
    if ((h * op.t[0] + k * op.t[1] + l * op.t[2]) % MODEL_TDEN !== 0) return true;
  }
  return false;
}
