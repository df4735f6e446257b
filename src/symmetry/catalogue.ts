import { conditionKey, type Condition } from './conditions';
import type { SpaceGroupSetting } from './settings';

/**
 * Whole-table absence testing. The 559 settings share few distinct elementary conditions
 * (zone + coefficients + modulus), so each distinct condition is evaluated once per
 * reflection and the settings are combined through bit masks:
 *
 *   violated(i)  = bit set of the distinct conditions reflection i breaks
 *   absent(i, s) = violated(i) & conditions(s) != 0
 *
 * Every condition's outcome depends only on which zone equations a reflection satisfies and on
 * h, k, l modulo the lcm of the moduli (12), so reflections fall into few absence classes,
 * each evaluated once (classifyReflections). Bit sets are stored reflection-major or
 * class-major: words [i * W, (i + 1) * W).
 */
export interface ConditionCatalogue {
  readonly settings: readonly SpaceGroupSetting[];
  /** The distinct elementary conditions of all settings. */
  readonly conditions: readonly Condition[];
  /** Per setting (same order as `settings`), indices into `conditions`. */
  readonly conditionsOfSetting: readonly Int32Array[];
  /** Per condition, indices into `settings` of the settings that have it. */
  readonly settingsOfCondition: readonly Int32Array[];
  /** 32-bit words per reflection in a condition bit set. */
  readonly conditionWords: number;
  /** 32-bit words per reflection in a setting bit set. */
  readonly settingWords: number;
  /** @internal evaluation plan */
  readonly plan: Plan;
}

interface Plan {
  /** Distinct zone equation rows, 3 entries each. */
  rows: Int32Array;
  nRows: number;
  /** Per condition: mask of rows that must vanish (bit r for row r). */
  condRowMask: Uint32Array;
  coeffs: Int32Array;
  moduli: Int32Array;
  /** Period of every condition's outcome: lcm of all moduli; residues of h, k, l modulo it. */
  period: number;
  /** Class of a reflection in no special zone, by residue cell (-1 = not made yet). */
  generalClass: Int32Array;
  /** Class of a reflection on special zones, by mask * period^3 + residue cell. */
  specialClass: Map<number, number>;
  /** Per class: setting bits (settingWords each) and broken-condition bits (conditionWords each). */
  classSetting: Uint32Array;
  classCond: Uint32Array;
  nClasses: number;
  /** Per condition, the setting bit set of the settings having it (settingWords words). */
  condSettingBits: Uint32Array;
  settingWords: number;
  conditionWords: number;
}

function lcm(a: number, b: number): number {
  let x = a, y = b;
  while (y) [x, y] = [y, x % y];
  return (a / x) * b;
}

/** Factor the conditions of the given settings into distinct elementary conditions. */
export function buildConditionCatalogue(settings: readonly SpaceGroupSetting[]): ConditionCatalogue {
  const index = new Map<string, number>();
  const conditions: Condition[] = [];
  const perSetting: Int32Array[] = [];
  for (const s of settings) {
    const ids: number[] = [];
    for (const c of s.conditions) {
      const k = conditionKey(c);
      let id = index.get(k);
      if (id === undefined) {
        id = conditions.length;
        index.set(k, id);
        conditions.push(c);
      }
      ids.push(id);
    }
    perSetting.push(Int32Array.from(ids));
  }
  const nc = conditions.length;
  const settingsOf: number[][] = conditions.map(() => []);
  perSetting.forEach((ids, s) => ids.forEach((c) => settingsOf[c].push(s)));
  const conditionWords = Math.max(1, Math.ceil(nc / 32));
  const settingWords = Math.max(1, Math.ceil(settings.length / 32));

  // distinct zone rows
  const rowIndex = new Map<string, number>();
  const rowList: number[] = [];
  const condRowMask = new Uint32Array(nc);
  const coeffs = new Int32Array(nc * 3);
  const moduli = new Int32Array(nc);
  let period = 1;
  conditions.forEach((c, j) => {
    for (const e of c.zone) {
      const k = e.join(',');
      let r = rowIndex.get(k);
      if (r === undefined) {
        r = rowList.length / 3;
        if (r >= 31) throw new Error('buildConditionCatalogue: more than 31 distinct zone rows');
        rowIndex.set(k, r);
        rowList.push(e[0], e[1], e[2]);
      }
      condRowMask[j] |= 1 << r;
    }
    coeffs.set(c.coeffs, 3 * j);
    moduli[j] = c.modulus;
    period = lcm(period, c.modulus);
  });
  const condSettingBits = new Uint32Array(nc * settingWords);
  settingsOf.forEach((list, j) => list.forEach((s) => (condSettingBits[j * settingWords + (s >>> 5)] |= 1 << (s & 31))));

  const plan: Plan = {
    rows: Int32Array.from(rowList),
    nRows: rowList.length / 3,
    condRowMask,
    coeffs,
    moduli,
    period,
    generalClass: new Int32Array(period * period * period).fill(-1),
    specialClass: new Map(),
    classSetting: new Uint32Array(256 * settingWords),
    classCond: new Uint32Array(256 * conditionWords),
    nClasses: 0,
    condSettingBits,
    settingWords,
    conditionWords,
  };
  return {
    settings,
    conditions,
    conditionsOfSetting: perSetting,
    settingsOfCondition: settingsOf.map((l) => Int32Array.from(l)),
    conditionWords,
    settingWords,
    plan,
  };
}

