import type { CliContext } from '../../src/cli';

/** A CliContext that collects stdout and stderr, for running commands in-process with runCli. */
export function captureCli(cwd: string = process.cwd()): { ctx: CliContext; readonly out: string; readonly err: string } {
  let out = '';
  let err = '';
  return {
    ctx: { out: (t: string) => { out += t; }, err: (t: string) => { err += t; }, interactive: false, cwd },
    get out() { return out; },
    get err() { return err; },
  };
}
