import { existsSync, realpathSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { basename, dirname, resolve } from 'node:path';
import { InputError } from '../core';
import type { ParsedArgs } from './args';
import type { CliContext } from './context';

/** True when two paths name the same file (same path, same real path, or same device and inode). */
export function sameFile(a: string, b: string): boolean {
  if (resolve(a) === resolve(b)) return true;
  if (!existsSync(a) || !existsSync(b)) return false;
  try {
    if (realpathSync(a) === realpathSync(b)) return true;
    const sa = statSync(a), sb = statSync(b);
    return sa.dev === sb.dev && sa.ino === sb.ino;
  } catch {
    return false;
  }
}

/**
 * Check an output path before any work is done: not one of the inputs, not a folder, in a folder that exists.
 * `shown` is the path as the user typed it (for messages).
 */
export function checkOutputPath(full: string, shown: string, inputs: readonly string[]): void {
  if (inputs.some((p) => sameFile(p, full))) throw new InputError('the output file is an input file; Lacuna never overwrites its input', { file: shown }, 'Choose another --out name.');
  if (existsSync(full) && statSync(full).isDirectory()) throw new InputError('is a directory, not a file', { file: shown });
  if (!existsSync(dirname(full))) throw new InputError(`the folder ${dirname(shown) || '.'} does not exist`, { file: shown });
}

/**
 * The files a command reads, resolved against ctx.cwd: its own inputs and the lab
 * profile given with --profile, which is an input too (never to be written over).
 */
export function commandInputs(ctx: CliContext, args: ParsedArgs, ...paths: string[]): string[] {
  const profile = args.values.get('profile');
  return [...paths, ...(profile !== undefined ? [profile] : [])].map((p) => resolve(ctx.cwd, p));
}

/** Write to a temporary file beside the target, then rename: a reader never sees half a file. */
export function writeFileAtomically(full: string, shown: string, text: string | Uint8Array): void {
  const tmp = resolve(dirname(full), `.${basename(full)}.${process.pid}.tmp`);
  try {
    writeFileSync(tmp, text);
    renameSync(tmp, full);
  } catch (e) {
    rmSync(tmp, { force: true });
    throw new InputError(`cannot write the output: ${(e as Error).message}`, { file: shown });
  }
}
