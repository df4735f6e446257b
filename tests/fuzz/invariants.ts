import { InputError, type ReflectionTable, type Result } from '../../src/core';
import { detectReflectionFormat } from '../../src/io';

/**
 * What every reader result must satisfy, whatever the input: either a table
 * whose rows all passed the checks and whose counts add up (accepted + rejected
 * = rows in the file), or an InputError that names the file (and, when it gives
 * a line or column, a sensible one). Returns the problems found (empty = fine).
 */
export function checkErrorValue(e: unknown, files: readonly string[]): string[] {
  const p: string[] = [];
  if (!(e instanceof InputError)) return [`error is not an InputError: ${String(e)}`];
  // the user's own text is quoted in messages; outside quotes, these words mean a slip in the code
  const own = e.message.replace(/'[^']*'/g, "''");
  if (!e.message || /\bundefined\b|\[object /.test(own)) p.push(`vague message: '${e.message}'`);
  const { file, line, column } = e.location;
  if (file === undefined || !files.includes(file)) p.push(`error does not name the file: ${JSON.stringify(e.location)} '${e.message}'`);
  if (line !== undefined && !(Number.isInteger(line) && line >= 1)) p.push(`bad line ${line}`);
  if (column !== undefined && !(Number.isInteger(column) && column >= 1)) p.push(`bad column ${column}`);
  return p;
}

export function checkTable(t: ReflectionTable): string[] {
  const p: string[] = [];
  const m = t.meta;
  if (t.n + m.rejectedCount !== m.rowsInFile) p.push(`accepted ${t.n} + rejected ${m.rejectedCount} != rows ${m.rowsInFile}`);
  const byReason = Object.values(m.rejectedByReason).reduce((s, x) => s + x, 0);
  if (byReason !== m.rejectedCount) p.push(`reasons add up to ${byReason}, rejected ${m.rejectedCount}`);
  if (m.rejectedExamples.some((x) => !(Number.isInteger(x.line) && x.line >= 1) || !x.reason)) p.push('a rejected example without line or reason');
  for (const c of [t.h, t.k, t.l, t.i, t.sigma]) if (c.length !== t.n) p.push(`column length ${c.length} != n ${t.n}`);
  for (let j = 0; j < t.n && p.length < 5; j++) {
    if (t.h[j] === 0 && t.k[j] === 0 && t.l[j] === 0) p.push(`row ${j}: index 0 0 0 accepted`);
    if (!Number.isFinite(t.i[j])) p.push(`row ${j}: intensity ${t.i[j]} accepted`);
    if (!(t.sigma[j] > 0) || !Number.isFinite(t.sigma[j])) p.push(`row ${j}: sigma ${t.sigma[j]} accepted`);
  }
  if (m.cell) {
    const c = m.cell;
    if (![c.a, c.b, c.c, c.alpha, c.beta, c.gamma].every(Number.isFinite) || c.a <= 0 || c.b <= 0 || c.c <= 0) p.push(`impossible cell kept: ${JSON.stringify(c)}`);
  }
  return p;
}

/**
 * Rows of a delimited-text file counted independently of the reader: lines with
 * content that are not comments, less the header line.
 */
export function textDataLines(bytes: Uint8Array): number {
  let start = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  let lines = 0;
  while (start <= bytes.length) {
    let end = bytes.indexOf(10, start);
    if (end < 0) end = bytes.length;
    let s = start, e = end;
    while (s < e && (bytes[s] === 32 || bytes[s] === 9 || bytes[s] === 13)) s++;
    while (e > s && (bytes[e - 1] === 32 || bytes[e - 1] === 9 || bytes[e - 1] === 13)) e--;
    if (s < e && bytes[s] !== 35) lines++;
    start = end + 1;
  }
  return lines;
}

export function checkRead(bytes: Uint8Array, r: Result<ReflectionTable>, source: string, headerRow = true, otherPlaces: readonly string[] = []): string[] {
  if (!r.ok) return checkErrorValue(r.error, [source, ...otherPlaces]);
  const p = checkTable(r.value);
  if (r.value.meta.source !== source) p.push(`meta.source ${r.value.meta.source}`);
  if (detectReflectionFormat(bytes) === 'text') {
    const expected = textDataLines(bytes) - (headerRow ? 1 : 0);
    if (r.value.meta.rowsInFile !== expected) p.push(`text file: ${r.value.meta.rowsInFile} rows counted, ${expected} data lines in the file`);
  }
  return p;
}
