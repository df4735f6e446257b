/**
 * Errors are values at the core: readers and parsers return an `InputError`
 * (what is wrong and where) instead of throwing. The CLI turns one into exit
 * code 2 and an `error:` line; the app shows it in the page.
 */
export interface InputLocation {
  /** File name or a label such as `--cell` or `<stdin>`. */
  readonly file?: string;
  /** 1-based line number. */
  readonly line?: number;
  /** 1-based column number. */
  readonly column?: number;
}

export class InputError extends Error {
  readonly location: InputLocation;
  /** What the user can do about it (optional, one sentence). */
  readonly hint?: string;
  constructor(message: string, location: InputLocation = {}, hint?: string) {
    super(clipMessage(message));
    this.name = 'InputError';
    this.location = location;
    this.hint = hint;
  }
  /** `file:line:column: message (hint)` — the form the CLI prints after `error: `. */
  describe(): string {
    const { file, line, column } = this.location;
    let where = '';
    if (file !== undefined) where += file;
    if (line !== undefined) where += (where ? ':' : 'line ') + line;
    if (column !== undefined && line !== undefined) where += ':' + column;
    const text = where ? `${where}: ${this.message}` : this.message;
    return this.hint ? `${text}. ${this.hint}` : text;
  }
}

/** Longest run of non-blank characters a message repeats from the file, and longest message. */
const MAX_WORD = 80;
const MAX_MESSAGE = 600;

/**
 * Messages quote the user's text (a token, a header, block names); a damaged file
 * can make that text megabytes long. Long words keep their start and say how long
 * they were, and a long message keeps its start and end, so an error stays one
 * readable line.
 */
export function clipMessage(message: string): string {
  // a plain scan: a regular expression over a megabyte-long word can exhaust the stack
  const blank = (c: number) => c === 32 || c === 9 || c === 10 || c === 13;
  let m = '';
  for (let j = 0, n = message.length; j < n;) {
    let k = j;
    while (k < n && !blank(message.charCodeAt(k))) k++;
    m += k - j > MAX_WORD ? `${message.slice(j, j + MAX_WORD - 20)}...(${k - j} characters)` : message.slice(j, k);
    j = k;
    while (k < n && blank(message.charCodeAt(k))) k++;
    m += message.slice(j, k);
    j = k;
  }
  if (m.length > MAX_MESSAGE) m = `${m.slice(0, MAX_MESSAGE - 100)} ... ${m.slice(-80)}`;
  return m;
}

export function isInputError(e: unknown): e is InputError {
  return e instanceof InputError;
}

export type Result<T> = { ok: true; value: T } | { ok: false; error: InputError };

export function ok<T>(value: T): Result<T> {
  return { ok: true, value };
}
export function fail<T = never>(message: string, location: InputLocation = {}, hint?: string): Result<T> {
  return { ok: false, error: new InputError(message, location, hint) };
}
