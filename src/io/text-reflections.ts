import { emptyMeta, fail, ok, type ReflectionTable, type Result } from '../core';
import { makeCell } from '../lattice';
import { NUMBER_OK, numberScan, parseByteNumber } from './byte-number';
import { planTextColumns } from './reflection-columns';
import { AMPLITUDE_WARNING, REJECT_TOO_FEW, REJECT_TOO_MANY, RowSink } from './row-sink';
import type { ReadReflectionsOptions } from './read-options';

/**
 * Delimited text: one reflection per line, columns separated by whitespace,
 * commas, tabs or semicolons (decided from the first line), a header row naming the
 * columns or names given with --columns. Lines starting with # are comments.
 * Works on byte offsets like the CIF reader.
 */

const DELIM_SPACE = 0, DELIM_COMMA = 44, DELIM_TAB = 9, DELIM_SEMICOLON = 59;
const latin1 = new TextDecoder('latin1');

function isSpace(c: number): boolean {
  return c === 32 || c === 9 || c === 13;
}

/** Field boundaries of bytes[start, end) into starts/ends; returns the field count. */
function splitFields(b: Uint8Array, start: number, end: number, delim: number, starts: Int32Array, ends: Int32Array): number {
  let n = 0;
  let j = start;
  if (delim === DELIM_SPACE) {
    for (;;) {
      while (j < end && isSpace(b[j])) j++;
      if (j >= end) return n;
      const s = j;
      while (j < end && !isSpace(b[j])) j++;
      if (n < starts.length) { starts[n] = s; ends[n] = j; }
      n++;
    }
  }
  for (;;) {
    let s = j;
    while (j < end && b[j] !== delim) j++;
    let e = j;
    while (s < e && isSpace(b[s])) s++;
    while (e > s && isSpace(b[e - 1])) e--;
    if (n < starts.length) { starts[n] = s; ends[n] = e; }
    n++;
    if (j >= end) return n;
    j++;
  }
}

export function readTextReflections(bytes: Uint8Array, start: number, opts: ReadReflectionsOptions): Result<ReflectionTable> {
  const file = opts.source;
  const b = bytes;
  const n = b.length;
  const meta = emptyMeta(file);
  const starts = new Int32Array(256), ends = new Int32Array(256);
  let pos = start;
  let line = 0;
  let delim = -1;
  let roles: Int8Array | undefined;
  let sink: RowSink | undefined;
  let needed = 0;
  // the last comment line before the data: some programs write the header as '# h k l I sigI'
  let commentStart = -1, commentEnd = -1, commentLine = 0;
  while (pos < n) {
    let eol = b.indexOf(10, pos);
    if (eol < 0) eol = n;
    const ls = pos;
    pos = eol + 1;
    line++;
    let s = ls, e = eol;
    while (s < e && isSpace(b[s])) s++;
    while (e > s && isSpace(b[e - 1])) e--;
    if (s === e) continue;
    if (b[s] === 35 /* # */) {
      if (!roles) { commentStart = s + 1; commentEnd = e; commentLine = line; }
      continue;
    }
    if (!roles) {
      // first content line: choose the delimiter, then header or --columns
      const head = b.subarray(s, e);
      delim = head.includes(DELIM_TAB) ? DELIM_TAB : head.includes(DELIM_COMMA) ? DELIM_COMMA : head.includes(DELIM_SEMICOLON) ? DELIM_SEMICOLON : DELIM_SPACE;
      const count = splitFields(b, s, e, delim, starts, ends);
      if (count > starts.length || (opts.columns?.length ?? 0) > starts.length)
        return fail(`more than ${starts.length} columns`, { file, line, column: 1 });
      const names: string[] = [];
      let numeric = true;
      for (let j = 0; j < Math.min(count, starts.length); j++) {
        names.push(latin1.decode(b.subarray(starts[j], ends[j])));
        parseByteNumber(b, starts[j], ends[j]);
        if (numberScan.status !== NUMBER_OK) numeric = false;
      }
      let headerNames: readonly string[] | undefined = opts.columns ?? (numeric ? undefined : names);
      if (numeric && !opts.columns && commentStart >= 0) {
        // a commented header naming as many columns as the data has, e.g. '# h k l I sigI'
        const fromComment = latin1.decode(b.subarray(commentStart, commentEnd)).trim().split(delim === DELIM_SPACE ? /\s+/ : String.fromCharCode(delim)).map((x) => x.trim());
        if (fromComment.length === count && typeof planTextColumns(fromComment) !== 'string') {
          headerNames = fromComment;
          meta.warnings.push(`column names taken from the comment on line ${commentLine}: ${fromComment.join(' ')}`);
        }
      }
      if (!headerNames)
        return fail('no header row naming the columns', { file, line, column: 1 }, 'Add a first line such as "h k l I sigI", or give --columns h,k,l,i,sigi.');
      const plan = planTextColumns(headerNames);
      if (typeof plan === 'string')
        return opts.columns
          ? fail(plan, { file: '--columns' })
          : fail(plan, { file, line, column: 1 }, 'The first line must name the columns (e.g. "h k l I sigI"), or give --columns h,k,l,i,sigi.');
      roles = plan.roles;
      needed = roles.length;
      while (needed > 0 && roles[needed - 1] === 0) needed--;
      meta.origin = plan.origin;
      sink = new RowSink(meta, plan.origin === 'amplitude', Math.max(1024, ((n - pos) / 24) | 0), plan.hasSigma);
      if (!numeric) continue; // that line was the header
    }
    const count = splitFields(b, s, e, delim, starts, ends);
    if (count < needed) { sink!.reject(line, REJECT_TOO_FEW); continue; }
    if (!opts.columns && count > roles.length) { sink!.reject(line, REJECT_TOO_MANY); continue; }
    for (let j = 0; j < needed; j++) if (roles[j] !== 0) sink!.field(roles[j], b, starts[j], ends[j]);
    sink!.endRow(line);
  }
  if (!sink) return fail('the file has no data lines', { file });
  meta.rowsInFile = sink.rows;
  if (meta.origin === 'amplitude')
    meta.warnings.push(AMPLITUDE_WARNING);
  if (opts.cell) {
    const r = makeCell(opts.cell, { file: '--cell' });
    if (!r.ok) return r;
    meta.cell = { ...opts.cell };
  }
  return ok(sink.finish());
}
