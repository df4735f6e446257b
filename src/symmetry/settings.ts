import { InputError } from '../core';
import { parseHall } from './hall';
import { closeGroup, splitCentring, distinctRotations, classifyPointGroup, type CrystalSystem } from './group';
import { deriveConditions, type Condition } from './conditions';
import { det3, opKey, rotationKey, makeOp, type SymOp } from './ops';
import { SETTINGS_DATA } from './settings-data';

/**
 * One space-group setting of International Tables Vol. A, Table 4.3.2.1, built from its Hall
 * symbol. Everything except number, symbols and qualifier is derived from the operations.
 */
export interface SpaceGroupSetting {
  /** ITA space-group number 1..230. */
  readonly number: number;
  /** Extended Hermann-Mauguin symbol of the setting, e.g. `P 1 21/c 1`, `F d -3 m:2`, `R -3 c:H`. */
  readonly hm: string;
  readonly hall: string;
  /** Origin choice / axes extension: '', '1', '2', 'H', 'R'. */
  readonly ext: string;
  /** Unique axis and cell choice (`b`, `c1`, ...) or axis permutation (`ba-c`), '' when none. */
  readonly qualifier: string;
  /** Position in allSettings(). */
  readonly index: number;
  readonly crystalSystem: CrystalSystem;
  /** P A B C I F R (R also for rhombohedral axes). */
  readonly lattice: string;
  /** Point-group class, ITA short symbol (`2/m`, `-42m`, `m-3m`). */
  readonly pointGroup: string;
  /** Laue class (`-1`, `2/m`, `mmm`, `4/m`, `4/mmm`, `-3`, `-3m`, `6/m`, `6/mmm`, `m-3`, `m-3m`). */
  readonly laue: string;
  readonly centrosymmetric: boolean;
  /** No improper operations (the only groups a chiral crystal can have). */
  readonly sohncke: boolean;
  /** H-M symbol of the enantiomorphic partner setting, for the 11 enantiomorphic pairs. */
  readonly enantiomorph?: string;
  /** Number of operations including centring translations. */
  readonly order: number;
  /** Every operation of the general position including centring, identity first. */
  readonly ops: readonly SymOp[];
  /** One operation per rotation part (coset representatives of the centring), identity first. */
  readonly primitiveOps: readonly SymOp[];
  /** Centring translations, numerators over DEN, zero vector excluded. */
  readonly centringVectors: readonly Int32Array[];
  /** Distinct rotation parts (the point group), identity first. */
  readonly rotations: readonly Int32Array[];
  /** Distinct rotation parts of the Laue group (point group plus inversion). */
  readonly laueRotations: readonly Int32Array[];
  /** Reflection conditions derived from the operations (computed on first use). */
  readonly conditions: readonly Condition[];
}

/** What a setting derives from its operations, built on first use. */
interface Derived {
  readonly ops: readonly SymOp[];
  readonly primitiveOps: readonly SymOp[];
  readonly centringVectors: readonly Int32Array[];
  readonly rotations: readonly Int32Array[];
  readonly pointGroup: string;
  readonly laue: string;
  readonly crystalSystem: CrystalSystem;
  readonly centrosymmetric: boolean;
  readonly sohncke: boolean;
}

function derive(hm: string, hall: string): Derived {
  const gens = parseHall(hall);
  if (!gens.ok) throw new Error(`settings table: ${gens.error.message}`);
  const g = gens.value;
  const generators = [...g.centring.map((c) => makeOp([1, 0, 0, 0, 1, 0, 0, 0, 1], c)), ...g.generators];
  const ops = closeGroup(generators);
  if (!ops) throw new Error(`settings table: Hall symbol '${hall}' does not close to a space group`);
  const { primitive, centring } = splitCentring(ops);
  const rotations = distinctRotations(ops);
  const pg = classifyPointGroup(rotations);
  if (!pg) throw new Error(`setting ${hm}: operations do not form a crystallographic point group`);
  const isInversion = (r: Int32Array) => r[0] === -1 && r[4] === -1 && r[8] === -1 && r[1] === 0 && r[2] === 0 && r[3] === 0 && r[5] === 0 && r[6] === 0 && r[7] === 0;
  return {
    ops,
    primitiveOps: primitive,
    centringVectors: centring,
    rotations,
    pointGroup: pg.symbol,
    laue: pg.laue,
    crystalSystem: pg.system,
    centrosymmetric: rotations.some(isInversion),
    sohncke: rotations.every((r) => det3(r) === 1),
  };
}

