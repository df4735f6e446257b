import type { ReflectionTable } from '../core';

/**
 * Constant-time lookup from (h, k, l) to a row of the table: a dense box of row numbers
 * when it is small enough (the usual case: a million reflections need about 16 MB),
 * otherwise a sorted key array with binary search. Rows with repeated indices keep the
 * first occurrence (merge unmerged data first).
 */
export class HklIndex {
  private readonly h0: number;
  private readonly k0: number;
  private readonly l0: number;
  private readonly nh: number;
  private readonly nk: number;
  private readonly nl: number;
  private readonly box?: Int32Array;
  private readonly keys?: Float64Array;
  private readonly rows?: Int32Array;
  /** Rows whose (h, k, l) repeats an earlier row (unmerged data). */
  readonly duplicates: number;

  constructor(table: ReflectionTable, maxBoxCells = 16_000_000) {
    let hmin = 0, hmax = 0, kmin = 0, kmax = 0, lmin = 0, lmax = 0;
    for (let j = 0; j < table.n; j++) {
      const h = table.h[j], k = table.k[j], l = table.l[j];
      if (h < hmin) hmin = h; if (h > hmax) hmax = h;
      if (k < kmin) kmin = k; if (k > kmax) kmax = k;
      if (l < lmin) lmin = l; if (l > lmax) lmax = l;
    }
    // symmetric bounds so that Friedel mates stay inside
    const mh = Math.max(-hmin, hmax), mk = Math.max(-kmin, kmax), ml = Math.max(-lmin, lmax);
    this.h0 = mh; this.k0 = mk; this.l0 = ml;
    this.nh = 2 * mh + 1; this.nk = 2 * mk + 1; this.nl = 2 * ml + 1;
    const cells = this.nh * this.nk * this.nl;
    if (cells <= maxBoxCells) {
      const box = new Int32Array(cells).fill(-1);
      let dup = 0;
      for (let j = table.n - 1; j >= 0; j--) {
        const c = this.cell(table.h[j], table.k[j], table.l[j]);
        if (box[c] >= 0) dup++;
        box[c] = j;
      }
      this.box = box;
      this.duplicates = dup;
    } else {
      const order = new Int32Array(table.n);
      const keys = new Float64Array(table.n);
      for (let j = 0; j < table.n; j++) { order[j] = j; keys[j] = this.cell(table.h[j], table.k[j], table.l[j]); }
      order.sort((a, b) => keys[a] - keys[b] || a - b);
      this.keys = Float64Array.from(order, (j) => keys[j]);
      this.rows = order;
      let dup = 0;
      for (let j = 1; j < this.keys.length; j++) if (this.keys[j] === this.keys[j - 1]) dup++;
      this.duplicates = dup;
    }
  }

  private cell(h: number, k: number, l: number): number {
    return ((h + this.h0) * this.nk + (k + this.k0)) * this.nl + (l + this.l0);
  }

  /** Row of (h, k, l), or -1 when absent from the table. */
  find(h: number, k: number, l: number): number {
    if (h < -this.h0 || h > this.h0 || k < -this.k0 || k > this.k0 || l < -this.l0 || l > this.l0) return -1;
    const c = this.cell(h, k, l);
    if (this.box) return this.box[c];
    const keys = this.keys!;
    let lo = 0, hi = keys.length - 1;
    while (lo <= hi) {
      const mid = (lo + hi) >> 1;
      const v = keys[mid];
      if (v === c) return this.rows![mid];
      if (v < c) lo = mid + 1; else hi = mid - 1;
    }
    return -1;
  }

  /** Row of (h, k, l) or of its Friedel mate (-h, -k, -l), or -1. */
  findWithFriedel(h: number, k: number, l: number): number {
    const j = this.find(h, k, l);
    return j >= 0 ? j : this.find(-h, -k, -l);
  }
}
