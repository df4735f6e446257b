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
    super(message);
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
