import type { CellParams, ReflectionTable } from '../core';
import { makeCell } from '../lattice';

/**
 * What a reflection file holds, as `lacuna inspect` reports it. Pure: computed
 * from the table and its meta, no I/O. Unique h,k,l are counted as given (no
 * symmetry merging); multiplicity is rows per unique h,k,l.
 */
export interface ReflectionSummary {
  source: string;
  block?: string;
  rowsInFile: number;
  reflections: number;
  rejected: number;
  rejectedReasons: Record<string, number>;
  rejectedExamples: { line: number; reason: string }[];
  unique: number;
  multiplicity: number;
  cell?: CellParams;
  wavelength?: number;
  /** Resolution range in angstrom; undefined without a cell or without rows. */
  dMin?: number;
  dMax?: number;
  meanIOverSigma?: number;
  fractionNegative?: number;
  indexRange?: { h: [number, number]; k: [number, number]; l: [number, number] };
  origin: 'intensity' | 'amplitude';
  unmerged: boolean;
  /** True when the file had no sigma column and the sigmas are estimates. */
  sigmaEstimated: boolean;
  warnings: string[];
}

/** Bounding boxes up to this many cells are counted with a bit set (32 MB at most). */
const MAX_BITSET_CELLS = 1 << 28;

/**
 * Number of distinct (h,k,l) among the rows, no object per row: a bit set over
 * the bounding box of the indices when it is small enough (the usual case),
 * otherwise an open-addressing hash on packed keys.
 */
export function countUniqueHkl(t: ReflectionTable): number {
  const n = t.n;
  if (n === 0) return 0;
  const H = t.h, K = t.k, L = t.l;
  let h0 = H[0], h1 = H[0], k0 = K[0], k1 = K[0], l0 = L[0], l1 = L[0];
  for (let j = 1; j < n; j++) {
    const h = H[j], k = K[j], l = L[j];
    if (h < h0) h0 = h; else if (h > h1) h1 = h;
    if (k < k0) k0 = k; else if (k > k1) k1 = k;
    if (l < l0) l0 = l; else if (l > l1) l1 = l;
  }
  const nk = k1 - k0 + 1, nl = l1 - l0 + 1;
  if ((h1 - h0 + 1) * nk * nl <= MAX_BITSET_CELLS) {
    const bits = new Uint32Array(Math.ceil(((h1 - h0 + 1) * nk * nl) / 32));
    let unique = 0;
    for (let j = 0; j < n; j++) {
      const cellIndex = ((H[j] - h0) * nk + (K[j] - k0)) * nl + (L[j] - l0);
      const word = cellIndex >>> 5, bit = 1 << (cellIndex & 31);
      if ((bits[word] & bit) === 0) { bits[word] |= bit; unique++; }
    }
    return unique;
  }
  return countUniqueHklHashed(t);
}

function countUniqueHklHashed(t: ReflectionTable): number {
  const n = t.n;
  let size = 16;
  while (size < 2 * n) size *= 2;
  const mask = size - 1;
  const keys = new Float64Array(size); // 0 = empty; packed keys are > 0 because |index| <= 32767
  let unique = 0;
  const H = t.h, K = t.k, L = t.l;
  for (let j = 0; j < n; j++) {
    const h = H[j], k = K[j], l = L[j];
    const key = ((h + 32768) * 65536 + (k + 32768)) * 65536 + (l + 32768);
    let slot = (Math.imul(h, 73856093) ^ Math.imul(k, 19349663) ^ Math.imul(l, 83492791)) & mask;
    for (;;) {
      const x = keys[slot];
      if (x === 0) { keys[slot] = key; unique++; break; }
      if (x === key) break;
      slot = (slot + 1) & mask;
    }
  }
  return unique;
}

export function summarizeReflections(t: ReflectionTable): ReflectionSummary {
  const m = t.meta;
  const n = t.n;
  const warnings = [...m.warnings];
  const s: ReflectionSummary = {
    source: m.source,
    block: m.block,
    rowsInFile: m.rowsInFile,
    reflections: n,
    rejected: m.rejectedCount,
    rejectedReasons: { ...m.rejectedByReason },
    rejectedExamples: m.rejectedExamples.map((e) => ({ ...e })),
    unique: countUniqueHkl(t),
    multiplicity: 0,
    cell: m.cell ? { ...m.cell } : undefined,
    wavelength: m.wavelength,
    origin: m.origin,
    unmerged: m.unmerged,
    sigmaEstimated: m.sigmaEstimated === true,
    warnings,
  };
  s.multiplicity = s.unique > 0 ? n / s.unique : 0;
  if (n === 0) {
    warnings.push('no reflection was accepted');
    return s;
  }
  let sumIs = 0, neg = 0;
  let hmin = 32767, hmax = -32767, kmin = 32767, kmax = -32767, lmin = 32767, lmax = -32767;
  for (let j = 0; j < n; j++) {
    const I = t.i[j];
    sumIs += I / t.sigma[j];
    if (I < 0) neg++;
    const h = t.h[j], k = t.k[j], l = t.l[j];
    if (h < hmin) hmin = h; if (h > hmax) hmax = h;
    if (k < kmin) kmin = k; if (k > kmax) kmax = k;
    if (l < lmin) lmin = l; if (l > lmax) lmax = l;
  }
  s.meanIOverSigma = sumIs / n;
  s.fractionNegative = neg / n;
  s.indexRange = { h: [hmin, hmax], k: [kmin, kmax], l: [lmin, lmax] };
  if (m.cell) {
    const r = makeCell(m.cell);
    if (r.ok) {
      const cell = r.value;
      let lo = Infinity, hi = 0;
      for (let j = 0; j < n; j++) {
        const q = cell.invDSquared(t.h[j], t.k[j], t.l[j]);
        if (q < lo) lo = q;
        if (q > hi) hi = q;
      }
      s.dMin = 1 / Math.sqrt(hi);
      s.dMax = 1 / Math.sqrt(lo);
    }
  } else {
    warnings.push('no unit cell: resolution unknown. Give the cell with --cell a,b,c,alpha,beta,gamma');
  }
  if (s.unique < n && !m.unmerged) warnings.push(`${n - s.unique} rows repeat an h,k,l already seen`);
  if (s.fractionNegative > 0.5) warnings.push(`${(100 * s.fractionNegative).toFixed(0)}% of the intensities are negative: check the column assignment`);
  return s;
}
