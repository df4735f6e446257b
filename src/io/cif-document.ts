import { fail, ok, type Result } from '../core';
import { parseCifNumber, type CifNumber } from './cif-number';

/**
 * A generic CIF 1.1 reader (IUCr CIF 1.1 specification, "syntax"): data blocks,
 * save frames, items, loops, comments, single- and double-quoted strings,
 * semicolon text fields, the special values `?` (unknown) and `.` (inapplicable),
 * tags compared case-insensitively. It builds small objects per value, which is
 * right for structure models and headers; reflection loops with a million rows
 * go through the byte-level reader in reflection-reader.ts instead.
 */

/** How a value was written: quoting matters for `?`/`.` and for numbers. */
export type CifValueKind = 'plain' | 'quoted' | 'text' | 'unknown' | 'inapplicable';

export interface CifValue {
  /** The value without quotes or semicolons. For `?` and `.` the text is that character. */
  readonly text: string;
  readonly kind: CifValueKind;
  /** 1-based line and column where the value starts. */
  readonly line: number;
  readonly column: number;
}

export interface CifItem {
  /** The tag as written (case kept). */
  readonly tag: string;
  readonly value: CifValue;
  readonly line: number;
}

export class CifLoop {
  /** Tags as written, in column order. */
  readonly tags: string[] = [];
  /** Rows of values, one entry per tag. */
  readonly rows: CifValue[][] = [];
  constructor(readonly line: number) {}
  /** Column index of a tag (case-insensitive), or -1. */
  indexOf(tag: string): number {
    const t = tag.toLowerCase();
    return this.tags.findIndex((x) => x.toLowerCase() === t);
  }
  findColumn(tag: string): CifValue[] | undefined {
    const j = this.indexOf(tag);
    return j < 0 ? undefined : this.rows.map((r) => r[j]);
  }
}

export class CifBlock {
  /** Single-valued items in file order. */
  readonly items: CifItem[] = [];
  readonly loops: CifLoop[] = [];
  /** Save frames (dictionaries use them); each is a block of its own. */
  readonly frames: CifBlock[] = [];
  private readonly index = new Map<string, { item?: CifItem; loop?: CifLoop }>();
  constructor(readonly name: string, readonly line: number) {}

  /** True when the tag occurs as an item or in a loop (case-insensitive). */
  has(tag: string): boolean {
    return this.index.has(tag.toLowerCase());
  }
  /** The value of a single-valued item (or of a one-row loop column). */
  find(tag: string): CifValue | undefined {
    const e = this.index.get(tag.toLowerCase());
    if (!e) return undefined;
    if (e.item) return e.item.value;
    const loop = e.loop!;
    return loop.rows.length === 1 ? loop.rows[0][loop.indexOf(tag)] : undefined;
  }
  /** The value text, or undefined when absent, `?` or `.`. */
  findText(tag: string): string | undefined {
    const v = this.find(tag);
    return v === undefined || isMissingValue(v) ? undefined : v.text;
  }
  /** The numeric value (with su), or undefined when absent, missing or not a number. */
  findNumber(tag: string): CifNumber | undefined {
    const v = this.find(tag);
    return v === undefined || v.kind !== 'plain' ? undefined : parseCifNumber(v.text);
  }
  /** The loop that holds this tag. */
  findLoop(tag: string): CifLoop | undefined {
    return this.index.get(tag.toLowerCase())?.loop;
  }
  /** All values of a tag: the loop column, or a one-element array for a single item. */
  findColumn(tag: string): CifValue[] | undefined {
    const e = this.index.get(tag.toLowerCase());
    if (!e) return undefined;
    return e.item ? [e.item.value] : e.loop!.findColumn(tag);
  }
  /** Tags in this block, lower-case. */
  tags(): string[] {
    return [...this.index.keys()];
  }
  /** @internal used by the parser; false when the tag already exists. */
  register(tag: string, entry: { item?: CifItem; loop?: CifLoop }): boolean {
    const key = tag.toLowerCase();
    if (this.index.has(key)) return false;
    this.index.set(key, entry);
    return true;
  }
}

export interface CifDocument {
  readonly source: string;
  readonly blocks: CifBlock[];
}

/** The block with this name (case-insensitive, without `data_`). */
export function findCifBlock(doc: CifDocument, name: string): CifBlock | undefined {
  const n = name.toLowerCase();
  return doc.blocks.find((b) => b.name.toLowerCase() === n);
}

export function isMissingValue(v: CifValue): boolean {
  return v.kind === 'unknown' || v.kind === 'inapplicable';
}

/** The number in a value (`0.1234(5)` gives value and su); undefined for quoted text, `?`, `.`. */
export function cifValueNumber(v: CifValue): CifNumber | undefined {
  return v.kind === 'plain' ? parseCifNumber(v.text) : undefined;
}

