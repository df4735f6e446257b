import type { UnitCell } from '../lattice';
import { DEN, type SymOp } from '../symmetry';

/** Translations of symmetry operations are integers over this denominator (the symmetry layer's DEN = 24). */
export const MODEL_TDEN = DEN;

/** One symmetry operation: x' = R x + t / DEN with R row-major (the symmetry layer's SymOp). */
export type ModelOp = SymOp;

/**
 * Atom sites as columns (one entry per site of the asymmetric unit).
 * Displacements: `uiso` in angstrom^2 always holds the isotropic value (U_eq for anisotropic sites);
 * when `hasAniso[j]` is 1, `aniso[6j..6j+5]` holds U11 U22 U33 U12 U13 U23 (angstrom^2, the CIF
 * convention on the basis a* b* c* normalised), and the structure factor uses it instead of `uiso`.
 */
export interface AtomSites {
  readonly n: number;
  readonly label: readonly string[];
  /** Element symbol with standard capitalisation (form-factor key). */
  readonly element: readonly string[];
  /** Formal charge from the type symbol (0 when neutral or not given). */
  readonly charge: Int8Array;
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly z: Float64Array;
  /** Chemical occupancy (1 for a fully occupied site, also on a special position). */
  readonly occupancy: Float64Array;
  readonly uiso: Float64Array;
  readonly hasAniso: Uint8Array;
  readonly aniso: Float64Array;
}

/** A trial structure: cell, every symmetry operation (identity first, centring included), atoms. */
export interface CrystalModel {
  readonly source: string;
  readonly cell: UnitCell;
  readonly ops: readonly ModelOp[];
  /** Space-group name as the file gave it (H-M or Hall), if any; for messages only. */
  readonly spaceGroupName?: string;
  readonly atoms: AtomSites;
  readonly warnings: string[];
}

export interface AtomInput {
  label: string;
  element: string;
  charge?: number;
  x: number;
  y: number;
  z: number;
  occupancy?: number;
  /** Isotropic U in angstrom^2 (default 0). */
  uiso?: number;
  /** U11 U22 U33 U12 U13 U23 in angstrom^2. */
  aniso?: readonly number[];
}

/** Build the columnar atom store from plain objects (tests, the CIF reader). */
export function atomSitesFromList(list: readonly AtomInput[]): AtomSites {
  const n = list.length;
  const sites = {
    n,
    label: list.map((a) => a.label),
    element: list.map((a) => a.element),
    charge: new Int8Array(n),
    x: new Float64Array(n),
    y: new Float64Array(n),
    z: new Float64Array(n),
    occupancy: new Float64Array(n),
    uiso: new Float64Array(n),
    hasAniso: new Uint8Array(n),
    aniso: new Float64Array(6 * n),
  };
  list.forEach((a, j) => {
    sites.charge[j] = a.charge ?? 0;
    sites.x[j] = a.x;
    sites.y[j] = a.y;
    sites.z[j] = a.z;
    sites.occupancy[j] = a.occupancy ?? 1;
    sites.uiso[j] = a.uiso ?? 0;
    if (a.aniso) {
      sites.hasAniso[j] = 1;
      for (let m = 0; m < 6; m++) sites.aniso[6 * j + m] = a.aniso[m];
    }
  });
  return sites;
}
