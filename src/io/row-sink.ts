import { NUMBER_BAD, NUMBER_OK, numberScan, parseByteNumber } from './byte-number';
import { ROLE_H, ROLE_K, ROLE_L, ROLE_SIGMA, ROLE_VALUE } from './reflection-columns';
import { fillEstimatedSigmas, ReflectionTableBuilder, recordRejection, SIGMA_ESTIMATE_RULE, type ReflectionMeta, type ReflectionTable } from '../core';

/**
 * Where readers put rows: checks each row, converts amplitudes, and either
 * appends it to the table or records why not, so that accepted + rejected
 * always equals the rows in the file.
 */

/** Rejection reasons (keys of meta.rejectedByReason). */
export const REJECT_MISSING = 'missing value (? or . or empty)';
export const REJECT_NON_NUMERIC = 'non-numeric value';
export const REJECT_NON_FINITE = 'NaN or infinite value';
export const REJECT_NON_INTEGER = 'non-integer index';
export const REJECT_RANGE = 'index out of range (|h|, |k| or |l| > 32767)';
export const REJECT_000 = 'index 0 0 0';
export const REJECT_SIGMA = 'sigma <= 0';
export const REJECT_NEGATIVE_F = 'negative amplitude F';
export const REJECT_TOO_FEW = 'too few columns';
export const REJECT_TOO_MANY = 'more columns than the header names';

export const AMPLITUDE_WARNING =
  'the file gives amplitudes F: converted to intensities with I = F^2, sigma(I) = 2|F| sigma(F) (common practice)';

export const NO_SIGMA_WARNING =
  `the file has no sigma column: every row was kept and sigmas were estimated, ${SIGMA_ESTIMATE_RULE}; I/sigma figures and anything judged against sigma (absences above all) are less reliable`;

/** Per-row field state collected by a reader before calling `add`. */
export const FIELD_OK = 0;
export const FIELD_MISSING = 1;
export const FIELD_BAD = 2;
export const FIELD_NONFINITE = 3;

const MAX_INDEX = 32767;

export class RowSink {
  readonly builder: ReflectionTableBuilder;
  rows = 0;
  /** `hasSigma` false: the file has no sigma column; rows carry a placeholder and finish() fills estimates. */
  constructor(readonly meta: ReflectionMeta, readonly amplitude: boolean, initialCapacity?: number, readonly hasSigma = true) {
    this.builder = new ReflectionTableBuilder(initialCapacity);
    // placeholder that passes the sigma checks; never overwritten because no field has ROLE_SIGMA
    if (!hasSigma) this.row[ROLE_SIGMA] = 1;
  }

  // the row being collected, indexed by ROLE_*
  private readonly row = new Float64Array(6);
  private status = FIELD_OK;

  /**
   * Parse bytes[start, end) as the field with this role (ROLE_* != ROLE_SKIP).
   * An empty field, `?` and `.` are missing values.
   */
  field(role: number, b: Uint8Array, start: number, end: number): void {
    if (start === end || (end - start === 1 && (b[start] === 63 || b[start] === 46))) this.missingField();
    else this.numberField(role, parseByteNumber(b, start, end));
  }

  /** Store x, just returned by a byte-number parser (numberScan.status tells whether it is one). */
  numberField(role: number, x: number): void {
    if (numberScan.status !== NUMBER_OK) {
      const st = numberScan.status === NUMBER_BAD ? FIELD_BAD : FIELD_NONFINITE;
      if (this.status < st) this.status = st;
    } else this.row[role] = x;
  }

  /** Store a value known to be a finite number. */
  fastField(role: number, x: number): void {
    this.row[role] = x;
  }

  /** Mark the current row as having a missing value. */
  missingField(): void {
    if (this.status < FIELD_MISSING) this.status = FIELD_MISSING;
  }

  /** Mark the current row as having a non-numeric field. */
  badField(): void {
    if (this.status < FIELD_BAD) this.status = FIELD_BAD;
  }

  /** Finish the row collected with field(): accept or reject it. */
  endRow(line: number): void {
    const r = this.row;
    this.add(r[ROLE_H], r[ROLE_K], r[ROLE_L], r[ROLE_VALUE], r[ROLE_SIGMA], this.status, line);
    this.status = FIELD_OK;
  }

  /** The table of accepted rows; without a sigma column, the sigmas are estimated here and meta says so. */
  finish(): ReflectionTable {
    const t = this.builder.finish(this.meta);
    if (!this.hasSigma) {
      fillEstimatedSigmas(t.i, t.sigma, t.n, false);
      this.meta.sigmaEstimated = true;
      this.meta.warnings.push(NO_SIGMA_WARNING);
    }
    return t;
  }

  reject(line: number, reason: string): void {
    this.rows++;
    recordRejection(this.meta, line, reason);
  }

  /** `status` is the worst FIELD_* seen among the five fields of the row. */
  add(h: number, k: number, l: number, v: number, s: number, status: number, line: number): void {
    if (status !== FIELD_OK) {
      this.reject(line, status === FIELD_MISSING ? REJECT_MISSING : status === FIELD_BAD ? REJECT_NON_NUMERIC : REJECT_NON_FINITE);
      return;
    }
    if (h !== Math.floor(h) || k !== Math.floor(k) || l !== Math.floor(l)) { this.reject(line, REJECT_NON_INTEGER); return; }
    if (h > MAX_INDEX || h < -MAX_INDEX || k > MAX_INDEX || k < -MAX_INDEX || l > MAX_INDEX || l < -MAX_INDEX) { this.reject(line, REJECT_RANGE); return; }
    if (h === 0 && k === 0 && l === 0) { this.reject(line, REJECT_000); return; }
    if (this.amplitude) {
      if (v < 0) { this.reject(line, REJECT_NEGATIVE_F); return; }
      if (!(s > 0)) { this.reject(line, REJECT_SIGMA); return; }
      // I = F^2, sigma(I) = 2 F sigma(F) (common practice); at F = 0 that vanishes, so sigma(F)^2 is used there
      const sI = v > 0 ? 2 * v * s : s * s;
      v = v * v;
      s = sI;
    }
    const v32 = Math.fround(v);
    const s32 = Math.fround(s);
    if (!Number.isFinite(v32) || !Number.isFinite(s32)) { this.reject(line, REJECT_NON_FINITE); return; }
    if (!(s32 > 0)) { this.reject(line, REJECT_SIGMA); return; }
    this.rows++;
    this.builder.push(h, k, l, v32, s32);
  }
}
