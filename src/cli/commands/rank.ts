import type { Command } from '../context';
import { formatHelp, numberOption, parseArgs, usageError, type CommandSpec } from '../args';
import { DATA_OPTIONS, cellOption, loadReflections, progressLine } from '../load-data';
import { rankSpaceGroups, DEFAULT_TOLERANCE, type RankResult } from '../../analysis';

const spec: CommandSpec = {
  name: 'rank',
  summary: 'Test every reflection condition of every space-group setting the cell allows against the data, and rank the settings by probability.',
  usage: 'rank FILE [--json] [--top N] [--chiral] [--cell a,b,c,al,be,ga] [--length-tolerance PCT] [--angle-tolerance DEG]',
  options: [
    ...DATA_OPTIONS,
    { name: 'top', value: true, placeholder: 'N', help: 'show the N most probable settings (default 10; JSON lists all)' },
    { name: 'chiral', value: false, help: 'enantiopure sample: consider Sohncke groups only (no mirrors, glides or inversion)' },
    { name: 'length-tolerance', value: true, placeholder: 'PCT', help: `largest cell-length misfit for a candidate setting, percent (default ${DEFAULT_TOLERANCE.lengthPercent})` },
    { name: 'angle-tolerance', value: true, placeholder: 'DEG', help: `largest cell-angle misfit for a candidate setting, degrees (default ${DEFAULT_TOLERANCE.angleDeg})` },
  ],
  details: [
    'Evidence combined per candidate: agreement of symmetry-related intensities (Laue class), the',
    'intensities of the reflections each candidate forbids (absent: zero within errors; present:',
    'Wilson distribution with errors, French & Wilson 1978), reflection classes missing from files',
    'whose absences were filtered out, and the centric/acentric likelihood of the normalised',
    'intensities (allowing a centrosymmetric substructure). Candidates the data cannot tell apart',
    '(same Laue class, absences and centrosymmetry) form a class; the list is ordered by class',
    'probability. The result is a hypothesis for structure solution and refinement to confirm.',
  ].join('\n'),
  minPositional: 1,
  maxPositional: 1,
};

function f(x: number | null | undefined, d: number): string {
  return x === null || x === undefined || !Number.isFinite(x) ? '-' : x.toFixed(d);
}

function pct(p: number): string {
  if (p >= 0.9995) return '>99.9%';
  if (p < 0.0005) return '<0.1%';
  return (100 * p).toFixed(1) + '%';
}

