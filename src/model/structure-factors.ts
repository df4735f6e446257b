import { MODEL_TDEN, type CrystalModel } from './crystal-model';
import { findFormFactor, findIonFormFactor, type FormFactorCoefficients } from './form-factors';
import { siteSymmetryOrder } from './site-symmetry';
import type { UnitCell } from '../lattice';
import { COS_TABLE, SIN_TABLE, TURN_TABLE_SIZE, TURN_TABLE_STEP } from './trig-turns';

/**
 * Structure factors of a trial model:
 *   F(h) = sum_atoms (occ / m) f(s) sum_ops DW_op exp(2 pi i h.(R x + t))
 * with f from International Tables Vol. C Table 6.1.1.4 (ions: Waasmaier & Kirfel 1995), m the order of the atom's site
 * symmetry (an atom on a special position is generated m times by the operations and must
 * count once), DW = exp(-8 pi^2 U s^2) for isotropic and exp(-2 pi^2 (hR) U* (hR)^T) for
 * anisotropic displacement, U*_ij = U_ij a*_i a*_j. Sign convention exp(+2 pi i h.x).
 * Amplitudes in electrons, no anomalous scattering.
 */

/** The model in the form the kernel reads: flat typed arrays, computed once per model. */
export interface PreparedModel {
  readonly nAtoms: number;
  readonly nOps: number;
  /** Rotations, row-major, 9 per operation. */
  readonly rot: Float64Array;
  /** Translations in fractions of a cell edge, 3 per operation. */
  readonly trans: Float64Array;
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly z: Float64Array;
  /** occupancy / site-symmetry order. */
  readonly weight: Float64Array;
  /** Order of each atom's site symmetry (1 for a general position). */
  readonly siteOrder: Int32Array;
  /** -8 pi^2 U_iso; used when the atom has no anisotropic U. */
  readonly isoExponent: Float64Array;
  readonly hasAniso: Uint8Array;
  /** -2 pi^2 U*_ij as 11 22 33 2*12 2*13 2*23, 6 per atom. */
  readonly anisoExponent: Float64Array;
  /** Index into `types` per atom. */
  readonly typeOf: Int32Array;
  readonly types: readonly FormFactorCoefficients[];
  /** Reciprocal metric G* (row-major 3x3, 1/angstrom^2): (sin(theta)/lambda)^2 = h G* h^T / 4. */
  readonly gstar: Float64Array;
}

/** Flatten a model for the kernel. Throws only on an element missing from the table (the reader checks first). */
export function prepareModel(model: CrystalModel): PreparedModel {
  const at = model.atoms;
  const n = at.n;
  const nOps = model.ops.length;
  const rot = new Float64Array(9 * nOps);
  const trans = new Float64Array(3 * nOps);
  model.ops.forEach((op, o) => {
    for (let m = 0; m < 9; m++) rot[9 * o + m] = op.r[m];
    for (let m = 0; m < 3; m++) trans[3 * o + m] = op.t[m] / MODEL_TDEN;
  });
  const types: FormFactorCoefficients[] = [];
  const typeIndex = new Map<string, number>();
  const typeOf = new Int32Array(n);
  const weight = new Float64Array(n);
  const siteOrder = new Int32Array(n);
  const isoExponent = new Float64Array(n);
  const anisoExponent = new Float64Array(6 * n);
  const twoPi2 = 2 * Math.PI * Math.PI;
  const rc = model.cell.reciprocal;
  const as = [rc.a, rc.b, rc.c];
  for (let j = 0; j < n; j++) {
    const el = at.element[j];
    // the ion's own form factor where a table has it, else the neutral atom's (the reader warns)
    const coefs = findIonFormFactor(el, at.charge[j]) ?? findFormFactor(el);
    if (!coefs) throw new Error(`no form factor for element '${el}'`);
    let t = typeIndex.get(coefs.symbol);
    if (t === undefined) {
      t = types.length;
      types.push(coefs);
      typeIndex.set(coefs.symbol, t);
    }
    typeOf[j] = t;
    siteOrder[j] = siteSymmetryOrder(model, at.x[j], at.y[j], at.z[j]);
    weight[j] = at.occupancy[j] / siteOrder[j];
    isoExponent[j] = -4 * twoPi2 * at.uiso[j];
    const u = at.aniso.subarray(6 * j, 6 * j + 6);
    anisoExponent[6 * j] = -twoPi2 * u[0] * as[0] * as[0];
    anisoExponent[6 * j + 1] = -twoPi2 * u[1] * as[1] * as[1];
    anisoExponent[6 * j + 2] = -twoPi2 * u[2] * as[2] * as[2];
    anisoExponent[6 * j + 3] = -twoPi2 * 2 * u[3] * as[0] * as[1];
    anisoExponent[6 * j + 4] = -twoPi2 * 2 * u[4] * as[0] * as[2];
    anisoExponent[6 * j + 5] = -twoPi2 * 2 * u[5] * as[1] * as[2];
  }
  return {
    nAtoms: n, nOps, rot, trans,
    x: at.x, y: at.y, z: at.z,
    weight, siteOrder, isoExponent, hasAniso: at.hasAniso, anisoExponent, typeOf, types,
    gstar: model.cell.reciprocalMetric,
  };
}

