import { composeInto, identityOp, isIdentityRotation, opKey, rotationKey, rotationType, type SymOp } from './ops';

/** A group larger than this is not a crystallographic space group modulo lattice translations. */
const MAX_ORDER = 192;

/**
 * Close a set of operations under composition (translations taken modulo 1).
 * Returns every operation of the group, identity first, then in order of discovery.
 * Returns undefined when the set generates more than 192 operations (not a space group).
 */
export function closeGroup(generators: readonly SymOp[]): SymOp[] | undefined {
  const ops: SymOp[] = [identityOp()];
  const seen = new Set<number>([opKey(ops[0])]);
  const gens: SymOp[] = [];
  for (const g of generators) {
    const k = opKey(g);
    if (!seen.has(k)) {
      seen.add(k);
      ops.push(g);
      gens.push(g);
    }
  }
  // Every element is a product of generators, so closing under left multiplication by the
  // generators alone reaches the whole (finite) group: |G| x |generators| products.
  // products go into scratch space first; only new operations are allocated
  const scratch: SymOp = { r: new Int32Array(9), t: new Int32Array(3) };
  for (let i = 0; i < ops.length; i++) {
    for (const g of gens) {
      composeInto(g, ops[i], scratch);
      const k = opKey(scratch);
      if (seen.has(k)) continue;
      seen.add(k);
      ops.push({ r: scratch.r.slice(), t: scratch.t.slice() });
      if (ops.length > MAX_ORDER) return undefined;
    }
  }
  return ops;
}

/**
 * Split a closed group into centring vectors (pure translations, zero excluded) and primitive
 * operations (one per rotation part: the first one met, identity first).
 */
export function splitCentring(ops: readonly SymOp[]): { primitive: SymOp[]; centring: Int32Array[] } {
  const centring: Int32Array[] = [];
  const primitive: SymOp[] = [];
  const rotSeen = new Set<number>();
  for (const o of ops) {
    if (isIdentityRotation(o.r) && (o.t[0] | o.t[1] | o.t[2]) !== 0) centring.push(o.t);
    const rk = rotationKey(o.r);
    if (!rotSeen.has(rk)) {
      rotSeen.add(rk);
      primitive.push(o);
    }
  }
  return { primitive, centring };
}

/** The distinct rotation parts (the point group), identity first. */
export function distinctRotations(ops: readonly SymOp[]): Int32Array[] {
  const out: Int32Array[] = [];
  const seen = new Set<number>();
  for (const o of ops) {
    const k = rotationKey(o.r);
    if (!seen.has(k)) {
      seen.add(k);
      out.push(o.r);
    }
  }
  return out;
}

/**
 * Point-group class from the numbers of rotations of each type (International Tables
 * Vol. A, Table 10.1.2.2 lists the element types of the 32 classes). Symbols follow the
 * ITA short form; Laue class and crystal system follow from the class.
 */
interface PointGroupInfo {
  readonly symbol: string;
  readonly laue: string;
  readonly system: CrystalSystem;
}

export type CrystalSystem = 'triclinic' | 'monoclinic' | 'orthorhombic' | 'tetragonal' | 'trigonal' | 'hexagonal' | 'cubic';

