import { emptyMeta, fail, ok, type CellParams, type ReflectionTable, type Result } from '../core';
import { makeCell } from '../lattice';
import { parseCifNumber } from './cif-number';
import { isReflectionLoop, normaliseTag, planCifColumns } from './reflection-columns';
import { AMPLITUDE_WARNING, RowSink } from './row-sink';
import { numberScan, scanByteNumber } from './byte-number';
import type { ReadReflectionsOptions } from './read-options';

/**
 * CIF 1.1 / mmCIF reflection reader working on byte offsets: one pass over the
 * bytes, no string per token; only tags, block names and the few header items
 * become strings. Rows of the reflection loop go straight into typed columns.
 * Same syntax rules as parseCifDocument (cif-document.ts).
 */

const T_END = 0, T_TAG = 1, T_VALUE = 2, T_DATA = 3, T_LOOP = 4, T_SAVE = 5, T_RESERVED = 6, T_ERROR = 7;
const V_PLAIN = 0, V_QUOTED = 1, V_TEXT = 2, V_MISSING = 3;

const utf8 = new TextDecoder();
const POW10 = new Float64Array(23);
for (let j = 0, p = 1; j < 23; j++, p *= 10) POW10[j] = p;

function isBlank(c: number): boolean {
  return c === 32 || c === 9 || c === 10 || c === 13;
}

/** Does bytes[start, end) start with `word` (lower-case ASCII), ignoring case? */
function startsWithWord(b: Uint8Array, start: number, end: number, word: string): boolean {
  if (end - start < word.length) return false;
  for (let j = 0; j < word.length; j++) if ((b[start + j] | 32) !== word.charCodeAt(j) && b[start + j] !== word.charCodeAt(j)) return false;
  return true;
}

/** Reserved-word kind of a plain token, or T_VALUE. */
function wordKind(b: Uint8Array, start: number, end: number): number {
  const c = b[start] | 32;
  if (c === 100 /* d */ && startsWithWord(b, start, end, 'data_')) return T_DATA;
  if (c === 108 /* l */ && end - start === 5 && startsWithWord(b, start, end, 'loop_')) return T_LOOP;
  if (c === 115 /* s */ && startsWithWord(b, start, end, 'save_')) return T_SAVE;
  if (c === 115 && end - start === 5 && startsWithWord(b, start, end, 'stop_')) return T_RESERVED;
  if (c === 103 /* g */ && end - start === 7 && startsWithWord(b, start, end, 'global_')) return T_RESERVED;
  return T_VALUE;
}

export class ByteCifScanner {
  pos: number;
  line = 1;
  lineStart: number;
  kind = T_END;
  vkind = V_PLAIN;
  start = 0;
  end = 0;
  tline = 1;
  tcol = 1;
  error = '';
  constructor(readonly b: Uint8Array, start: number) {
    this.pos = start;
    this.lineStart = start;
  }
  text(): string {
    return utf8.decode(this.b.subarray(this.start, this.end));
  }
  private prevPos = 0;
  private prevLine = 1;
  private prevLineStart = 0;
  /** Step back to just before the last token read by next(). */
  rewind(): void {
    this.pos = this.prevPos; this.line = this.prevLine; this.lineStart = this.prevLineStart;
  }
  next(): number {
    const b = this.b, n = b.length;
    this.prevPos = this.pos; this.prevLine = this.line; this.prevLineStart = this.lineStart;
    let pos = this.pos;
    for (;;) {
      if (pos >= n) { this.pos = pos; this.tline = this.line; this.tcol = pos - this.lineStart + 1; return (this.kind = T_END); }
      const c = b[pos];
      if (c === 10) { pos++; this.line++; this.lineStart = pos; }
      else if (c === 13) { pos++; if (b[pos] !== 10) { this.line++; this.lineStart = pos; } }
      else if (c === 32 || c === 9) pos++;
      else if (c === 35) { while (pos < n && b[pos] !== 10 && b[pos] !== 13) pos++; }
      else break;
    }
    this.tline = this.line;
    this.tcol = pos - this.lineStart + 1;
    const c = b[pos];
    if (c === 39 || c === 34) {
      let j = pos + 1;
      for (;;) {
        if (j >= n || b[j] === 10 || b[j] === 13) {
          this.error = `unterminated quoted string (a ${String.fromCharCode(c)} string must close on the same line)`;
          this.pos = pos;
          return (this.kind = T_ERROR);
        }
        if (b[j] === c && (j + 1 >= n || isBlank(b[j + 1]))) break;
        j++;
      }
      this.start = pos + 1; this.end = j; this.pos = j + 1; this.vkind = V_QUOTED;
      return (this.kind = T_VALUE);
    }
    if (c === 59 && pos === this.lineStart) {
      let j = pos + 1;
      let contentStart = j;
      if (b[j] === 13 && b[j + 1] === 10) contentStart = j + 2;
      else if (b[j] === 10) contentStart = j + 1;
      for (;;) {
        const nl = b.indexOf(10, j);
        if (nl < 0) {
          this.error = 'unterminated text field (no line starting with ";" closes it)';
          this.pos = pos;
          return (this.kind = T_ERROR);
        }
        this.line++;
        this.lineStart = nl + 1;
        if (b[nl + 1] === 59) {
          let end = nl;
          if (end > contentStart && b[end - 1] === 13) end--;
          this.start = contentStart; this.end = Math.max(contentStart, end); this.pos = nl + 2; this.vkind = V_TEXT;
          return (this.kind = T_VALUE);
        }
        j = nl + 1;
      }
    }
    const start = pos;
    while (pos < n && !isBlank(b[pos])) pos++;
    this.start = start; this.end = pos; this.pos = pos;
    if (c === 95) return (this.kind = T_TAG);
    const k = wordKind(b, start, pos);
    this.vkind = pos - start === 1 && (c === 63 || c === 46) ? V_MISSING : V_PLAIN;
    return (this.kind = k);
  }
}