/** Miller indices as columns (Int16Array in a ReflectionTable); |index| must stay below OFFSET. */
type IndexColumn = ArrayLike<number>;
const OFFSET = 1 << 20;

/**
 * A new class for reflections with zone mask `mask` and residues like (h, k, l): every
 * condition's outcome depends only on the zones the reflection lies in and c.h modulo m,
 * m dividing the period, so one representative decides the whole class.
 */
function makeClass(p: Plan, mask: number, h: number, k: number, l: number): number {
  const id = p.nClasses++;
  const SW = p.settingWords, CW = p.conditionWords;
  if ((id + 1) * SW > p.classSetting.length) {
    const grow = (a: Uint32Array) => { const b = new Uint32Array(a.length * 2); b.set(a); return b; };
    p.classSetting = grow(p.classSetting);
    p.classCond = grow(p.classCond);
  }
  for (let j = 0; j < p.condRowMask.length; j++) {
    if ((p.condRowMask[j] & ~mask) !== 0) continue;
    if ((p.coeffs[3 * j] * h + p.coeffs[3 * j + 1] * k + p.coeffs[3 * j + 2] * l) % p.moduli[j] === 0) continue;
    p.classCond[id * CW + (j >>> 5)] |= 1 << (j & 31);
    for (let w = 0; w < SW; w++) p.classSetting[id * SW + w] |= p.condSettingBits[j * SW + w];
  }
  return id;
}

/**
 * Reflections sorted into absence classes: reflections of one class break the same
 * conditions and are absent in the same settings. This is the whole-table absence test in
 * one pass: per reflection, the zones it lies on (a few integer dot products) and its residues
 * select the class; nothing loops over settings or operations per reflection.
 *
 * Reflection i is absent in setting s exactly when bit s of
 * settingBits[classOf[i] * settingWords ...] is set, and breaks condition j exactly when bit j of
 * conditionBits[classOf[i] * conditionWords ...] is set. The catalogue keeps its classes between
 * calls; the returned tables are views valid until the next call.
 */
export interface AbsenceClasses {
  readonly n: number;
  readonly classOf: Uint32Array;
  readonly nClasses: number;
  readonly settingBits: Uint32Array;
  readonly conditionBits: Uint32Array;
}

export function classifyReflections(
  cat: ConditionCatalogue,
  h: IndexColumn,
  k: IndexColumn,
  l: IndexColumn,
  n: number,
  out?: Uint32Array,
): AbsenceClasses {
  const p = cat.plan;
  const classOf = out && out.length >= n ? out : new Uint32Array(n);
  const P = p.period;
  const P3 = P * P * P;
  const rows = p.rows;
  const nRows = p.nRows;
  const general = p.generalClass;
  // a multiple of the period that makes every index positive: % on negative operands gives -0,
  // which pushes the loop off small-integer arithmetic
  const shift = P * Math.ceil(OFFSET / P);
  for (let i = 0; i < n; i++) {
    const hi = h[i], ki = k[i], li = l[i];
    let mask = 0;
    for (let r = 0, o = 0; r < nRows; r++, o += 3)
      if (Math.imul(rows[o], hi) + Math.imul(rows[o + 1], ki) + Math.imul(rows[o + 2], li) === 0) mask |= 1 << r;
    const cell = (((hi + shift) % P) * P + ((ki + shift) % P)) * P + ((li + shift) % P);
    let c: number;
    if (mask === 0) {
      c = general[cell];
      if (c < 0) c = general[cell] = makeClass(p, 0, hi, ki, li);
    } else {
      const key = mask * P3 + cell;
      const hit = p.specialClass.get(key);
      if (hit === undefined) {
        c = makeClass(p, mask, hi, ki, li);
        p.specialClass.set(key, c);
      } else c = hit;
    }
    classOf[i] = c;
  }
  return {
    n,
    classOf,
    nClasses: p.nClasses,
    settingBits: p.classSetting.subarray(0, p.nClasses * p.settingWords),
    conditionBits: p.classCond.subarray(0, p.nClasses * p.conditionWords),
  };
}