// Counts in the order: 1 2 3 4 6 -1 -2(m) -3 -4 -6
const CLASSES: [string, string, CrystalSystem, number[]][] = [
  ['1', '-1', 'triclinic', [1, 0, 0, 0, 0, 0, 0, 0, 0, 0]],
  ['-1', '-1', 'triclinic', [1, 0, 0, 0, 0, 1, 0, 0, 0, 0]],
  ['2', '2/m', 'monoclinic', [1, 1, 0, 0, 0, 0, 0, 0, 0, 0]],
  ['m', '2/m', 'monoclinic', [1, 0, 0, 0, 0, 0, 1, 0, 0, 0]],
  ['2/m', '2/m', 'monoclinic', [1, 1, 0, 0, 0, 1, 1, 0, 0, 0]],
  ['222', 'mmm', 'orthorhombic', [1, 3, 0, 0, 0, 0, 0, 0, 0, 0]],
  ['mm2', 'mmm', 'orthorhombic', [1, 1, 0, 0, 0, 0, 2, 0, 0, 0]],
  ['mmm', 'mmm', 'orthorhombic', [1, 3, 0, 0, 0, 1, 3, 0, 0, 0]],
  ['4', '4/m', 'tetragonal', [1, 1, 0, 2, 0, 0, 0, 0, 0, 0]],
  ['-4', '4/m', 'tetragonal', [1, 1, 0, 0, 0, 0, 0, 0, 2, 0]],
  ['4/m', '4/m', 'tetragonal', [1, 1, 0, 2, 0, 1, 1, 0, 2, 0]],
  ['422', '4/mmm', 'tetragonal', [1, 5, 0, 2, 0, 0, 0, 0, 0, 0]],
  ['4mm', '4/mmm', 'tetragonal', [1, 1, 0, 2, 0, 0, 4, 0, 0, 0]],
  ['-42m', '4/mmm', 'tetragonal', [1, 3, 0, 0, 0, 0, 2, 0, 2, 0]],
  ['4/mmm', '4/mmm', 'tetragonal', [1, 5, 0, 2, 0, 1, 5, 0, 2, 0]],
  ['3', '-3', 'trigonal', [1, 0, 2, 0, 0, 0, 0, 0, 0, 0]],
  ['-3', '-3', 'trigonal', [1, 0, 2, 0, 0, 1, 0, 2, 0, 0]],
  ['32', '-3m', 'trigonal', [1, 3, 2, 0, 0, 0, 0, 0, 0, 0]],
  ['3m', '-3m', 'trigonal', [1, 0, 2, 0, 0, 0, 3, 0, 0, 0]],
  ['-3m', '-3m', 'trigonal', [1, 3, 2, 0, 0, 1, 3, 2, 0, 0]],
  ['6', '6/m', 'hexagonal', [1, 1, 2, 0, 2, 0, 0, 0, 0, 0]],
  ['-6', '6/m', 'hexagonal', [1, 0, 2, 0, 0, 0, 1, 0, 0, 2]],
  ['6/m', '6/m', 'hexagonal', [1, 1, 2, 0, 2, 1, 1, 2, 0, 2]],
  ['622', '6/mmm', 'hexagonal', [1, 7, 2, 0, 2, 0, 0, 0, 0, 0]],
  ['6mm', '6/mmm', 'hexagonal', [1, 1, 2, 0, 2, 0, 6, 0, 0, 0]],
  ['-6m2', '6/mmm', 'hexagonal', [1, 3, 2, 0, 0, 0, 4, 0, 0, 2]],
  ['6/mmm', '6/mmm', 'hexagonal', [1, 7, 2, 0, 2, 1, 7, 2, 0, 2]],
  ['23', 'm-3', 'cubic', [1, 3, 8, 0, 0, 0, 0, 0, 0, 0]],
  ['m-3', 'm-3', 'cubic', [1, 3, 8, 0, 0, 1, 3, 8, 0, 0]],
  ['432', 'm-3m', 'cubic', [1, 9, 8, 6, 0, 0, 0, 0, 0, 0]],
  ['-43m', 'm-3m', 'cubic', [1, 3, 8, 0, 0, 0, 6, 0, 6, 0]],
  ['m-3m', 'm-3m', 'cubic', [1, 9, 8, 6, 0, 1, 9, 8, 6, 0]],
];
const TYPE_INDEX: Record<number, number> = { 1: 0, 2: 1, 3: 2, 4: 3, 6: 4, [-1]: 5, [-2]: 6, [-3]: 7, [-4]: 8, [-6]: 9 };
const CLASS_BY_COUNTS = new Map(CLASSES.map(([symbol, laue, system, counts]) => [counts.join(','), { symbol, laue, system }]));

/** Identify the point-group class of a set of distinct rotation parts. */
export function classifyPointGroup(rotations: readonly ArrayLike<number>[]): PointGroupInfo | undefined {
  const counts = new Array<number>(10).fill(0);
  for (const r of rotations) counts[TYPE_INDEX[rotationType(r)]]++;
  return CLASS_BY_COUNTS.get(counts.join(','));
}

/** The Laue classes, from lowest to highest symmetry. */
export const LAUE_CLASSES: readonly string[] = ['-1', '2/m', 'mmm', '4/m', '4/mmm', '-3', '-3m', '6/m', '6/mmm', 'm-3', 'm-3m'];

/** Point-group classes (ITA short symbols) with their Laue class and crystal system. */
export const POINT_GROUP_CLASSES: readonly { readonly symbol: string; readonly laue: string; readonly system: CrystalSystem }[] =
  CLASSES.map(([symbol, laue, system]) => ({ symbol, laue, system }));

/**
 * Laue classes a Bravais lattice (Pearson symbol such as `mP`, `oC`, `hR`, or a crystal family
 * letter a m o t h c) allows. Trigonal and hexagonal Laue classes share the hexagonal family;
 * `hR` allows only the trigonal ones.
 */
export function laueClassesForLattice(bravais: string): string[] {
  const fam = bravais.trim()[0];
  if (bravais.trim() === 'hR') return ['-3', '-3m'];
  switch (fam) {
    case 'a': return ['-1'];
    case 'm': return ['2/m'];
    case 'o': return ['mmm'];
    case 't': return ['4/m', '4/mmm'];
    case 'h': return ['-3', '-3m', '6/m', '6/mmm'];
    case 'c': return ['m-3', 'm-3m'];
    default: return [];
  }
}
