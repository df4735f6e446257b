import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../core';
import { DEFAULT_PROFILE, parseProfile, type LabProfile } from '../profile';
import type { CliContext } from './context';

/**
 * `--profile FILE`, accepted by every command (COMMON_OPTIONS): the dispatcher
 * loads and validates the lab profile before the command runs, so a bad profile
 * stops every command the same way (exit 2, `error:` naming the JSON path), and
 * says on stderr which profile is in force (text mode only; stdout stays clean).
 * Commands read it as `activeProfile(ctx)`.
 */

/** The --profile value in raw arguments (before `--`), or undefined. */
export function findProfileArgument(argv: readonly string[]): string | undefined {
  for (let j = 0; j < argv.length; j++) {
    const a = argv[j];
    if (a === '--') break;
    if (a === '--profile') return argv[j + 1];
    if (a.startsWith('--profile=')) return a.slice('--profile='.length);
  }
  return undefined;
}

/** Read and validate a profile file; throws InputError (exit 2) with file, line and JSON path. */
export function loadProfileFile(path: string, ctx: CliContext): LabProfile {
  let text: string;
  try {
    text = readFileSync(resolve(ctx.cwd, path), 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a directory, not a file' : (e as Error).message;
    throw new InputError(`cannot read the lab profile: ${why}`, { file: path }, 'Examples are in public/profiles/.');
  }
  const r = parseProfile(text, path);
  if (!r.ok) throw new InputError(`lab profile: ${r.error.message}`, r.error.location, r.error.hint);
  return r.value;
}

/** Called by the dispatcher: the context with the profile attached (or unchanged when none is given). */
export function withProfile(argv: readonly string[], ctx: CliContext): CliContext {
  const path = findProfileArgument(argv);
  if (path === undefined || path === '') return ctx; // a missing value is reported by the option parser
  const before = argv.indexOf('--');
  const head = before < 0 ? argv : argv.slice(0, before);
  if (head.includes('--help') || head.includes('-h')) return ctx;
  const profile = loadProfileFile(path, ctx);
  if (!head.includes('--json')) ctx.err(`profile in force: ${profile.name} (${path})\n`);
  return { ...ctx, profile };
}

/** The profile a command should apply: the one given with --profile, else the defaults. */
export function activeProfile(ctx: CliContext): LabProfile {
  return ctx.profile ?? DEFAULT_PROFILE;
}
