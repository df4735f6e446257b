import { closeSync, openSync, readFileSync, readSync, statSync } from 'node:fs';
import { resolve } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { InputError, type ReflectionTable, type Result } from '../core';
import { isGzip, readReflections, type ReadReflectionsOptions } from '../io';
import { readReflectionsInChunks } from './stream-reflections';
import { parseCellText, type UnitCell } from '../lattice';
import type { OptionSpec, ParsedArgs } from './args';
import type { CliContext } from './context';

/**
 * Shared by every command that reads reflection data: file -> bytes (gunzipped
 * when the content is gzip, whatever the name) -> ReflectionTable, with the
 * --cell, --columns and --block options applied. Throws InputError, which the
 * dispatcher turns into `error: ...` and exit code 2.
 */

/** The options every data-reading command declares (spread into its CommandSpec.options). */
export const DATA_OPTIONS: readonly OptionSpec[] = [
  { name: 'cell', value: true, placeholder: 'a,b,c,al,be,ga', help: 'unit cell (angstrom, degrees); replaces the one in the file' },
  { name: 'columns', value: true, placeholder: 'h,k,l,i,sigi', help: 'column names of a text file in order (CIF: five tags h,k,l,value,sigma)' },
  { name: 'block', value: true, placeholder: 'NAME', help: 'CIF data block to read (default: the first with reflections)' },
];

/** Files above this size are read in chunks with progress on stderr, when stderr is a terminal. */
export const PROGRESS_MIN_BYTES = 64 << 20;
const CHUNK_BYTES = 16 << 20;

/** Show one line of progress on a terminal, overwritten in place ('' clears it). */
export function progressLine(ctx: CliContext, text: string): void {
  if (ctx.interactive) ctx.err(text ? `\r${text}\x1b[K` : '\r\x1b[K');
}

/** The whole file, read in chunks so a large one shows how far reading has got. */
function readInChunks(full: string, shown: string, ctx: CliContext): Buffer {
  const size = statSync(full).size;
  if (!ctx.interactive || size < PROGRESS_MIN_BYTES) return readFileSync(full);
  const out = Buffer.allocUnsafe(size);
  const fd = openSync(full, 'r');
  let got = 0;
  try {
    while (got < size) {
      const n = readSync(fd, out, got, Math.min(CHUNK_BYTES, size - got), got);
      if (n === 0) break;
      got += n;
      progressLine(ctx, `reading ${shown}: ${Math.floor((100 * got) / size)} % of ${(size / 1e6).toFixed(0)} MB`);
    }
  } finally {
    closeSync(fd);
  }
  progressLine(ctx, `parsing ${shown} ...`);
  return got === size ? out : out.subarray(0, got);
}

/** Read a file's bytes, gunzipping gzip content. `path` is relative to ctx.cwd. */
export function readInputBytes(path: string, ctx: CliContext): Uint8Array {
  const full = resolve(ctx.cwd, path);
  let raw: Buffer;
  try {
    if (statSync(full).isDirectory()) throw new InputError('is a directory, not a file', { file: path });
    raw = readInChunks(full, path, ctx);
  } catch (e) {
    if (e instanceof InputError) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file'
      : code === 'EACCES' ? 'permission denied'
      : code === 'ERR_FS_FILE_TOO_LARGE' ? 'larger than 2 GB, the most Node reads at once; split the data set or compress it with gzip'
      : (e as Error).message;
    throw new InputError(`cannot read the file: ${why}`, { file: path });
  }
  const bytes = new Uint8Array(raw.buffer, raw.byteOffset, raw.byteLength);
  if (!isGzip(bytes)) return bytes;
  try {
    const out = gunzipSync(bytes);
    return new Uint8Array(out.buffer, out.byteOffset, out.byteLength);
  } catch (e) {
    throw new InputError(`the file looks gzip-compressed but does not decompress (${(e as Error).message})`, { file: path },
      'It is probably cut off or damaged; copy or download it again.');
  }
}

/** Files from this size on are read in chunks (memory: the table and one chunk), when their layout allows. */
export const STREAM_MIN_BYTES = 64 << 20;

function readLargeInChunks(path: string, opts: ReadReflectionsOptions, ctx: CliContext): Result<ReflectionTable> | undefined {
  const full = resolve(ctx.cwd, path);
  let size: number;
  try {
    const st = statSync(full);
    if (!st.isFile()) return undefined;
    size = st.size;
  } catch {
    return undefined; // readInputBytes says why
  }
  if (size < STREAM_MIN_BYTES) return undefined;
  const mb = (size / 1e6).toFixed(0);
  return readReflectionsInChunks(full, size, opts, {
    onProgress: (done, total) => progressLine(ctx, `reading ${path}: ${Math.floor((100 * done) / total)} % of ${mb} MB`),
  });
}

/** --cell as a checked UnitCell, or undefined when not given. */
export function cellOption(args: ParsedArgs): UnitCell | undefined {
  const text = args.values.get('cell');
  if (text === undefined) return undefined;
  const r = parseCellText(text, '--cell');
  if (!r.ok) throw r.error;
  return r.value;
}

/** Read a reflection file with the command's --cell/--columns/--block options. */
export function loadReflections(path: string, args: ParsedArgs, ctx: CliContext): ReflectionTable {
  const cell = cellOption(args);
  const columnsText = args.values.get('columns');
  const columns = columnsText?.split(/[,\s]+/).filter((s) => s !== '');
  const opts = { source: path, block: args.values.get('block'), columns, cell: cell?.params() };
  const r = readLargeInChunks(path, opts, ctx) ?? readReflections(readInputBytes(path, ctx), opts);
  progressLine(ctx, '');
  if (!r.ok) throw r.error;
  return r.value;
}