interface ItemRef { start: number; end: number; vkind: number; line: number }
/** A data block as the scan meets it; name and header map are made only when asked for (files can hold a million tiny blocks). */
class BlockInfo {
  private decoded?: string;
  private map?: Map<string, ItemRef>;
  reflectionLoops = 0;
  constructor(private readonly bytes: Uint8Array, private readonly nameStart: number, private readonly nameEnd: number, readonly line: number) {}
  get name(): string {
    return (this.decoded ??= utf8.decode(this.bytes.subarray(this.nameStart, this.nameEnd)));
  }
  get items(): Map<string, ItemRef> {
    return (this.map ??= new Map());
  }
}

const CELL_TAGS = ['_cell_length_a', '_cell_length_b', '_cell_length_c', '_cell_angle_alpha', '_cell_angle_beta', '_cell_angle_gamma'] as const;
const WAVELENGTH_TAGS = ['_diffrn_radiation_wavelength', '_diffrn_radiation_wavelength_wavelength', '_diffrn_source_pdbx_wavelength'];
const HEADER_TAGS = new Set<string>([...CELL_TAGS, ...WAVELENGTH_TAGS]);

/**
 * Read the rows of a reflection loop. On entry the scanner stands after the
 * last tag; on return it stands at the first token after the loop.
 * Returns an error message, or '' when fine.
 */
