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

/** How far to look for bytes that text never holds (a binary file shows them at once). */
const BINARY_PROBE = 65536;

/**
 * A binary file (an image, a spreadsheet, UTF-16 text) is named as such with
 * the first offending byte, instead of a confusing message about columns.
 * Control bytes other than tab, LF and CR do not occur in CIF (CIF 1.1 allows
 * no others) or in a table of numbers.
 */
function findBinaryStart(b: Uint8Array, file: string): Result<ReflectionTable> | undefined {
  if (b.length >= 2 && ((b[0] === 0xff && b[1] === 0xfe) || (b[0] === 0xfe && b[1] === 0xff)))
    return fail('the file is UTF-16 text', { file, line: 1, column: 1 }, 'Save it as UTF-8 or ASCII text.');
  const end = Math.min(b.length, BINARY_PROBE);
  let line = 1, lineStart = 0;
  for (let j = 0; j < end; j++) {
    const c = b[j];
    if (c === 10) { line++; lineStart = j + 1; continue; }
    if (c < 32 && c !== 9 && c !== 13) {
      return fail(`the file is not text: it holds the control byte 0x${c.toString(16).padStart(2, '0')}`, { file, line, column: j - lineStart + 1 },
        'Lacuna reads CIF, mmCIF or delimited text (gzip-compressed or not); check that this is the reflection file.');
    }
  }
  return undefined;
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
  if (bytes.length === 0) return fail('the file is empty', { file: opts.source }, 'A reflection file holds CIF or text rows; check that the export finished writing.');
  const notText = findBinaryStart(bytes, opts.source);
  if (notText) return notText;
  const start = contentStart(bytes);
  return detectReflectionFormat(bytes) === 'cif' ? readCifReflections(bytes, start, opts) : readTextReflections(bytes, start, opts);
}
