import type { Command } from '../context';
import { formatHelp, parseArgs, type CommandSpec } from '../args';

// Placeholder until the owning issue fills it in.
const spec: CommandSpec = { name: 'sf', summary: 'not built yet', usage: 'sf', options: [], minPositional: 0, maxPositional: 99 };

export const command: Command = {
  spec,
  async run(argv, ctx) {
    const args = parseArgs(spec, argv);
    if (args.flags.has('help')) { ctx.out(formatHelp(spec)); return 0; }
    ctx.err("error: 'lacuna sf' is not built yet\n");
    return 1;
  },
};