function readLoopRows(sc: ByteCifScanner, w: number, roles: Int8Array, sink: RowSink): string {
  const b = sc.b, n = b.length;
  let pos = sc.pos, line = sc.line, lineStart = sc.lineStart;
  let col = 0, rowLine = 0, lastLine = line, lastCol = 1;
  // rows normally sit one per line; the first row that does not (after rows that did)
  // is where a value went missing or an extra one crept in
  let prevEnd = -1, rowsDone = 0, badLine = 0;
  for (;;) {
    let c = 0;
    while (pos < n) {
      c = b[pos];
      if (c === 10) { pos++; line++; lineStart = pos; }
      else if (c === 32 || c === 9) pos++;
      else if (c === 13) { pos++; if (b[pos] !== 10) { line++; lineStart = pos; } }
      else if (c === 35) { while (pos < n && b[pos] !== 10 && b[pos] !== 13) pos++; }
      else break;
    }
    if (pos >= n || c === 95 /* _ tag */) break;
    if (c < 32) {
      // control bytes end no token: without this check they would stall the scan
      sc.pos = pos; sc.line = line; sc.lineStart = lineStart; sc.tline = line; sc.tcol = pos - lineStart + 1;
      return `the reflection loop holds the control byte 0x${c.toString(16).padStart(2, '0')}, which no text file has: the file may be damaged (a zero-filled or binary tail); copy or export it again`;
    }
    const tokLine = line;
    const role = roles[col];
    if (c === 39 || c === 34 || (c === 59 && pos === lineStart)) {
      sc.pos = pos; sc.line = line; sc.lineStart = lineStart;
      if (sc.next() === T_ERROR) return sc.error;
      if (col === 0) rowLine = sc.tline;
      lastLine = sc.tline; lastCol = sc.tcol;
      pos = sc.pos; line = sc.line; lineStart = sc.lineStart;
      // a quoted '?' or '.' is text, not a missing value
      if (role !== 0) {
        if (sc.end - sc.start === 1 && (b[sc.start] === 63 || b[sc.start] === 46)) sink.badField();
        else sink.field(role, b, sc.start, sc.end);
      }
    } else {
      if (col === 0) rowLine = tokLine;
      lastLine = tokLine; lastCol = pos - lineStart + 1;
      if (role !== 0 && c >= 43 && c <= 57 && !(c === 46 && (pos + 1 >= n || b[pos + 1] <= 32))) {
        // numbers: parse while scanning, one pass (+ , - . / and digits start here)
        // inline fast path: [-]digits[.digits] then a blank
        let j = pos, neg = false;
        if (c === 45) { neg = true; j++; }
        let mant = 0, digits = 0, frac = -1, d = 0;
        while (j < n) {
          d = b[j];
          if (d >= 48 && d <= 57) { mant = mant * 10 + (d - 48); digits++; if (frac >= 0) frac++; j++; }
          else if (d === 46 && frac < 0) { frac = 0; j++; }
          else break;
        }
        if (digits > 0 && digits <= 15 && (j >= n || d <= 32) && c !== 43) {
          const v = frac <= 0 ? mant : mant / POW10[frac];
          pos = j;
          sink.fastField(role, neg ? -v : v);
        } else {
          const x = scanByteNumber(b, pos, n);
          pos = numberScan.end;
          sink.numberField(role, x);
        }
      } else {
        const start = pos;
        while (pos < n && b[pos] > 32) pos++;
        if ((c | 32) >= 100 && wordKind(b, start, pos) !== T_VALUE) { pos = start; break; }
        if (role !== 0) sink.field(role, b, start, pos);
      }
    }
    if (++col === w) {
      sink.endRow(rowLine);
      col = 0;
      if (badLine === 0 && (lastLine !== rowLine || rowLine === prevEnd)) badLine = rowsDone > 1 ? rowLine : -1; // two rows set the layout
      prevEnd = lastLine;
      rowsDone++;
    }
  }
  sc.pos = pos; sc.line = line; sc.lineStart = lineStart;
  if (col !== 0) {
    if (badLine > 0) {
      sc.tline = badLine; sc.tcol = 1;
      return `the values of the reflection loop do not fill whole rows of ${w}: the rows stop lining up here (a value is missing or extra on this line, or a value with spaces lacks its quotes); write ? for an unknown value`;
    }
    sc.tline = lastLine; sc.tcol = lastCol;
    if (pos >= n && rowLine !== prevEnd)
      return `the last row of the reflection loop has ${col} values for ${w} tags: the file ends in the middle of a row and looks cut off; copy or export it again`;
    return `the last row of the reflection loop has ${col} values for ${w} tags`;
  }
  if (badLine > 0)
    sink.meta.warnings.push(`the rows of the reflection loop stop sitting one per line at line ${badLine}; check that no value is missing or extra there (the columns after it may be shifted)`);
  return '';
}

/** Values of a loop we do not read; the first row's header items (cell, wavelength) are kept. */
function skipLoopRows(sc: ByteCifScanner, tags: readonly string[], block: BlockInfo | undefined): string {
  const w = tags.length;
  let count = 0, lastLine = sc.line, lastCol = 1;
  while (sc.next() === T_VALUE) {
    lastLine = sc.tline; lastCol = sc.tcol;
    const tag = tags[count % w];
    if (count < w && block && HEADER_TAGS.has(tag) && !block.items.has(tag))
      block.items.set(tag, { start: sc.start, end: sc.end, vkind: sc.vkind, line: sc.tline });
    count++;
  }
  if (sc.kind === T_ERROR) return sc.error;
  if (count % w !== 0) {
    sc.tline = lastLine; sc.tcol = lastCol;
    return `loop has ${count} values for ${w} tags: the last row is incomplete`;
  }
  sc.rewind();
  return '';
}

function itemNumber(b: Uint8Array, ref: ItemRef | undefined): number | undefined {
  if (!ref || ref.vkind === V_MISSING) return undefined;
  return parseCifNumber(utf8.decode(b.subarray(ref.start, ref.end)))?.value;
}

function sameCell(x: CellParams, y: CellParams): boolean {
  return (['a', 'b', 'c', 'alpha', 'beta', 'gamma'] as const).every((p) => Math.abs(x[p] - y[p]) <= 1e-4 * Math.max(1, Math.abs(y[p])));
}

