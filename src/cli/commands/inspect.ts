import type { Command } from '../context';
import { formatHelp, parseArgs, type CommandSpec } from '../args';
import { DATA_OPTIONS, loadReflections } from '../load-data';
import { summarizeReflections, type ReflectionSummary } from '../../io';

const spec: CommandSpec = {
  name: 'inspect',
  summary: 'Summarise a reflection file: rows accepted and rejected (with reasons), unique h,k,l, multiplicity, cell, resolution range, mean I/sigma, fraction of negative intensities.',
  usage: 'inspect FILE [--json] [--cell a,b,c,al,be,ga] [--columns ..] [--block NAME]',
  options: DATA_OPTIONS,
  details: [
    'FILE is a CIF 1.1 or mmCIF reflection file or delimited text with a header row (gzip-compressed or not).',
    'Every row of the file is either accepted or rejected with a reason; the counts add up to the rows in the file.',
    'Unique h,k,l are counted as written, without symmetry merging.',
  ].join('\n'),
  minPositional: 1,
  maxPositional: 1,
};

/** The JSON document of `lacuna inspect --json` (keys per the command contract). */
export function inspectJson(s: ReflectionSummary): Record<string, unknown> {
  return {
    source: s.source,
    block: s.block ?? null,
    rows_in_file: s.rowsInFile,
    reflections: s.reflections,
    rejected: s.rejected,
    rejected_reasons: s.rejectedReasons,
    rejected_examples: s.rejectedExamples,
    unique: s.unique,
    multiplicity: s.multiplicity,
    cell: s.cell ? { a: s.cell.a, b: s.cell.b, c: s.cell.c, alpha: s.cell.alpha, beta: s.cell.beta, gamma: s.cell.gamma } : null,
    wavelength: s.wavelength ?? null,
    d_min: s.dMin ?? null,
    d_max: s.dMax ?? null,
    mean_i_over_sigma: s.meanIOverSigma ?? null,
    fraction_negative: s.fractionNegative ?? null,
    index_range: s.indexRange ?? null,
    origin: s.origin,
    unmerged: s.unmerged,
    sigma_estimated: s.sigmaEstimated,
    warnings: s.warnings,
  };
}

function fmt(x: number, digits: number): string {
  return Number.isFinite(x) ? x.toFixed(digits) : String(x);
}

export function inspectText(s: ReflectionSummary): string {
  const rows: [string, string][] = [];
  rows.push(['file', s.source + (s.block ? `  (data block ${s.block})` : '')]);
  rows.push(['rows in file', String(s.rowsInFile)]);
  rows.push(['accepted', String(s.reflections)]);
  rows.push(['rejected', String(s.rejected)]);
  for (const [reason, count] of Object.entries(s.rejectedReasons).sort((a, b) => b[1] - a[1])) {
    const lines = s.rejectedExamples.filter((e) => e.reason === reason).map((e) => e.line);
    const where = lines.length ? ` (line${lines.length > 1 ? 's' : ''} ${lines.slice(0, 5).join(', ')}${lines.length > 5 || count > lines.length ? ', ...' : ''})` : '';
    rows.push(['', `${count} ${reason}${where}`]);
  }
  rows.push(['unique h,k,l', `${s.unique} (as written, no symmetry merging)`]);
  rows.push(['multiplicity', fmt(s.multiplicity, 2) + (s.unmerged ? ' (unmerged observations)' : '')]);
  rows.push(['values', s.origin === 'amplitude' ? 'amplitudes F, squared to intensities' : 'intensities (F^2 scale)']);
  if (s.indexRange) {
    const r = s.indexRange;
    rows.push(['index range', `h ${r.h[0]}..${r.h[1]}, k ${r.k[0]}..${r.k[1]}, l ${r.l[0]}..${r.l[1]}`]);
  }
  const c = s.cell;
  rows.push(['cell', c ? `a ${c.a}  b ${c.b}  c ${c.c} A   alpha ${c.alpha}  beta ${c.beta}  gamma ${c.gamma} deg` : 'not given']);
  rows.push(['wavelength', s.wavelength !== undefined ? `${s.wavelength} A` : 'not given']);
  if (s.dMin !== undefined && s.dMax !== undefined)
    rows.push(['resolution', `d ${fmt(s.dMax, 3)} to ${fmt(s.dMin, 3)} A (sin(theta)/lambda up to ${fmt(0.5 / s.dMin, 4)} 1/A)`]);
  else rows.push(['resolution', 'unknown (no cell)']);
  if (s.sigmaEstimated) rows.push(['sigmas', 'not in the file: estimated (see warnings)']);
  if (s.meanIOverSigma !== undefined) rows.push(['mean I/sigma', fmt(s.meanIOverSigma, 2) + (s.sigmaEstimated ? ' (from estimated sigmas)' : '')]);
  if (s.fractionNegative !== undefined) rows.push(['negative I', `${fmt(100 * s.fractionNegative, 1)} %`]);
  const w = Math.max(...rows.map((r) => r[0].length)) + 2;
  const out = rows.map(([k, v]) => (k ? k.padEnd(w) : ' '.repeat(w + 2)) + v);
  if (s.warnings.length) {
    out.push('', 'warnings:');
    for (const x of s.warnings) out.push('  - ' + x);
  }
  return out.join('\n') + '\n';
}

export const command: Command = {
  spec,
  async run(argv, ctx) {
    const args = parseArgs(spec, argv);
    if (args.flags.has('help')) { ctx.out(formatHelp(spec)); return 0; }
    const table = loadReflections(args.positional[0], args, ctx);
    const summary = summarizeReflections(table);
    if (args.flags.has('json')) ctx.out(JSON.stringify(inspectJson(summary), null, 2) + '\n');
    else ctx.out(inspectText(summary));
    return 0;
  },
};