function expand(classOf: Uint32Array, n: number, table: Uint32Array, W: number, out?: Uint32Array): Uint32Array {
  const res = out && out.length >= n * W ? out : new Uint32Array(n * W);
  for (let i = 0; i < n; i++) {
    const src = classOf[i] * W;
    const dst = i * W;
    for (let w = 0; w < W; w++) res[dst + w] = table[src + w];
  }
  return res;
}

/**
 * Which distinct conditions each reflection breaks: bit j of words [i*W, (i+1)*W), W =
 * catalogue.conditionWords, is set when reflection i lies in condition j's zone and breaks it.
 * `out` (length >= n * W) is reused when given.
 */
export function evaluateConditions(
  cat: ConditionCatalogue,
  h: IndexColumn,
  k: IndexColumn,
  l: IndexColumn,
  n: number,
  out?: Uint32Array,
): Uint32Array {
  const c = classifyReflections(cat, h, k, l, n);
  return expand(c.classOf, n, c.conditionBits, cat.conditionWords, out);
}

/**
 * Absence of every reflection in every setting as a bit matrix: bit s of words
 * [i*W, (i+1)*W), W = catalogue.settingWords, is set when reflection i is systematically
 * absent in setting s. `out` (length >= n * W) is reused when given. classifyReflections gives
 * the same information without materialising n * W words.
 */
export function absenceBits(
  cat: ConditionCatalogue,
  h: IndexColumn,
  k: IndexColumn,
  l: IndexColumn,
  n: number,
  out?: Uint32Array,
): Uint32Array {
  const c = classifyReflections(cat, h, k, l, n);
  return expand(c.classOf, n, c.settingBits, cat.settingWords, out);
}

/** Read one bit of a reflection-major bit set with W words per reflection. */
export function testBit(bits: Uint32Array, words: number, i: number, j: number): boolean {
  return (bits[i * words + (j >>> 5)] & (1 << (j & 31))) !== 0;
}

/** Absence flags of one setting as a column (1 = absent). `out` (length >= n) is reused when given. */
export function absentColumn(cat: ConditionCatalogue, classes: AbsenceClasses, settingIndex: number, out?: Uint8Array): Uint8Array {
  const W = cat.settingWords;
  const n = classes.n;
  const res = out && out.length >= n ? out : new Uint8Array(n);
  const word = settingIndex >>> 5;
  const bit = 1 << (settingIndex & 31);
  const flag = new Uint8Array(classes.nClasses);
  for (let c = 0; c < classes.nClasses; c++) flag[c] = (classes.settingBits[c * W + word] & bit) !== 0 ? 1 : 0;
  for (let i = 0; i < n; i++) res[i] = flag[classes.classOf[i]];
  return res;
}

/** Number of reflections per class (length nClasses). */
export function classCounts(classes: AbsenceClasses): Int32Array {
  const counts = new Int32Array(classes.nClasses);
  for (let i = 0; i < classes.n; i++) counts[classes.classOf[i]]++;
  return counts;
}

/** Number of absent reflections per setting (length settings.length). */
export function countAbsentPerSetting(cat: ConditionCatalogue, classes: AbsenceClasses): Int32Array {
  return sumBitsByClass(classCounts(classes), classes.settingBits, cat.settingWords, cat.settings.length);
}

/** Number of reflections breaking each distinct condition (length conditions.length). */
export function countBrokenPerCondition(cat: ConditionCatalogue, classes: AbsenceClasses): Int32Array {
  return sumBitsByClass(classCounts(classes), classes.conditionBits, cat.conditionWords, cat.conditions.length);
}

function sumBitsByClass(perClass: Int32Array, table: Uint32Array, W: number, size: number): Int32Array {
  const out = new Int32Array(size);
  for (let c = 0; c < perClass.length; c++) {
    if (perClass[c] === 0) continue;
    for (let w = 0; w < W; w++) {
      let x = table[c * W + w];
      while (x !== 0) {
        const b = 31 - Math.clz32(x & -x);
        out[(w << 5) + b] += perClass[c];
        x &= x - 1;
      }
    }
  }
  return out;
}
