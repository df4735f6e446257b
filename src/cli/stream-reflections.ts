import { closeSync, openSync, readSync } from 'node:fs';
import { fail, fillEstimatedSigmas, MAX_REJECTED_EXAMPLES, ReflectionTableBuilder, type ReflectionMeta, type ReflectionTable, type Result } from '../core';
import { detectReflectionFormat, isGzip, readReflections, type ReadReflectionsOptions } from '../io';

/**
 * Reading a very large reflection file in chunks, so memory holds the table and
 * one chunk instead of the whole file (and files beyond the 2 GB Node reads at
 * once work). The file is cut at line ends; each chunk is read by the ordinary
 * reader behind a copy of the file's header (everything before the first row),
 * and the parts are joined with line numbers made global again.
 *
 * Only the plain layout is streamed: rows one per line in the first reflection
 * loop (CIF) or after the header line (text), no --block/--columns. Every chunk
 * but the last must consist of rows only (its row count equals its content
 * lines), which proves that no chunk boundary fell outside the loop. Anything
 * else returns undefined and the caller reads the file whole, so the result is
 * always the one the whole-file reader gives (checked by tests/large).
 */

export interface ChunkedReadOptions {
  /** Bytes per chunk (default 32 MB). */
  readonly chunkBytes?: number;
  /** Called after each chunk with bytes done and the file size. */
  readonly onProgress?: (done: number, total: number) => void;
}

/** How much of the file start is searched for the first row. */
const HEAD_BYTES = 8 << 20;

function isBlankByte(c: number): boolean {
  return c === 32 || c === 9 || c === 13;
}

/** Lines in b[start, end) with something besides blanks and a # comment. */
function contentLines(b: Uint8Array, start: number, end: number): number {
  let count = 0;
  let j = start;
  while (j < end) {
    while (j < end && isBlankByte(b[j])) j++;
    if (j < end && b[j] !== 10 && b[j] !== 35) count++;
    while (j < end && b[j] !== 10) j++;
    j++;
  }
  return count;
}

/**
 * Byte offset where the rows start (the header is everything before), or -1
 * when the layout is not the plain one.
 */
export function findRowsStart(head: Uint8Array, complete: boolean): number {
  const latin1 = new TextDecoder('latin1');
  const text = latin1.decode(head);
  const format = detectReflectionFormat(head);
  let pos = text.charCodeAt(0) === 0xef && text.charCodeAt(1) === 0xbb && text.charCodeAt(2) === 0xbf ? 3 : 0;
  if (/\r(?!\n)/.test(text)) return -1; // lone CR line ends count lines differently
  let inLoop = false, reflectionLoop = false;
  while (pos < text.length) {
    let eol = text.indexOf('\n', pos);
    if (eol < 0) { if (!complete) return -1; eol = text.length; }
    const line = text.slice(pos, eol).trim();
    if (line === '' || line.startsWith('#')) { pos = eol + 1; continue; }
    if (format === 'text') return eol + 1; // the header line; rows follow
    if (line.startsWith(';')) return -1; // text fields could hide anything: read the file whole
    const words = line.split(/[ \t]+/);
    const first = words[0].toLowerCase();
    if (first.startsWith('save_')) return -1; // loops in save frames are not read
    if (first === 'loop_') {
      if (words.length > 1) return -1;
      inLoop = true; reflectionLoop = false; pos = eol + 1; continue;
    }
    if (inLoop && first.startsWith('_')) {
      if (line.includes(' ') || line.includes('\t')) return -1;
      const tag = first.replace(/\./g, '_');
      if (tag === '_refln_index_h' || tag === '_diffrn_refln_index_h') reflectionLoop = true;
      pos = eol + 1;
      continue;
    }
    if (inLoop && reflectionLoop) return pos; // the first row of the first reflection loop
    inLoop = false;
    pos = eol + 1;
  }
  return -1;
}

/** Rejection lines and row counts of one part added into the whole. */
function addPart(meta: ReflectionMeta, part: ReflectionMeta, lineShift: number): void {
  meta.rowsInFile += part.rowsInFile;
  meta.rejectedCount += part.rejectedCount;
  for (const [reason, count] of Object.entries(part.rejectedByReason)) meta.rejectedByReason[reason] = (meta.rejectedByReason[reason] ?? 0) + count;
  for (const ex of part.rejectedExamples) {
    if (meta.rejectedExamples.length >= MAX_REJECTED_EXAMPLES) break;
    meta.rejectedExamples.push({ line: ex.line + lineShift, reason: ex.reason });
  }
}

function countNewlines(b: Uint8Array, start: number, end: number): number {
  let n = 0;
  for (let j = b.indexOf(10, start); j >= 0 && j < end; j = b.indexOf(10, j + 1)) n++;
  return n;
}