// ---------------------------------------------------------------- tokenizer

const enum Tok { End, Tag, Value, Data, Loop, Save, Global, Stop }

interface Token {
  kind: Tok;
  text: string;
  valueKind: CifValueKind;
  line: number;
  column: number;
}

function isSpace(c: number): boolean {
  return c === 32 || c === 9 || c === 10 || c === 13;
}

class CifTokenizer {
  private pos = 0;
  private line = 1;
  private lineStart = 0;
  error?: { message: string; line: number; column: number };
  constructor(private readonly s: string) {}

  /** Next token, or undefined with `error` set. */
  next(): Token | undefined {
    const s = this.s;
    const n = s.length;
    // skip whitespace and comments
    for (;;) {
      if (this.pos >= n) return { kind: Tok.End, text: '', valueKind: 'plain', line: this.line, column: this.pos - this.lineStart + 1 };
      const c = s.charCodeAt(this.pos);
      if (c === 10) { this.pos++; this.line++; this.lineStart = this.pos; continue; }
      if (c === 13) {
        this.pos++;
        if (s.charCodeAt(this.pos) === 10) this.pos++;
        this.line++; this.lineStart = this.pos;
        continue;
      }
      if (c === 32 || c === 9) { this.pos++; continue; }
      if (c === 35 /* # */) {
        while (this.pos < n && s.charCodeAt(this.pos) !== 10 && s.charCodeAt(this.pos) !== 13) this.pos++;
        continue;
      }
      break;
    }
    const start = this.pos;
    const line = this.line;
    const column = start - this.lineStart + 1;
    const c = s.charCodeAt(start);
    if (c === 59 /* ; */ && start === this.lineStart) return this.textField(line, column);
    if (c === 39 || c === 34) return this.quoted(c, line, column);
    let end = start;
    while (end < n && !isSpace(s.charCodeAt(end))) end++;
    this.pos = end;
    const text = s.slice(start, end);
    if (c === 95 /* _ */) return { kind: Tok.Tag, text, valueKind: 'plain', line, column };
    const lower = text.length >= 5 ? text.slice(0, 7).toLowerCase() : '';
    if (lower.startsWith('data_')) return { kind: Tok.Data, text: text.slice(5), valueKind: 'plain', line, column };
    if (lower.startsWith('save_')) return { kind: Tok.Save, text: text.slice(5), valueKind: 'plain', line, column };
    if (lower === 'loop_') return { kind: Tok.Loop, text, valueKind: 'plain', line, column };
    if (lower === 'global_') return { kind: Tok.Global, text, valueKind: 'plain', line, column };
    if (lower === 'stop_') return { kind: Tok.Stop, text, valueKind: 'plain', line, column };
    const valueKind: CifValueKind = text === '?' ? 'unknown' : text === '.' ? 'inapplicable' : 'plain';
    return { kind: Tok.Value, text, valueKind, line, column };
  }

  /** 'quoted string': ends at the matching quote followed by whitespace or end of input. */
  private quoted(q: number, line: number, column: number): Token | undefined {
    const s = this.s;
    let j = this.pos + 1;
    for (;;) {
      if (j >= s.length || s.charCodeAt(j) === 10 || s.charCodeAt(j) === 13) {
        this.error = { message: `unterminated quoted string (a ${String.fromCharCode(q)} string must close on the same line)`, line, column };
        return undefined;
      }
      if (s.charCodeAt(j) === q && (j + 1 >= s.length || isSpace(s.charCodeAt(j + 1)))) break;
      j++;
    }
    const text = s.slice(this.pos + 1, j);
    this.pos = j + 1;
    return { kind: Tok.Value, text, valueKind: 'quoted', line, column };
  }

  /** Semicolon text field: from `;` at line start to the next line that starts with `;`. */
  private textField(line: number, column: number): Token | undefined {
    const s = this.s;
    const contentStart = this.pos + 1;
    let j = contentStart;
    for (;;) {
      const nl = s.indexOf('\n', j);
      if (nl < 0) {
        this.error = { message: 'unterminated text field (no line starting with ";" closes it)', line, column };
        return undefined;
      }
      this.line++;
      this.lineStart = nl + 1;
      if (s.charCodeAt(nl + 1) === 59) {
        let end = nl;
        if (end > contentStart && s.charCodeAt(end - 1) === 13) end--;
        let text = s.slice(contentStart, end);
        // A line break right after the opening ';' is layout, not content (common practice, made a rule in CIF 2.0).
        if (text.startsWith('\r\n')) text = text.slice(2);
        else if (text.startsWith('\n')) text = text.slice(1);
        if (text.includes('\r')) text = text.replace(/\r\n?/g, '\n');
        this.pos = nl + 2;
        return { kind: Tok.Value, text, valueKind: 'text', line, column };
      }
      j = nl + 1;
    }
  }
}

