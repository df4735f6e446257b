import { fail, type ReflectionTable, type Result } from '../core';
import { readCifReflections } from './cif-reflections';
import { readTextReflections } from './text-reflections';
import { isGzip } from './gzip';
import type { ReadReflectionsOptions } from './read-options';

export type ReflectionFormat = 'cif' | 'text';

/** Offset after a UTF-8 byte-order mark, if any. */
function contentStart(b: Uint8Array): number {
  return b.length >= 3 && b[0] === 0xef && b[1] === 0xbb && b[2] === 0xbf ? 3 : 0;
}

/**
 * CIF when the first token (after blanks and # comments) is a data_ header,
 * a tag or loop_; delimited text otherwise.
 */
export function detectReflectionFormat(bytes: Uint8Array): ReflectionFormat {
  const b = bytes;
  let j = contentStart(b);
  for (;;) {
    while (j < b.length && (b[j] === 32 || b[j] === 9 || b[j] === 10 || b[j] === 13)) j++;
    if (j < b.length && b[j] === 35) { while (j < b.length && b[j] !== 10) j++; continue; }
    break;
  }
  if (j >= b.length) return 'text';
  if (b[j] === 95) return 'cif';
  const word = String.fromCharCode(...b.subarray(j, Math.min(b.length, j + 5))).toLowerCase();
  return word === 'data_' || word === 'loop_' ? 'cif' : 'text';
}

/**
 * Read a reflection file (CIF 1.1, mmCIF or delimited text, detected from the
 * content) into a ReflectionTable. Works on the bytes, so files larger than the
 * longest possible string are fine. Every row is accepted or rejected with a
 * reason and its line: table.n + meta.rejectedCount === meta.rowsInFile.
 * gzip input must be decompressed by the caller (see isGzip).
 */
export function readReflections(bytes: Uint8Array, opts: ReadReflectionsOptions): Result<ReflectionTable> {
  if (isGzip(bytes)) return fail('the data is gzip-compressed and must be decompressed before reading', { file: opts.source });
  if (bytes.length === 0) return fail('the file is empty', { file: opts.source });
  const start = contentStart(bytes);
  return detectReflectionFormat(bytes) === 'cif' ? readCifReflections(bytes, start, opts) : readTextReflections(bytes, start, opts);
}