/** A table setting: symbols at once, operations and everything derived from them on first use. */
class Setting implements SpaceGroupSetting {
  private _d?: Derived;
  private _laueRotations?: Int32Array[];
  private _conditions?: Condition[];
  readonly lattice: string;
  constructor(
    readonly number: number,
    readonly hm: string,
    readonly hall: string,
    readonly ext: string,
    readonly qualifier: string,
    readonly index: number,
  ) {
    this.lattice = hm[0];
  }
  private get d(): Derived {
    return (this._d ??= derive(this.hm, this.hall));
  }
  get ops() { return this.d.ops; }
  get primitiveOps() { return this.d.primitiveOps; }
  get centringVectors() { return this.d.centringVectors; }
  get rotations() { return this.d.rotations; }
  get pointGroup() { return this.d.pointGroup; }
  get laue() { return this.d.laue; }
  get crystalSystem() { return this.d.crystalSystem; }
  get centrosymmetric() { return this.d.centrosymmetric; }
  get sohncke() { return this.d.sohncke; }
  get order() { return this.d.ops.length; }
  get laueRotations(): readonly Int32Array[] {
    if (!this._laueRotations) {
      const all = [...this.rotations];
      const seen = new Set(all.map((r) => rotationKey(r)));
      for (const r of this.rotations) {
        const n = r.map((v) => -v) as Int32Array;
        const k = rotationKey(n);
        if (!seen.has(k)) {
          seen.add(k);
          all.push(n);
        }
      }
      this._laueRotations = all;
    }
    return this._laueRotations;
  }
  get enantiomorph(): string | undefined {
    return enantiomorphOf(this);
  }
  get conditions(): readonly Condition[] {
    return (this._conditions ??= deriveConditions(this.ops));
  }
  toString(): string {
    return `${this.hm} (No. ${this.number})`;
  }
  toJSON(): object {
    return { number: this.number, hm: this.hm, hall: this.hall };
  }
}

let SETTINGS: Setting[] | undefined;

/**
 * Every setting of the table (559, in the order of International Tables Vol. A,
 * Table 4.3.2.1 as tabulated by gemmi). Symbols are there at once; each setting builds its
 * group from its Hall symbol when its operations (or anything derived from them) are first read.
 */
export function allSettings(): readonly SpaceGroupSetting[] {
  SETTINGS ??= SETTINGS_DATA.map(([number, hm, hall, ext, qualifier], index) => new Setting(number, hm, hall, ext, qualifier, index));
  return SETTINGS;
}

/** Order-independent exact key of a set of operations. */
export function opSetKey(ops: readonly SymOp[]): string {
  return ops.map(opKey).sort((a, b) => a - b).join(',');
}

let BY_OPSET: Map<string, Setting> | undefined;

function opSetIndex(): Map<string, Setting> {
  if (!BY_OPSET) {
    BY_OPSET = new Map();
    for (const s of allSettings() as Setting[]) {
      const k = opSetKey(s.ops);
      if (!BY_OPSET.has(k)) BY_OPSET.set(k, s);
    }
  }
  return BY_OPSET;
}

/**
 * The setting whose operation set equals the group generated by `ops` (for example the symop
 * loop of a model CIF). Undefined when the operations match no table setting exactly
 * (another origin or basis, or not a group).
 */
export function settingFromOps(ops: readonly SymOp[]): SpaceGroupSetting | undefined {
  const closed = closeGroup(ops);
  if (!closed) return undefined;
  return opSetIndex().get(opSetKey(closed));
}

/**
 * The mirror image of a group (x -> -x) has operations (R, -t). When that set is another
 * type's setting, the two are an enantiomorphic pair (International Tables Vol. A, 8.2.2).
 */
function enantiomorphOf(s: SpaceGroupSetting): string | undefined {
  if (!s.sohncke) return undefined;
  const mirrored = s.ops.map((o) => makeOp(o.r, [-o.t[0], -o.t[1], -o.t[2]]));
  const other = opSetIndex().get(opSetKey(mirrored));
  return other && other.number !== s.number ? other.hm : undefined;
}

// ---------------------------------------------------------------------------------------------
// Name lookup

let NAMES: { exact: Map<string, Setting>; folded: Map<string, Setting | null>; hallSqueezed: Map<string, Setting | null> } | undefined;

/** Hall symbols keep their spaces (`P 3 2` and `P 32` are different groups); only runs collapse. */
function hallKey(s: string): string {
  return 'hall:' + s.trim().replace(/\s+/g, ' ');
}

function squeeze(s: string): string {
  return s.replace(/[\s_]+/g, '');
}

/** ITA short symbol: monoclinic full symbols `P 1 21/c 1` lose their 1s (`P21/c`). */
export function shortSymbol(hm: string): string {
  const [base, ext] = hm.split(':');
  const parts = base.trim().split(/\s+/);
  if (parts.length === 4 && parts[1] === '1' && parts[3] === '1') parts.splice(3, 1), parts.splice(1, 1);
  const s = parts.join('');
  return ext ? `${s}:${ext}` : s;
}

/**
 * Since the 2002 edition, International Tables write the double glide plane e in five symbols
 * (Vol. A, 1.2.3 / Table 4.3.2.1); the table's standard settings carry the older letters.
 */
const E_GLIDE_SYMBOLS: Record<string, string> = {
  'A b m 2': 'A e m 2',
  'A b a 2': 'A e a 2',
  'C m c a': 'C m c e',
  'C m m a': 'C m m e',
  'C c c a': 'C c c e',
};

