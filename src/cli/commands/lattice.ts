import type { Command } from '../context';
import { formatHelp, numberOption, parseArgs, usageError, type CommandSpec } from '../args';
import { DATA_OPTIONS, cellOption, loadReflections } from '../load-data';
import { activeProfile } from '../profile-option';
import type { CellParams } from '../../core';
import { InputError } from '../../core';
import {
  basisRows, findBravaisCandidates, formatChangeOfBasis, changeOfBasisFromMatrix, type BravaisSearch,
} from '../../lattice';

const spec: CommandSpec = {
  name: 'lattice',
  summary: 'Niggli-reduce a cell and list the Bravais lattices its metric allows, highest symmetry first, each with its conventional cell, the change of basis from the input cell and how far the metric is from exact symmetry.',
  usage: 'lattice (FILE | --cell a,b,c,al,be,ga) [--json] [--tolerance DEG]',
  options: [
    { name: 'tolerance', value: true, placeholder: 'DEG', help: 'largest accepted deviation in degrees (default: the profile\'s, else 3)' },
    ...DATA_OPTIONS,
  ],
  details: [
    'The cell comes from FILE (a reflection file with a cell) or from --cell; --cell wins when both are given.',
    'Deviation: the largest angle between a twofold axis the lattice needs and the normal of the lattice plane',
    'perpendicular to it (Le Page 1982). A small deviation says the metric allows that symmetry; whether the',
    'crystal has it is for the intensities (Laue class, absences) and finally the refinement to decide.',
    'Transforms are in International Tables notation: new a,b,c written in the input a,b,c (apply with lacuna reindex).',
    'The monoclinic cell choice follows the lab profile (--profile): shortest a,c or beta closest to 90.',
  ].join('\n'),
  minPositional: 0,
  maxPositional: 1,
};

const CAUTION = 'The metric allows these lattices; the crystal\'s symmetry must be confirmed from the intensities and by structure refinement.';

function cellJson(c: CellParams): Record<string, number> {
  const r = (x: number, d: number) => Number(x.toFixed(d));
  return { a: r(c.a, 5), b: r(c.b, 5), c: r(c.c, 5), alpha: r(c.alpha, 4), beta: r(c.beta, 4), gamma: r(c.gamma, 4) };
}

function cellText(c: CellParams): string {
  return [c.a, c.b, c.c].map((x) => x.toFixed(4).padStart(9)).join('') + [c.alpha, c.beta, c.gamma].map((x) => x.toFixed(3).padStart(9)).join('');
}

export function latticeJson(input: { source: string; cell: CellParams }, tol: number, rule: string, profileName: string, s: BravaisSearch): Record<string, unknown> {
  return {
    input: input.source,
    cell: cellJson(input.cell),
    reduced_cell: cellJson(s.reduced.cell),
    reduced_transform: formatChangeOfBasis(changeOfBasisFromMatrix(s.reduced.transform)),
    tolerance_deg: tol,
    monoclinic_setting: rule,
    profile: profileName,
    candidates: s.candidates.map((c) => ({
      bravais: c.bravais,
      centring: c.centring,
      cell: cellJson(c.cell),
      transform: formatChangeOfBasis(c.transform),
      transform_matrix: basisRows(c.transform),
      deviation_deg: Number(c.deviationDeg.toFixed(4)),
    })),
    caution: CAUTION,
  };
}

export function latticeText(input: { source: string; cell: CellParams }, tol: number, s: BravaisSearch): string {
  const lines: string[] = [];
  const head = '            a        b        c    alpha     beta    gamma';
  lines.push(`input: ${input.source}`, '', `${''.padEnd(18)}${head}`);
  lines.push(`${'input cell'.padEnd(18)}${cellText(input.cell)}`);
  lines.push(`${'Niggli-reduced'.padEnd(18)}${cellText(s.reduced.cell)}   ${formatChangeOfBasis(changeOfBasisFromMatrix(s.reduced.transform))}`);
  lines.push('', `Bravais lattices the metric allows within ${tol} degrees, highest symmetry first:`, '');
  lines.push(`  type  deviation${head}   transform from input`);
  for (const c of s.candidates) {
    const type = c.bravais + (c.centring !== c.bravais[1] ? ` (${c.centring} cell)` : '');
    lines.push(`  ${type.padEnd(4)} ${(c.deviationDeg.toFixed(3) + ' deg').padStart(10)}${cellText(c.cell)}   ${formatChangeOfBasis(c.transform)}`);
  }
  lines.push('', 'deviation: largest angle between a twofold axis the lattice needs and its lattice-plane normal (Le Page 1982).');
  lines.push('Cells carry the measured metric (not made ideal), so angles show how far each is from exact symmetry.');
  lines.push(CAUTION, '');
  return lines.join('\n');
}

export const command: Command = {
  spec,
  async run(argv, ctx) {
    const args = parseArgs(spec, argv);
    if (args.flags.has('help')) { ctx.out(formatHelp(spec)); return 0; }
    const profile = activeProfile(ctx);
    const tol = numberOption(args, 'tolerance', 'lattice', profile.tolerances.latticeDeg)!;
    if (!(tol > 0 && tol <= 10)) throw usageError(`option '--tolerance' must be between 0 and 10 degrees, got ${tol}`, 'lattice');
    let input: { source: string; cell: CellParams };
    const file = args.positional[0];
    if (file !== undefined) {
      const table = loadReflections(file, args, ctx);
      if (!table.meta.cell) throw new InputError('the file gives no unit cell', { file }, 'Give it with --cell a,b,c,alpha,beta,gamma.');
      input = { source: file, cell: table.meta.cell };
    } else {
      const cell = cellOption(args);
      if (!cell) throw usageError("'lattice' needs a reflection file or --cell a,b,c,alpha,beta,gamma", 'lattice');
      input = { source: '--cell', cell: cell.params() };
    }
    const res = findBravaisCandidates(input.cell, {
      toleranceDeg: tol,
      monoclinicRule: profile.monoclinicSetting,
      relativeEpsilon: profile.tolerances.niggliRelativeEpsilon,
    });
    if (!res.ok) throw new InputError(res.error.message, { file: input.source }, res.error.hint);
    if (args.flags.has('json')) ctx.out(JSON.stringify(latticeJson(input, tol, profile.monoclinicSetting, profile.name, res.value), null, 2) + '\n');
    else ctx.out(latticeText(input, tol, res.value));
    return 0;
  },
};