export function readCifReflections(bytes: Uint8Array, start: number, opts: ReadReflectionsOptions): Result<ReflectionTable> {
  const file = opts.source;
  const sc = new ByteCifScanner(bytes, start);
  const blocks: BlockInfo[] = [];
  let cur: BlockInfo | undefined;
  let inFrame = false;
  let chosen: BlockInfo | undefined;
  let sink: RowSink | undefined;
  let unmerged = false;
  let atomSites = false; // a structure model given where reflections were expected
  const wantBlock = opts.block?.toLowerCase();
  const wantColumns = opts.columns?.map(normaliseTag);
  const meta = emptyMeta(file);
  const err = (message: string, line = sc.tline, column: number | undefined = sc.tcol, hint?: string) =>
    fail<ReflectionTable>(message, { file, line, column }, hint);

  let kind = sc.next();
  for (;;) {
    if (kind === T_END) break;
    if (kind === T_ERROR) return err(sc.error);
    if (kind === T_DATA) {
      if (sc.end - sc.start === 5) return err('data block header without a name (write data_NAME)');
      // done: the chosen block was named and is complete
      if (chosen && wantBlock !== undefined) break;
      cur = new BlockInfo(bytes, sc.start + 5, sc.end, sc.tline);
      blocks.push(cur);
      inFrame = false;
      kind = sc.next();
      continue;
    }
    if (kind === T_SAVE) { inFrame = sc.end - sc.start > 5; kind = sc.next(); continue; }
    if (kind === T_RESERVED) return err(`'${sc.text()}' is a reserved word in CIF 1.1 and cannot be used here`, undefined, undefined, 'Quote it if it is a value.');
    if (kind === T_VALUE) return err(`value '${sc.text()}' without a tag`, undefined, undefined, 'Every value follows its _tag, or sits in a loop_.');
    if (kind === T_TAG) {
      const tagText = sc.text();
      const tag = normaliseTag(tagText);
      const tline = sc.tline, tcol = sc.tcol;
      if (!cur) return err(`data item '${tagText}' before any data_ block header`);
      const vk = sc.next();
      if (vk === T_ERROR) return err(sc.error);
      if (vk !== T_VALUE) return err(`tag '${tagText}' has no value`, tline, tcol);
      if (!inFrame && HEADER_TAGS.has(tag)) {
        if (cur.items.has(tag))
          return err(`tag '${tagText}' occurs twice in data block '${cur.name}' (first on line ${cur.items.get(tag)!.line})`, tline, tcol, 'CIF allows each tag once per data block; keep the right one.');
        cur.items.set(tag, { start: sc.start, end: sc.end, vkind: sc.vkind, line: sc.tline });
      }
      kind = sc.next();
      continue;
    }
    // T_LOOP
    const loopLine = sc.tline, loopCol = sc.tcol;
    if (!cur) return err("'loop_' before any data_ block header");
    const tags: string[] = [];
    const tagLines: number[] = [];
    while ((kind = sc.next()) === T_TAG) { tags.push(normaliseTag(sc.text())); tagLines.push(sc.tline); }
    if (kind === T_ERROR) return err(sc.error);
    if (tags.length === 0) return err("'loop_' without tags", loopLine, loopCol);
    sc.rewind();
    const isRefl = !inFrame && (wantColumns ? wantColumns.every((t) => tags.includes(t)) : isReflectionLoop(tags));
    if (!atomSites && tags.includes('_atom_site_fract_x')) atomSites = true;
    if (isRefl) cur.reflectionLoops++;
    if (isRefl && !chosen && (wantBlock === undefined || cur.name.toLowerCase() === wantBlock)) {
      const firstAt = new Map<string, number>(); // linear even for a loop with a million tags
      for (let j = 0; j < tags.length; j++) {
        const first = firstAt.get(tags[j]);
        if (first !== undefined)
          return err(`tag '${tags[j]}' appears twice in the reflection loop (lines ${tagLines[first]} and ${tagLines[j]})`, tagLines[j], 1, 'Each column of a loop needs its own tag; remove or rename one.');
        firstAt.set(tags[j], j);
      }
      const plan = planCifColumns(tags, opts.columns);
      if (typeof plan === 'string') return err(plan, loopLine, loopCol, 'Name the five columns to use with --columns h,k,l,value,sigma (tags of this loop).');
      chosen = cur;
      unmerged = plan.unmerged;
      meta.origin = plan.origin;
      sink = new RowSink(meta, plan.origin === 'amplitude', undefined, plan.hasSigma);
      const e = readLoopRows(sc, tags.length, plan.roles, sink);
      if (e) return err(e);
    } else {
      const e = skipLoopRows(sc, tags, cur);
      if (e) return err(e);
    }
    kind = sc.next();
  }

  if (!chosen || !sink) {
    const names = blocks.slice(0, 10).map((x) => x.name).join(', ') + (blocks.length > 10 ? `, ... (${blocks.length} blocks)` : '') || 'none';
    if (wantBlock !== undefined) {
      const named = blocks.find((x) => x.name.toLowerCase() === wantBlock);
      if (!named) return fail(`no data block named '${opts.block}' (blocks in the file: ${names})`, { file });
      return fail(`data block '${named.name}' has no reflection loop`, { file, line: named.line }, 'Reflections are read from a loop with _refln_index_h/_k/_l (or _refln.index_h ..., _diffrn_refln_index_h ...).');
    }
    if (wantColumns)
      return fail(`no loop holds all the tags given with --columns (${opts.columns!.join(', ')})`, { file },
        'For a CIF file, --columns names five tags of the reflection loop: h, k, l, value, sigma (e.g. _refln_index_h,_refln_index_k,_refln_index_l,_refln_F_squared_meas,_refln_F_squared_sigma).');
    if (atomSites)
      return fail(`no reflection loop found (data blocks: ${names}): this looks like a structure model (it has atom sites)`, { file },
        'Give a reflection file here; models go to lacuna sf, compare and simulate.');
    return fail(`no reflection loop found (data blocks: ${names})`, { file }, 'Reflections are read from a loop with _refln_index_h/_k/_l (or _refln.index_h ..., _diffrn_refln_index_h ...).');
  }

  meta.block = chosen.name;
  meta.unmerged = unmerged;
  meta.rowsInFile = sink.rows;
  const others = blocks.filter((x) => x !== chosen && x.reflectionLoops > 0);
  if (others.length)
    meta.warnings.push(`the file has ${others.length} more data block(s) with reflections (${others.slice(0, 10).map((x) => x.name).join(', ')}${others.length > 10 ? ', ...' : ''}); read '${chosen.name}'. Use --block NAME to choose another`);
  if (chosen.reflectionLoops > 1) meta.warnings.push(`data block '${chosen.name}' has ${chosen.reflectionLoops} reflection loops; read the first`);
  if (meta.origin === 'amplitude')
    meta.warnings.push(AMPLITUDE_WARNING);
  if (unmerged) meta.warnings.push('the rows are individual observations (unmerged, _diffrn_refln); symmetry-equivalent and repeated reflections are not averaged');

  // header items: wavelength and cell
  for (const t of WAVELENGTH_TAGS) {
    const wl = itemNumber(bytes, chosen.items.get(t));
    if (wl !== undefined) {
      if (wl > 0) meta.wavelength = wl;
      else meta.warnings.push(`wavelength ${wl} in the file is not positive; ignored`);
      break;
    }
  }
  const cellVals = CELL_TAGS.map((t) => itemNumber(bytes, chosen!.items.get(t)));
  const given = cellVals.filter((x) => x !== undefined).length;
  let fileCell: CellParams | undefined;
  if (given === 6) {
    const [a, b, c, alpha, beta, gamma] = cellVals as number[];
    fileCell = { a, b, c, alpha, beta, gamma };
    if (!opts.cell) {
      const r = makeCell(fileCell, { file, line: chosen.items.get(CELL_TAGS[0])!.line });
      if (!r.ok) return fail(`the cell in the file is impossible: ${r.error.message}`, r.error.location, 'Give the right one with --cell a,b,c,alpha,beta,gamma.');
      meta.cell = fileCell;
    }
  } else if (given > 0 && !opts.cell) {
    meta.warnings.push(`the file gives only ${given} of the 6 cell parameters; give the cell with --cell`);
  }
  if (opts.cell) {
    const r = makeCell(opts.cell, { file: '--cell' });
    if (!r.ok) return r;
    meta.cell = { ...opts.cell };
    if (fileCell && !sameCell(fileCell, opts.cell)) {
      const f = fileCell;
      meta.warnings.push(`--cell replaces the cell in the file (${f.a}, ${f.b}, ${f.c}, ${f.alpha}, ${f.beta}, ${f.gamma})`);
    }
  }
  return ok(sink.finish());
}