function nameIndex() {
  if (NAMES) return NAMES;
  const exact = new Map<string, Setting>();
  const folded = new Map<string, Setting | null>();
  const add = (key: string, s: Setting) => {
    if (!exact.has(key)) exact.set(key, s);
    const f = key.toLowerCase();
    const prev = folded.get(f);
    if (prev === undefined) folded.set(f, s);
    else if (prev !== s && prev !== null && prev.hm !== s.hm) folded.set(f, null);
  };
  const settings = allSettings() as Setting[];
  // most specific first: full symbols with extension, Hall symbols, then symbols without extension
  for (const s of settings) {
    add(squeeze(s.hm), s);
    add(squeeze(shortSymbol(s.hm)), s);
  }
  const hallSqueezed = new Map<string, Setting | null>();
  for (const s of settings) {
    add(hallKey(s.hall), s);
    // without spaces only where that stays unambiguous
    const k = squeeze(s.hall).toLowerCase();
    const prev = hallSqueezed.get(k);
    hallSqueezed.set(k, prev === undefined || opSetKey(prev?.ops ?? []) === opSetKey(s.ops) ? (prev ?? s) : null);
  }
  for (const s of settings) {
    const base = s.hm.split(':')[0];
    add(squeeze(base), s);
    add(squeeze(shortSymbol(base)), s);
    const e = E_GLIDE_SYMBOLS[base];
    if (e && !s.qualifier) {
      add(squeeze(e) + (s.ext ? ':' + s.ext : ''), s);
      add(squeeze(e), s);
    }
    if (s.ext === 'H') {
      add(squeeze(base.replace(/^R/, 'H')), s);
      add(squeeze(shortSymbol(base).replace(/^R/, 'H')), s);
    }
  }
  NAMES = { exact, folded, hallSqueezed };
  return NAMES;
}

/**
 * Find a setting by ITA number (the first setting of that number in the table: unique axis b,
 * origin choice 1, hexagonal axes), Hall symbol, or H-M symbol with or without spaces, short or
 * full, with `_` before screw subscripts or not: `14`, `P21/c`, `P 1 21/c 1`, `P2_1/c`,
 * `-P 2ybc`, `R-3:H`, `Fd-3m:1`. Full orthorhombic symbols such as `P 21/b 21/c 21/a` are
 * accepted as well. Undefined when nothing matches.
 */
export function findSetting(nameOrNumber: string | number): SpaceGroupSetting | undefined {
  const settings = allSettings();
  if (typeof nameOrNumber === 'number' || /^\s*\d+\s*$/.test(nameOrNumber)) {
    const n = Number(nameOrNumber);
    return settings.find((s) => s.number === n);
  }
  const text = nameOrNumber.trim();
  if (!text) return undefined;
  const { exact, folded, hallSqueezed } = nameIndex();
  const tryKey = (key: string): Setting | undefined => exact.get(key) ?? folded.get(key.toLowerCase()) ?? undefined;
  const sq = squeeze(text);
  // Hall symbols: an explicit "Hall:" prefix, or a leading '-', or a plain match
  const hallText = text.replace(/^hall\s*:\s*/i, '');
  const hallMatch = () => tryKey(hallKey(hallText)) ?? hallSqueezed.get(squeeze(hallText).toLowerCase()) ?? undefined;
  if (hallText !== text || text.startsWith('-')) {
    const h = hallMatch();
    if (h) return h;
  }
  const direct = tryKey(sq);
  if (direct) return direct;
  const hall = hallMatch();
  if (hall) return hall;
  // full symbols: drop rotation parts written before a slash (21/b -> b) in the axis positions
  const [base, ext] = text.split(':');
  const parts = base.trim().split(/\s+/);
  if (parts.length >= 3) {
    const reduced = [parts[0], ...parts.slice(1).map((p, i) => (i === 0 && parts.length < 4 ? p : p.replace(/^[1-6]+\/(?=[a-z])/, '')))];
    const key = squeeze(reduced.join(' ')) + (ext ? ':' + ext : '');
    const r = tryKey(key);
    if (r) return r;
  }
  return undefined;
}

/** Like findSetting but throws an InputError that says what was given and what is accepted. */
export function getSetting(nameOrNumber: string | number): SpaceGroupSetting {
  const s = findSetting(nameOrNumber);
  if (s) return s;
  if (typeof nameOrNumber === 'number' || /^\s*\d+\s*$/.test(String(nameOrNumber)))
    throw new InputError(`no space group number ${String(nameOrNumber).trim()}`, {}, 'Space-group numbers run from 1 to 230.');
  throw new InputError(
    `unknown space-group symbol '${nameOrNumber}'`,
    {},
    "Give an ITA number (14), a Hermann-Mauguin symbol (P21/c, 'P 1 21/c 1', P2_1/c, R-3:H, Fd-3m:2) or a Hall symbol ('-P 2ybc'); 'lacuna groups' lists them all.",
  );
}
