import type { CellParams } from './cell';

/**
 * The central data type: reflections as columns, one typed array per quantity
 * and a row count `n`. No object per reflection.
 *
 * Sizes were chosen so a million reflections hold in 14 bytes each:
 * indices Int16 (|h| <= 32767; larger indices are rejected on reading),
 * intensity and sigma Float32 (7 significant digits, more than any measurement).
 * Intensities are always on the F^2 scale; amplitude input is converted on
 * reading (I = F^2, sigma(I) = 2|F|sigma(F), common practice) and `origin` says so.
 */
export interface ReflectionTable {
  readonly n: number;
  readonly h: Int16Array;
  readonly k: Int16Array;
  readonly l: Int16Array;
  readonly i: Float32Array;
  readonly sigma: Float32Array;
  readonly meta: ReflectionMeta;
}

export type IntensityOrigin = 'intensity' | 'amplitude';

export interface RejectedRow {
  /** 1-based line in the file where the row starts. */
  readonly line: number;
  readonly reason: string;
}

export interface ReflectionMeta {
  /** Where the data came from (file name or label). */
  source: string;
  /** Data block name for CIF input. */
  block?: string;
  cell?: CellParams;
  /** Wavelength in angstrom, if the file gives it. */
  wavelength?: number;
  /** 'amplitude' when the file gave F and the reader squared it. */
  origin: IntensityOrigin;
  /** True when the rows are individual observations (unmerged, e.g. _diffrn_refln). */
  unmerged: boolean;
  /** True when the file gave no sigma column and every sigma is the estimate of `fillEstimatedSigmas`. */
  sigmaEstimated?: boolean;
  /** Data rows seen in the file; equals n + rejected count. */
  rowsInFile: number;
  /** Rejected rows: the first few with their line, and counts per reason. */
  rejectedCount: number;
  rejectedExamples: RejectedRow[];
  rejectedByReason: Record<string, number>;
  warnings: string[];
}

export function emptyMeta(source: string): ReflectionMeta {
  return {
    source,
    origin: 'intensity',
    unmerged: false,
    rowsInFile: 0,
    rejectedCount: 0,
    rejectedExamples: [],
    rejectedByReason: {},
    warnings: [],
  };
}

/** How many rejected rows keep their line number (the counts are always complete). */
export const MAX_REJECTED_EXAMPLES = 50;

export function recordRejection(meta: ReflectionMeta, line: number, reason: string): void {
  meta.rejectedCount++;
  meta.rejectedByReason[reason] = (meta.rejectedByReason[reason] ?? 0) + 1;
  if (meta.rejectedExamples.length < MAX_REJECTED_EXAMPLES) meta.rejectedExamples.push({ line, reason });
}

/** How `fillEstimatedSigmas` guesses a missing sigma, in words for warnings. */
export const SIGMA_ESTIMATE_RULE = 'sigma(I) = 5 % of |I| plus 2 % of the mean |I| (common practice)';

/**
 * Put an estimate into sigma[j] for j < n: every row when `onlyInvalid` is false,
 * else only rows whose sigma is not a finite number > 0. Returns how many were filled.
 * The guess (see SIGMA_ESTIMATE_RULE) is a rough error model, a proportional part plus a
 * floor for weak reflections; it is unchanged when all intensities are scaled, so I/sigma
 * does not depend on the arbitrary scale of the file. The analysis rescales sigmas by a
 * factor estimated from the data anyway. Sigma 1 where the estimate is 0 (all I zero).
 */
export function fillEstimatedSigmas(i: Float32Array, sigma: Float32Array, n: number, onlyInvalid: boolean): number {
  let sumAbs = 0;
  for (let j = 0; j < n; j++) sumAbs += Math.abs(i[j]);
  const floor = (0.02 * sumAbs) / Math.max(1, n);
  let filled = 0;
  for (let j = 0; j < n; j++) {
    const s = sigma[j];
    if (onlyInvalid && s > 0 && Number.isFinite(s)) continue;
    const e = Math.fround(0.05 * Math.abs(i[j]) + floor);
    sigma[j] = e > 0 && Number.isFinite(e) ? e : 1;
    filled++;
  }
  return filled;
}

/**
 * Growable column store used by readers; `finish()` trims to a ReflectionTable.
 * Doubling growth keeps appends amortised O(1) without an object per row.
 */
export class ReflectionTableBuilder {
  private cap: number;
  n = 0;
  h: Int16Array;
  k: Int16Array;
  l: Int16Array;
  i: Float32Array;
  sigma: Float32Array;
  constructor(initialCapacity = 1024) {
    this.cap = Math.max(16, initialCapacity | 0);
    this.h = new Int16Array(this.cap);
    this.k = new Int16Array(this.cap);
    this.l = new Int16Array(this.cap);
    this.i = new Float32Array(this.cap);
    this.sigma = new Float32Array(this.cap);
  }
  private grow(): void {
    const cap = this.cap * 2;
    const g16 = (a: Int16Array) => { const b = new Int16Array(cap); b.set(a); return b; };
    const g32 = (a: Float32Array) => { const b = new Float32Array(cap); b.set(a); return b; };
    this.h = g16(this.h); this.k = g16(this.k); this.l = g16(this.l);
    this.i = g32(this.i); this.sigma = g32(this.sigma);
    this.cap = cap;
  }
  push(h: number, k: number, l: number, i: number, sigma: number): void {
    if (this.n === this.cap) this.grow();
    const j = this.n++;
    this.h[j] = h; this.k[j] = k; this.l[j] = l; this.i[j] = i; this.sigma[j] = sigma;
  }
  finish(meta: ReflectionMeta): ReflectionTable {
    const n = this.n;
    // subarray shares memory; slice only when the waste is large
    const trim = <T extends Int16Array | Float32Array>(a: T): T =>
      (a.length > n * 1.25 + 64 ? a.slice(0, n) : a.subarray(0, n)) as T;
    return { n, h: trim(this.h), k: trim(this.k), l: trim(this.l), i: trim(this.i), sigma: trim(this.sigma), meta };
  }
}

/** Build a table from plain arrays (tests, demo, simulation). */
export function tableFromArrays(
  cols: { h: ArrayLike<number>; k: ArrayLike<number>; l: ArrayLike<number>; i: ArrayLike<number>; sigma: ArrayLike<number> },
  meta: Partial<ReflectionMeta> & { source: string },
): ReflectionTable {
  const n = cols.h.length;
  const m = { ...emptyMeta(meta.source), ...meta, rowsInFile: meta.rowsInFile ?? n };
  return {
    n,
    h: Int16Array.from(cols.h),
    k: Int16Array.from(cols.k),
    l: Int16Array.from(cols.l),
    i: Float32Array.from(cols.i),
    sigma: Float32Array.from(cols.sigma),
    meta: m,
  };
}