/** Progress and cancellation for long runs (the app runs this in a worker). */
export interface LongJobOptions {
  /** Called now and then with (done, total). */
  onProgress?: (done: number, total: number) => void;
  /** Checked between blocks of reflections; when `aborted` turns true the function stops and returns false. */
  signal?: { readonly aborted: boolean };
}

const BLOCK = 512;

/**
 * Complex structure factors for reflections (h[j], k[j], l[j]) into outRe[j], outIm[j] (electrons).
 * Returns false if cancelled through `options.signal` (outputs then partly filled).
 */
export function computeStructureFactors(
  pm: PreparedModel,
  h: ArrayLike<number>, k: ArrayLike<number>, l: ArrayLike<number>,
  outRe: Float64Array, outIm: Float64Array,
  options: LongJobOptions = {},
): boolean {
  const n = h.length;
  const { nAtoms, nOps, rot, trans, x, y, z, weight, isoExponent, hasAniso, anisoExponent, typeOf, types, gstar } = pm;
  // per-reflection scratch, reused: rotated indices h R and phase shifts h.t (turns) per operation
  const hr = new Float64Array(3 * nOps);
  const shift = new Float64Array(nOps);
  const f = new Float64Array(types.length);
  const N = TURN_TABLE_SIZE, STEP = TURN_TABLE_STEP, CT = COS_TABLE, ST = SIN_TABLE;
  for (let j = 0; j < n; j++) {
    if (j % BLOCK === 0 && j > 0) {
      if (options.signal?.aborted) return false;
      options.onProgress?.(j, n);
    }
    const hh = h[j], kk = k[j], ll = l[j];
    for (let o = 0; o < nOps; o++) {
      const r = 9 * o;
      hr[3 * o] = hh * rot[r] + kk * rot[r + 3] + ll * rot[r + 6];
      hr[3 * o + 1] = hh * rot[r + 1] + kk * rot[r + 4] + ll * rot[r + 7];
      hr[3 * o + 2] = hh * rot[r + 2] + kk * rot[r + 5] + ll * rot[r + 8];
      shift[o] = hh * trans[3 * o] + kk * trans[3 * o + 1] + ll * trans[3 * o + 2];
    }
    const s2 = 0.25 * (hh * hh * gstar[0] + kk * kk * gstar[4] + ll * ll * gstar[8] + 2 * (hh * kk * gstar[1] + hh * ll * gstar[2] + kk * ll * gstar[5]));
    for (let t = 0; t < types.length; t++) {
      const c = types[t];
      f[t] = c.a[0] * Math.exp(-c.b[0] * s2) + c.a[1] * Math.exp(-c.b[1] * s2) + c.a[2] * Math.exp(-c.b[2] * s2) + c.a[3] * Math.exp(-c.b[3] * s2) +
        c.a[4] * Math.exp(-c.b[4] * s2) + c.c;
    }
    let re = 0, im = 0;
    for (let a = 0; a < nAtoms; a++) {
      const xa = x[a], ya = y[a], za = z[a];
      let sr = 0, si = 0;
      const aniso = hasAniso[a] === 1;
      const e = 6 * a;
      for (let o = 0; o < nOps; o++) {
        const h0 = hr[3 * o], h1 = hr[3 * o + 1], h2 = hr[3 * o + 2];
        // cos/sin of the phase in turns (see trig-turns.ts), inlined
        const turns = h0 * xa + h1 * ya + h2 * za + shift[o];
        const u = (turns - Math.floor(turns)) * N;
        const ti = Math.round(u);
        const d = (u - ti) * STEP;
        const d2 = d * d;
        const cd = 1 - d2 * (0.5 - d2 / 24);
        const sd = d * (1 - d2 / 6);
        const ct = CT[ti], st = ST[ti];
        let cr = ct * cd - st * sd;
        let ci = st * cd + ct * sd;
        if (aniso) {
          const dw = Math.exp(
            anisoExponent[e] * h0 * h0 + anisoExponent[e + 1] * h1 * h1 + anisoExponent[e + 2] * h2 * h2 +
            anisoExponent[e + 3] * h0 * h1 + anisoExponent[e + 4] * h0 * h2 + anisoExponent[e + 5] * h1 * h2,
          );
          cr *= dw;
          ci *= dw;
        }
        sr += cr;
        si += ci;
      }
      let w = weight[a] * f[typeOf[a]];
      if (!aniso) w *= Math.exp(isoExponent[a] * s2);
      re += w * sr;
      im += w * si;
    }
    outRe[j] = re;
    outIm[j] = im;
  }
  options.onProgress?.(n, n);
  return true;
}

/** |F|^2 (electrons^2) of the reflections of a table, as a new Float64Array. */
export function calculatedIntensitiesOf(pm: PreparedModel, h: ArrayLike<number>, k: ArrayLike<number>, l: ArrayLike<number>): Float64Array {
  const n = h.length;
  const re = new Float64Array(n), im = new Float64Array(n);
  computeStructureFactors(pm, h, k, l, re, im);
  for (let j = 0; j < n; j++) re[j] = re[j] * re[j] + im[j] * im[j];
  return re;
}
