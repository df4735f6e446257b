import { isInputError } from '../core';
import type { CliContext, Command } from './context';
import { usageError } from './args';
import { withProfile } from './profile-option';

/**
 * The `lacuna` command-line tool. Each command lives in its own module under
 * ./commands and is loaded on demand, so `lacuna inspect` does not pay for the
 * structure-factor code.
 * Exit codes: 0 success, 2 bad input or usage (`error:` on stderr), 1 internal fault.
 */
const COMMANDS: Record<string, { summary: string; load: () => Promise<Command> }> = {
  inspect: { summary: 'summarise a reflection file: counts, cell, resolution, I/sigma', load: async () => (await import('./commands/inspect')).command },
  groups: { summary: 'list space-group settings with operations and reflection conditions', load: async () => (await import('./commands/groups')).command },
  rank: { summary: 'test reflection conditions and rank the space groups the data allow', load: async () => (await import('./commands/rank')).command },
  sf: { summary: 'structure factors of a trial model (CIF)', load: async () => (await import('./commands/sf')).command },
  compare: { summary: 'compare a trial model with measured data: scale, R1, wR2, GooF', load: async () => (await import('./commands/compare')).command },
  simulate: { summary: 'write measured-looking reflection data from a model', load: async () => (await import('./commands/simulate')).command },
  layer: { summary: 'draw one reciprocal-lattice layer (e.g. hk0) to a PNG file', load: async () => (await import('./commands/layer')).command },
  lattice: { summary: 'Niggli-reduce a cell and list the Bravais lattices its metric allows', load: async () => (await import('./commands/lattice')).command },
  reindex: { summary: 'apply a change of basis to a reflection file', load: async () => (await import('./commands/reindex')).command },
};

function topHelp(): string {
  const w = Math.max(...Object.keys(COMMANDS).map((s) => s.length)) + 2;
  return [
    'lacuna: reciprocal-lattice viewer and systematic-absence analyser',
    '',
    'Usage: lacuna COMMAND [options]     (lacuna COMMAND --help for details)',
    '',
    'Commands:',
    ...Object.entries(COMMANDS).map(([k, v]) => '  ' + k.padEnd(w) + v.summary),
    '',
    'Exit codes: 0 success, 2 bad input or usage, 1 internal fault.',
    '',
  ].join('\n');
}

export async function runCli(argv: readonly string[], ctx: CliContext): Promise<number> {
  try {
    const [name, ...rest] = argv;
    if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
      ctx.out(topHelp());
      if (name !== undefined) return 0;
      // no command is a usage error: exit 2 with an error: line, like every other one
      ctx.err('error: no command given; choose one of the commands listed above\n');
      return 2;
    }
    if (name === '--version') {
      ctx.out('lacuna 0.1.0\n');
      return 0;
    }
    const entry = Object.prototype.hasOwnProperty.call(COMMANDS, name) ? COMMANDS[name] : undefined;
    if (!entry) throw usageError(`unknown command '${name}'`);
    const command = await entry.load();
    return await command.run(rest, withProfile(rest, ctx));
  } catch (e) {
    if (isInputError(e)) {
      ctx.err(`error: ${e.describe()}\n`);
      return 2;
    }
    ctx.err(`internal error (please report): ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
    return 1;
  }
}

export function nodeContext(): CliContext {
  // `lacuna ... | head` closes the pipe early; that is not a fault.
  process.stdout.on('error', (e: NodeJS.ErrnoException) => {
    if (e.code === 'EPIPE') process.exit(0);
    throw e;
  });
  return {
    out: (t) => process.stdout.write(t),
    err: (t) => process.stderr.write(t),
    interactive: Boolean(process.stderr.isTTY),
    cwd: process.cwd(),
  };
}