/**
 * Read `path` (`size` bytes) in chunks; undefined when the file's layout is not
 * the plain one (the caller then reads it whole).
 */
export function readReflectionsInChunks(path: string, size: number, opts: ReadReflectionsOptions, co: ChunkedReadOptions = {}): Result<ReflectionTable> | undefined {
  if (opts.block !== undefined || opts.columns !== undefined) return undefined;
  const chunkBytes = Math.max(1024, co.chunkBytes ?? 32 << 20);
  const fd = openSync(path, 'r');
  try {
    const head = new Uint8Array(Math.min(size, HEAD_BYTES));
    const got = readSync(fd, head, 0, head.length, 0);
    if (got !== head.length || isGzip(head)) return undefined;
    const rowsStart = findRowsStart(head, head.length === size);
    if (rowsStart <= 0 || rowsStart >= size) return undefined;
    const headerLines = countNewlines(head, 0, rowsStart); // the header ends with a line end
    const buf = new Uint8Array(rowsStart + chunkBytes + 1);
    buf.set(head.subarray(0, rowsStart));

    let builder: ReflectionTableBuilder | undefined;
    let meta: ReflectionMeta | undefined;
    const partWarnings: string[][] = [];
    let filePos = rowsStart; // next byte of the file to read
    let carry = 0; // bytes of an unfinished line at the start of the chunk area
    let firstLine = headerLines + 1; // file line of the first byte in the chunk area
    for (;;) {
      const want = chunkBytes - carry;
      const n = want > 0 ? readSync(fd, buf, rowsStart + carry, Math.min(want, size - filePos), filePos) : 0;
      filePos += n;
      const last = filePos >= size;
      const filled = rowsStart + carry + n;
      let cut = filled;
      if (!last) {
        const nl = buf.lastIndexOf(10, filled - 1);
        if (nl < rowsStart) return undefined; // a line longer than a chunk
        cut = nl + 1;
      }
      // a lone CR is a line end to the CIF reader but not to the line numbers kept here
      for (let j = buf.indexOf(13, rowsStart); j >= 0 && j < cut; j = buf.indexOf(13, j + 1)) if (j + 1 >= cut || buf[j + 1] !== 10) return undefined;
      const r = readReflections(buf.subarray(0, cut), opts);
      if (!r.ok) return undefined;
      const t = r.value;
      // a warning that names a line would name it within the chunk: read whole instead
      if (t.meta.warnings.some((w) => /\blines? \d/.test(w))) return undefined;
      // every chunk but the last holds rows only, one per line
      if (!last && t.meta.rowsInFile !== contentLines(buf, rowsStart, cut)) return undefined;
      const shift = firstLine - headerLines - 1;
      if (!meta) meta = { ...t.meta, rowsInFile: 0, rejectedCount: 0, rejectedByReason: {}, rejectedExamples: [], warnings: [] };
      else if (t.meta.block !== meta.block || t.meta.origin !== meta.origin || t.meta.unmerged !== meta.unmerged) return undefined;
      addPart(meta, t.meta, shift);
      partWarnings.push(t.meta.warnings);
      // size the table once from the first chunk's bytes per row, so it rarely grows (growing copies it)
      builder ??= new ReflectionTableBuilder(Math.ceil(((size - rowsStart) * Math.max(1, t.meta.rowsInFile)) / Math.max(1, cut - rowsStart) * 1.02) + 1024);
      for (let j = 0; j < t.n; j++) builder.push(t.h[j], t.k[j], t.l[j], t.i[j], t.sigma[j]);
      co.onProgress?.(filePos, size);
      if (last) {
        // the last part saw the header and everything after the loop: its cell, wavelength and warnings are the file's
        meta.cell = t.meta.cell;
        meta.wavelength = t.meta.wavelength;
        meta.warnings = [...t.meta.warnings];
        // a warning seen only in an earlier part would carry that part's line numbers: read whole instead
        if (partWarnings.some((ws) => ws.some((w) => !meta!.warnings.includes(w)))) return undefined;
        break;
      }
      firstLine += countNewlines(buf, rowsStart, cut);
      carry = filled - cut;
      buf.copyWithin(rowsStart, cut, filled);
    }
    const table = builder!.finish(meta!);
    // estimated sigmas depend on the mean |I| of the whole file, not of one chunk
    if (meta!.sigmaEstimated) fillEstimatedSigmas(table.i, table.sigma, table.n, false);
    return { ok: true, value: table };
  } catch (e) {
    return fail(`cannot read the file: ${(e as Error).message}`, { file: opts.source });
  } finally {
    closeSync(fd);
  }
}
