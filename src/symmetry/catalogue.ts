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
 * Most reflections lie in no special zone; for them only the integral (centring) conditions
 * apply, whose outcome depends on h, k, l modulo a small number, so their bits come from a
 * precomputed table. Bit sets are stored reflection-major: words [i * W, (i + 1) * W).
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
  /** Modulus of the residue table for reflections in no special zone, and its entries. */
  resMod: number;
  resCond: Uint32Array;
  resSetting: Uint32Array;
  /** Per condition, the setting bit set of the settings having it (settingWords words). */
  condSettingBits: Uint32Array;
  /** Per condition, its own bit in a condition bit set (conditionWords words). */
  condOwnBits: Uint32Array;
  /** Cache: row mask -> conditions whose zone contains every reflection with that mask. */
  byMask: Map<number, Int32Array>;
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
  conditions.forEach((c, j) => {
    for (const e of c.zone) {
      const k = e.join(',');
      let r = rowIndex.get(k);
      if (r === undefined) {
        r = rowList.length / 3;
        if (r >= 32) throw new Error('buildConditionCatalogue: more than 32 distinct zone rows');
        rowIndex.set(k, r);
        rowList.push(e[0], e[1], e[2]);
      }
      condRowMask[j] |= 1 << r;
    }
    coeffs.set(c.coeffs, 3 * j);
    moduli[j] = c.modulus;
  });
  const condSettingBits = new Uint32Array(nc * settingWords);
  settingsOf.forEach((list, j) => list.forEach((s) => (condSettingBits[j * settingWords + (s >>> 5)] |= 1 << (s & 31))));

  const condOwnBits = new Uint32Array(nc * conditionWords);
  for (let j = 0; j < nc; j++) condOwnBits[j * conditionWords + (j >>> 5)] = 1 << (j & 31);

  // residue table for reflections in no special zone: only integral conditions apply
  let resMod = 1;
  for (let j = 0; j < nc; j++) if (condRowMask[j] === 0) resMod = lcm(resMod, moduli[j]);
  const useTable = resMod <= 24;
  if (!useTable) resMod = 0;
  const size = useTable ? resMod * resMod * resMod : 0;
  const resCond = new Uint32Array(size * conditionWords);
  const resSetting = new Uint32Array(size * settingWords);
  const integral: number[] = [];
  for (let j = 0; j < nc; j++) if (condRowMask[j] === 0) integral.push(j);
  for (let a = 0; a < resMod; a++)
    for (let b = 0; b < resMod; b++)
      for (let c = 0; c < resMod; c++) {
        const cell = (a * resMod + b) * resMod + c;
        for (const j of integral) {
          if ((coeffs[3 * j] * a + coeffs[3 * j + 1] * b + coeffs[3 * j + 2] * c) % moduli[j] === 0) continue;
          resCond[cell * conditionWords + (j >>> 5)] |= 1 << (j & 31);
          for (let w = 0; w < settingWords; w++) resSetting[cell * settingWords + w] |= condSettingBits[j * settingWords + w];
        }
      }

  const plan: Plan = {
    rows: Int32Array.from(rowList),
    nRows: rowList.length / 3,
    condRowMask,
    coeffs,
    moduli,
    resMod,
    resCond,
    resSetting,
    condSettingBits,
    condOwnBits,
    byMask: new Map(),
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

function conditionsForMask(plan: Plan, mask: number): Int32Array {
  let list = plan.byMask.get(mask);
  if (!list) {
    const ids: number[] = [];
    for (let j = 0; j < plan.condRowMask.length; j++) if ((plan.condRowMask[j] & ~mask) === 0) ids.push(j);
    list = Int32Array.from(ids);
    plan.byMask.set(mask, list);
  }
  return list;
}

type IndexColumn = ArrayLike<number>;

function rowMaskOf(plan: Plan, h: number, k: number, l: number): number {
  const rows = plan.rows;
  let mask = 0;
  for (let r = 0, o = 0; r < plan.nRows; r++, o += 3) if (rows[o] * h + rows[o + 1] * k + rows[o + 2] * l === 0) mask |= 1 << r;
  return mask;
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
  const p = cat.plan;
  return scan(p, h, k, l, n, cat.conditionWords, p.resCond, p.condOwnBits, out);
}

/**
 * Absence of every reflection in every setting of the catalogue: bit s of words
 * [i*W, (i+1)*W), W = catalogue.settingWords, is set when reflection i is systematically
 * absent in setting s. One pass over the reflections; no loop over settings or operations
 * per reflection. `out` (length >= n * W) is reused when given.
 */
export function absenceBits(
  cat: ConditionCatalogue,
  h: IndexColumn,
  k: IndexColumn,
  l: IndexColumn,
  n: number,
  out?: Uint32Array,
): Uint32Array {
  const p = cat.plan;
  return scan(p, h, k, l, n, cat.settingWords, p.resSetting, p.condSettingBits, out);
}

/**
 * The one loop behind both: per reflection, either copy the residue-table entry (no special
 * zone) or OR in `perCondition` words for every broken condition of the zones it lies in.
 */
function scan(
  p: Plan,
  h: IndexColumn,
  k: IndexColumn,
  l: IndexColumn,
  n: number,
  W: number,
  residueTable: Uint32Array,
  perCondition: Uint32Array,
  out?: Uint32Array,
): Uint32Array {
  const res = out && out.length >= n * W ? out : new Uint32Array(n * W);
  res.fill(0, 0, n * W);
  const m = p.resMod;
  for (let i = 0; i < n; i++) {
    const hi = h[i], ki = k[i], li = l[i];
    const mask = rowMaskOf(p, hi, ki, li);
    const base = i * W;
    if (mask === 0 && m > 0) {
      const src = (((((hi % m) + m) % m) * m + (((ki % m) + m) % m)) * m + (((li % m) + m) % m)) * W;
      for (let w = 0; w < W; w++) res[base + w] = residueTable[src + w];
      continue;
    }
    const list = conditionsForMask(p, mask);
    for (let q = 0; q < list.length; q++) {
      const j = list[q];
      if ((p.coeffs[3 * j] * hi + p.coeffs[3 * j + 1] * ki + p.coeffs[3 * j + 2] * li) % p.moduli[j] === 0) continue;
      const src = j * W;
      for (let w = 0; w < W; w++) res[base + w] |= perCondition[src + w];
    }
  }
  return res;
}

/** Read one bit of a reflection-major bit set with W words per reflection. */
export function testBit(bits: Uint32Array, words: number, i: number, j: number): boolean {
  return (bits[i * words + (j >>> 5)] & (1 << (j & 31))) !== 0;
}

/**
 * Absence flags of one setting as a column (1 = absent), from `absenceBits` output.
 * `out` (length >= n) is reused when given.
 */
export function absentColumn(cat: ConditionCatalogue, bits: Uint32Array, n: number, settingIndex: number, out?: Uint8Array): Uint8Array {
  const W = cat.settingWords;
  const res = out && out.length >= n ? out : new Uint8Array(n);
  const word = settingIndex >>> 5;
  const bit = 1 << (settingIndex & 31);
  for (let i = 0; i < n; i++) res[i] = (bits[i * W + word] & bit) !== 0 ? 1 : 0;
  return res;
}

/**
 * Number of absent reflections per setting (length settings.length), from `absenceBits` output.
 */
export function countAbsentPerSetting(cat: ConditionCatalogue, bits: Uint32Array, n: number): Int32Array {
  const W = cat.settingWords;
  const counts = new Int32Array(cat.settings.length);
  for (let i = 0; i < n; i++) {
    const base = i * W;
    for (let w = 0; w < W; w++) {
      let x = bits[base + w];
      while (x !== 0) {
        const b = 31 - Math.clz32(x & -x);
        counts[(w << 5) + b]++;
        x &= x - 1;
      }
    }
  }
  return counts;
}