// ---------------------------------------------------------------- parser

/**
 * Parse a CIF 1.1 document. Errors name the source, line and column.
 * Every data item must sit in a data block; tags are unique within a block.
 */
export function parseCifDocument(text: string, source: string): Result<CifDocument> {
  const tz = new CifTokenizer(text);
  const blocks: CifBlock[] = [];
  const doc: CifDocument = { source, blocks };
  let block: CifBlock | undefined;
  let frame: CifBlock | undefined;
  const err = (message: string, line: number, column?: number, hint?: string): Result<CifDocument> =>
    fail(message, { file: source, line, column }, hint);
  const tokenError = () => err(tz.error!.message, tz.error!.line, tz.error!.column);

  let tok = tz.next();
  for (;;) {
    if (!tok) return tokenError();
    switch (tok.kind) {
      case Tok.End:
        if (frame) return err(`save frame 'save_${frame.name}' is not closed by 'save_'`, frame.line);
        return ok(doc);
      case Tok.Data: {
        if (frame) return err(`save frame 'save_${frame.name}' is not closed before a new data block`, tok.line, tok.column);
        if (tok.text === '') return err('data block header without a name (write data_NAME)', tok.line, tok.column);
        if (blocks.some((b) => b.name.toLowerCase() === tok!.text.toLowerCase()))
          return err(`data block name 'data_${tok.text}' is used twice`, tok.line, tok.column);
        block = new CifBlock(tok.text, tok.line);
        blocks.push(block);
        tok = tz.next();
        break;
      }
      case Tok.Save: {
        if (!block) return err('save frame outside a data block', tok.line, tok.column);
        if (tok.text === '') {
          if (!frame) return err("'save_' closes a save frame, but none is open", tok.line, tok.column);
          frame = undefined;
        } else {
          if (frame) return err(`save frame 'save_${tok.text}' starts inside 'save_${frame.name}'`, tok.line, tok.column);
          frame = new CifBlock(tok.text, tok.line);
          block.frames.push(frame);
        }
        tok = tz.next();
        break;
      }
      case Tok.Global:
      case Tok.Stop:
        return err(`'${tok.text}' is a reserved word in CIF 1.1 and cannot be used here`, tok.line, tok.column, 'Quote it if it is a value.');
      case Tok.Value:
        return err(`value '${tok.text}' without a tag`, tok.line, tok.column, 'Every value follows its _tag, or sits in a loop_.');
      case Tok.Tag: {
        const target = frame ?? block;
        if (!target) return err(`data item '${tok.text}' before any data_ block header`, tok.line, tok.column);
        const tag = tok;
        const v = tz.next();
        if (!v) return tokenError();
        if (v.kind !== Tok.Value) {
          const reserved = v.kind === Tok.Global || v.kind === Tok.Stop;
          return err(`tag '${tag.text}' has no value${reserved ? ` ('${v.text}' is a reserved word)` : ''}`, tag.line, tag.column,
            v.kind === Tok.End ? 'The file ends here.' : reserved ? 'Quote it if it is a value.' : undefined);
        }
        const item: CifItem = { tag: tag.text, value: { text: v.text, kind: v.valueKind, line: v.line, column: v.column }, line: tag.line };
        if (!target.register(tag.text, { item })) return err(`tag '${tag.text}' occurs twice in data block '${target.name}'`, tag.line, tag.column);
        target.items.push(item);
        tok = tz.next();
        break;
      }
      case Tok.Loop: {
        const target = frame ?? block;
        if (!target) return err("'loop_' before any data_ block header", tok.line, tok.column);
        const loop = new CifLoop(tok.line);
        const loopTok = tok;
        tok = tz.next();
        while (tok && tok.kind === Tok.Tag) {
          if (!target.register(tok.text, { loop })) return err(`tag '${tok.text}' occurs twice in data block '${target.name}'`, tok.line, tok.column);
          loop.tags.push(tok.text);
          tok = tz.next();
        }
        if (!tok) return tokenError();
        if (loop.tags.length === 0) return err("'loop_' without tags", loopTok.line, loopTok.column);
        const w = loop.tags.length;
        let row: CifValue[] = [];
        let last = loopTok;
        while (tok && tok.kind === Tok.Value) {
          row.push({ text: tok.text, kind: tok.valueKind, line: tok.line, column: tok.column });
          if (row.length === w) { loop.rows.push(row); row = []; }
          last = tok;
          tok = tz.next();
        }
        if (!tok) return tokenError();
        if (row.length !== 0) {
          const total = loop.rows.length * w + row.length;
          return err(`loop starting at line ${loopTok.line} has ${total} values for ${w} tags: the last row is incomplete`, last.line, last.column,
            'Each row needs one value per tag; a value with spaces must be quoted.');
        }
        target.loops.push(loop);
        break;
      }
    }
  }
}