export function rankText(r: RankResult, top: number): string {
  const L: string[] = [];
  const c = r.cell;
  L.push(`Space-group ranking for ${r.input.source}`);
  L.push(`  cell ${[c.a, c.b, c.c].map((v) => v.toFixed(4)).join(' ')}  ${[c.alpha, c.beta, c.gamma].map((v) => v.toFixed(3)).join(' ')}`);
  L.push(`  ${r.input.reflections} reflections${r.input.merged_from_unmerged ? ` (merged from ${r.input.observations} observations)` : ''}, d ${f(r.input.d_max, 2)} - ${f(r.input.d_min, 2)} A` +
    (r.input.completeness !== null ? `, completeness ~${(100 * r.input.completeness).toFixed(0)} %` : ''));
  L.push('');
  L.push('Most probable settings');
  L.push('  rank  group                 No.   probability* class  centro  evidence (nats: Laue / absences / unexplained missing classes / centric)');
  r.candidates.slice(0, top).forEach((cd, j) => {
    L.push(
      `  ${String(j + 1).padStart(4)}  ${cd.hm.padEnd(20)} ${String(cd.number).padStart(4)}   ${pct(cd.probability).padStart(11)}  ${String(cd.class_id + 1).padStart(5)}  ${cd.centrosymmetric ? 'yes' : 'no '}     ` +
        `${f(cd.evidence.laue, 1)} / ${f(cd.evidence.absences, 1)} / ${f(cd.evidence.missing_classes, 1)} / ${f(cd.evidence.centric, 1)}`,
    );
  });
  L.push('  * probability of the candidate\'s class: settings with the same class number give the same intensities');
  L.push('    (same Laue class, absences and centricity), so the data can only decide between classes.');
  const best = r.candidates[0];
  L.push('');
  L.push(`Best: ${best.hm} (No. ${best.number}); probability of its class of indistinguishable settings ${pct(best.probability)}` +
    (best.setting_probability < best.probability ? `, of this setting alone ${pct(best.setting_probability)}.` : '.'));
  if (best.change_of_basis) L.push(`  Non-standard setting; change of basis to the standard setting: ${best.change_of_basis}`);
  else if (!best.standard) L.push('  Non-standard setting (no simple change of basis to the standard setting was found).');
  const cls = r.classes[best.class_id];
  if (cls && cls.members.length > 1) {
    L.push(`  Indistinguishable from: ${cls.members.filter((m) => m !== best.hm).join(', ')}`);
    if (cls.separated_by) L.push(`  What would separate them: ${cls.separated_by}`);
  }
  if (best.conditions.length) {
    L.push('  Conditions it needs:');
    for (const cd of best.conditions) {
      const how = cd.n === 0 && cd.forbidden_class_missing ? 'no forbidden reflection present in the file (class missing)' :
        cd.n === 0 ? 'untested (none measured)' : `${cd.n} tested, mean I/sigma ${f(cd.mean_i_over_sigma, 2)}, ${cd.n_strong} with I/sigma >= 3`;
      L.push(`    ${cd.text.padEnd(22)} P(holds) ${pct(cd.probability_absent).padStart(7)}   ${how}`);
    }
  } else L.push('  It needs no reflection condition.');
  if (best.against.length && best.against[0].i_over_sigma >= 2) {
    L.push('  Strongest reflections against it:');
    for (const a of best.against.filter((x) => x.i_over_sigma >= 2)) L.push(`    ${String(a.h).padStart(4)}${String(a.k).padStart(4)}${String(a.l).padStart(4)}  I/sigma ${a.i_over_sigma.toFixed(1).padStart(6)}  (${a.condition})`);
  }
  L.push('');
  L.push('Laue class (from agreement of symmetry-related intensities, merging and metric)');
  for (const lc of r.laue.classes.slice(0, 6))
    L.push(`  ${lc.symbol.padEnd(7)} ${pct(lc.probability).padStart(7)}  (symmetry alone ${pct(lc.probability_from_symmetry)})  ${lc.axes}`);
  for (const a of r.laue.rotations)
    L.push(`    ${a.label.padEnd(22)} ${a.pairs > 0
      ? `CC ${f(a.cc, 3)} over ${a.pairs} pairs (expected ${f(a.cc_expected, 2)} if exact); differences against their errors: ${a.log_odds > 2 ? 'agree' : a.log_odds < -2 ? 'disagree' : 'undecided'} (${a.log_odds > 0 ? '+' : ''}${f(a.log_odds, 1)} nats)`
      : a.merged ? 'no pairs: the file appears merged under it' : 'no pairs'}`);
  L.push('');
  L.push('Reflection conditions (zone: rule, reflections it forbids that were measured)');
  L.push('  condition               n   <I/sig>  I/sig>=3   P(holds)');
  const conds = [...r.conditions].sort((a, b) => b.probability_absent - a.probability_absent || a.text.localeCompare(b.text));
  for (const cd of conds)
    L.push(`  ${cd.text.padEnd(20)} ${String(cd.n).padStart(5)}  ${f(cd.mean_i_over_sigma, 2).padStart(7)}  ${String(cd.n_strong).padStart(8)}   ${pct(cd.probability_absent).padStart(7)}${cd.forbidden_class_missing ? '  class missing from file' : ''}`);
  const s = r.statistics;
  L.push('');
  L.push('Intensity statistics (general reflections; theory: acentric / centric)');
  L.push(`  mean |E^2-1|      ${f(s.mean_abs_e2_minus_1, 3)}   (0.736 / 0.968, Wilson 1949)`);
  L.push(`  <I^2>/<I>^2       ${f(s.second_moment, 3)}   (2 / 3; below 2 suggests twinning)`);
  L.push(`  N(z) observed     ${s.nz.z.filter((_, j) => j % 2 === 1).map((z, j) => `${z}:${f(s.nz.observed[2 * j + 1], 2)}`).join('  ')}`);
  L.push(`  N(z) acentric     ${s.nz.z.filter((_, j) => j % 2 === 1).map((z, j) => `${z}:${f(s.nz.acentric_with_errors[2 * j + 1], 2)}`).join('  ')}   (with the measurement errors; Howells, Phillips & Rogers 1950)`);
  L.push(`  N(z) centric      ${s.nz.z.filter((_, j) => j % 2 === 1).map((z, j) => `${z}:${f(s.nz.centric_with_errors[2 * j + 1], 2)}`).join('  ')}`);
  L.push(`  centrosymmetric:  probability ${pct(s.probability_centric)} from ${s.general_reflections} reflections`);
  L.push(`  L-test <|L|>      ${f(s.l_test.mean_abs_l, 3)}   (0.5 untwinned, 0.375 perfect twin; Padilla & Yeates 2003) over ${s.l_test.pairs} pairs`);
  L.push(`  Wilson B          ${f(s.wilson_b, 2)} A^2;  sigma scale k = ${f(s.sigma_scale, 2)} (from ${s.sigma_scale_source})`);
  if (r.warnings.length) {
    L.push('');
    L.push('Notes on the evidence');
    for (const w of r.warnings) L.push(`  - ${w}`);
  }
  L.push('');
  L.push(`Caution: ${r.caution}`);
  return L.join('\n') + '\n';
}

export const command: Command = {
  spec,
  async run(argv, ctx) {
    const args = parseArgs(spec, argv);
    if (args.flags.has('help')) { ctx.out(formatHelp(spec)); return 0; }
    const top = numberOption(args, 'top', 'rank', 10)!;
    if (!Number.isInteger(top) || top < 1) throw usageError(`option '--top' needs a positive whole number, got '${args.values.get('top')}'`, 'rank');
    const lengthPercent = numberOption(args, 'length-tolerance', 'rank', DEFAULT_TOLERANCE.lengthPercent)!;
    const angleDeg = numberOption(args, 'angle-tolerance', 'rank', DEFAULT_TOLERANCE.angleDeg)!;
    if (!(lengthPercent > 0) || !(angleDeg > 0)) throw usageError('tolerances must be positive numbers', 'rank');
    const table = loadReflections(args.positional[0], args, ctx);
    const cell = cellOption(args);
    // progress on a terminal only (a long ranking of millions of observations should not look hung)
    let shown = -1;
    const onProgress = ctx.interactive
      ? (f: number, stage: string) => {
        const pc = Math.floor(100 * f);
        if (pc !== shown) { shown = pc; progressLine(ctx, `ranking: ${stage} ${pc} %`); }
      }
      : undefined;
    const r = rankSpaceGroups(table, { cell: cell?.params(), chiral: args.flags.has('chiral'), tolerance: { lengthPercent, angleDeg } }, onProgress);
    progressLine(ctx, '');
    if (!r.ok) throw r.error;
    if (args.flags.has('json')) {
      ctx.out(JSON.stringify(r.value, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v)) + '\n');
    } else {
      ctx.out(rankText(r.value, top));
    }
    return 0;
  },
};
