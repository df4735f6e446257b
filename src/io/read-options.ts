import type { CellParams } from '../core';

export interface ReadReflectionsOptions {
  /** File name or label, used in every message. */
  readonly source: string;
  /** CIF: read this data block (name without `data_`, any case). */
  readonly block?: string;
  /**
   * Delimited text: one name per column in file order (aliases as in a header row,
   * e.g. h,k,l,i,sigi; other names are skipped columns). CIF: five tags for
   * h, k, l, value, sigma.
   */
  readonly columns?: readonly string[];
  /** Cell to use instead of (or in the absence of) the file's. */
  readonly cell?: CellParams;
}
