import { extname, resolve } from 'node:path';
import type { Command } from '../context';
import { formatHelp, parseArgs, usageError, type CommandSpec } from '../args';
import { DATA_OPTIONS, loadReflections } from '../load-data';
import { checkOutputPath, commandInputs, writeFileAtomically } from '../write-output';
import { InputError } from '../../core';
import { writeReflectionCif } from '../../io';
import { formatReflectionText } from '../../profile';
import { activeProfile } from '../profile-option';
import { basisDeterminant, formatChangeOfBasis, parseChangeOfBasis, reindexTable } from '../../lattice';

const spec: CommandSpec = {
  name: 'reindex',
  summary: 'Apply a change of basis to a reflection file (indices h\' = h P, cell G\' = P^T G P) and write a CIF reflection file.',
  usage: 'reindex FILE --transform a,b,-a-c --out FILE.cif [--drop-nonintegral]',
  options: [
    { name: 'transform', value: true, placeholder: 'a,b,-a-c', help: 'new a,b,c in terms of the old (International Tables notation), or the 9 elements of P row by row' },
    { name: 'out', value: true, placeholder: 'FILE.cif', help: 'output file, written atomically and never the input: CIF, or the lab\'s text export for .txt/.csv/.tsv' },
    { name: 'drop-nonintegral', value: false, help: 'leave out (and count) reflections whose new indices are not integers, instead of stopping' },
    ...DATA_OPTIONS,
  ],
  details: [
    'Examples: P 1 21/n 1 data to the P 1 21/c 1 cell: --transform a,b,a+c   (the inverse is a,b,-a+c);',
    'a C-centred cell to its primitive cell: --transform 1/2a+1/2b,-1/2a+1/2b,c (reflections that break the',
    'centring would get fractional indices; they are refused unless --drop-nonintegral).',
    'Intensities and sigmas are copied unchanged; a determinant of -1 is allowed but warned about (the hand changes).',
    'An --out name ending in .txt, .csv or .tsv writes delimited text with the column names of the lab profile',
    '(--profile; .csv uses commas, .tsv tabs, .txt the profile\'s delimiter); anything else writes CIF 1.1.',
  ].join('\n'),
  minPositional: 1,
  maxPositional: 1,
};

export const command: Command = {
  spec,
  async run(argv, ctx) {
    const args = parseArgs(spec, argv);
    if (args.flags.has('help')) { ctx.out(formatHelp(spec)); return 0; }
    const file = args.positional[0];
    const tText = args.values.get('transform');
    const out = args.values.get('out');
    if (tText === undefined) throw usageError("'reindex' needs --transform (e.g. --transform a,b,-a-c)", 'reindex');
    if (out === undefined) throw usageError("'reindex' needs --out FILE.cif", 'reindex');
    const cob = parseChangeOfBasis(tText, '--transform');
    if (!cob.ok) throw cob.error;
    const outPath = resolve(ctx.cwd, out);
    checkOutputPath(outPath, out, commandInputs(ctx, args, file));

    const table = loadReflections(file, args, ctx);
    const res = reindexTable(table, cob.value, { dropNonIntegral: args.flags.has('drop-nonintegral') });
    if (!res.ok) throw new InputError(res.error.message, res.error.location.file ? res.error.location : { file }, res.error.hint);
    const text = formatChangeOfBasis(cob.value);
    const det = basisDeterminant(cob.value);
    const note = `reindexed by lacuna reindex with the change of basis ${text} (new a,b,c in terms of the old; h' = h P)`;
    const ext = extname(out).toLowerCase();
    const delimiter = ext === '.csv' ? 'comma' : ext === '.tsv' ? 'tab' : ext === '.txt' ? undefined : null;
    const c = res.value.meta.cell;
    const body = delimiter === null
      ? writeReflectionCif(res.value, { comments: [note] })
      : formatReflectionText(res.value, activeProfile(ctx), delimiter, [note, ...(c ? [`cell ${c.a} ${c.b} ${c.c} ${c.alpha} ${c.beta} ${c.gamma}`] : [])]);
    writeFileAtomically(outPath, out, body); // temp file beside it, then rename
    const newWarnings = res.value.meta.warnings.slice(table.meta.warnings.length);
    const summary = {
      input: file,
      output: out,
      transform: text,
      determinant: det.den === 1 ? det.num : `${det.num}/${det.den}`,
      reflections_in: table.n,
      reflections_out: res.value.n,
      left_out: table.n - res.value.n,
      cell: res.value.meta.cell ?? null,
      warnings: newWarnings,
    };
    if (args.flags.has('json')) ctx.out(JSON.stringify(summary, null, 2) + '\n');
    else {
      for (const w of newWarnings) ctx.err(`warning: ${w}\n`);
      const c = res.value.meta.cell;
      ctx.out(
        `wrote ${out}: ${res.value.n} reflections reindexed with ${text} (det ${summary.determinant})` +
          (summary.left_out ? `, ${summary.left_out} left out` : '') + '\n' +
          (c ? `new cell: a ${c.a.toFixed(4)}  b ${c.b.toFixed(4)}  c ${c.c.toFixed(4)} A   alpha ${c.alpha.toFixed(3)}  beta ${c.beta.toFixed(3)}  gamma ${c.gamma.toFixed(3)} deg\n` : 'the input had no cell, so the output has none\n'),
      );
    }
    return 0;
  },
};
