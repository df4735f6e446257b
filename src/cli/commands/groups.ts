import type { Command } from '../context';
import { formatHelp, parseArgs, usageError, type CommandSpec } from '../args';
import { InputError } from '../../core';
import {
  allSettings,
  combinedConditionText,
  formatTriplet,
  getSetting,
  type SpaceGroupSetting,
} from '../../symmetry';

const spec: CommandSpec = {
  name: 'groups',
  summary: 'List space-group settings (International Tables Vol. A, Table 4.3.2.1) with their operations and the reflection conditions derived from them.',
  usage: 'groups [--json] [--name SYMBOL | --number N]',
  options: [
    { name: 'name', value: true, placeholder: 'SYMBOL', help: "one setting by H-M or Hall symbol: P21/c, 'P 1 21/c 1', P2_1/c, R-3:H, Fd-3m:2, '-P 2ybc'" },
    { name: 'number', value: true, placeholder: 'N', help: 'every setting of space-group number N (1-230)' },
  ],
  details: [
    'Without options every setting is listed (559). Each group is built from its Hall symbol; the reflection',
    'conditions are derived from its operations: operation (R, t) forbids the reflections h with hR = h and h.t',
    'not an integer. In --json output, h is systematically absent exactly when for some condition e.h = 0 for',
    'every row e of "zone" and "coeffs".h is not divisible by "modulus".',
    'The table shows conditions of one zone combined as International Tables print them (hkl: h+k, h+l, k+l = 2n).',
  ].join('\n'),
  minPositional: 0,
  maxPositional: 8,
};

export function settingJson(s: SpaceGroupSetting): Record<string, unknown> {
  return {
    number: s.number,
    hm: s.hm,
    hall: s.hall,
    qualifier: s.qualifier,
    crystal_system: s.crystalSystem,
    lattice: s.lattice,
    laue: s.laue,
    point_group: s.pointGroup,
    centrosymmetric: s.centrosymmetric,
    sohncke: s.sohncke,
    enantiomorph: s.enantiomorph ?? null,
    order: s.order,
    ops: s.ops.map(formatTriplet),
    conditions: s.conditions.map((c) => ({ text: c.text, zone: c.zone, coeffs: c.coeffs, modulus: c.modulus })),
  };
}

function selectSettings(name: string | undefined, numberText: string | undefined): readonly SpaceGroupSetting[] {
  if (name !== undefined && numberText !== undefined) throw usageError("give either --name or --number, not both", 'groups');
  if (name !== undefined) return [getSetting(name)];
  if (numberText !== undefined) {
    const n = Number(numberText);
    if (!/^\s*\d+\s*$/.test(numberText) || n < 1 || n > 230)
      throw new InputError(`option '--number' needs a space-group number from 1 to 230, got '${numberText}'`, {}, "See 'lacuna groups --help'.");
    return allSettings().filter((s) => s.number === n);
  }
  return allSettings();
}

function yesNo(b: boolean): string {
  return b ? 'yes' : 'no';
}

function tableText(settings: readonly SpaceGroupSetting[]): string {
  const head = ['No.', 'H-M symbol', 'Hall symbol', 'system', 'Laue', 'centric', 'Sohncke', 'reflection conditions'];
  const rows = settings.map((s) => [
    String(s.number),
    s.hm,
    s.hall,
    s.crystalSystem,
    s.laue,
    yesNo(s.centrosymmetric),
    yesNo(s.sohncke),
    combinedConditionText(s.conditions).join('; ') || 'none',
  ]);
  const widths = head.map((h, j) => Math.max(h.length, ...rows.map((r) => r[j].length)));
  widths[widths.length - 1] = 0;
  const line = (r: string[]) => r.map((c, j) => c.padEnd(widths[j])).join('  ').trimEnd();
  return [line(head), ...rows.map(line)].join('\n') + '\n';
}

function detailText(s: SpaceGroupSetting): string {
  const lines = [
    `${s.hm}  (No. ${s.number}${s.qualifier ? `, ${s.qualifier}` : ''})`,
    `  Hall symbol        ${s.hall}`,
    `  crystal system     ${s.crystalSystem}, lattice ${s.lattice}`,
    `  point group        ${s.pointGroup}, Laue class ${s.laue}`,
    `  centrosymmetric    ${yesNo(s.centrosymmetric)}`,
    `  Sohncke            ${yesNo(s.sohncke)}${s.enantiomorph ? ` (enantiomorph: ${s.enantiomorph})` : ''}`,
    `  operations (${s.order})`,
    ...s.ops.map((o, j) => `    ${String(j + 1).padStart(3)}  ${formatTriplet(o)}`),
    `  reflection conditions`,
    ...(s.conditions.length ? combinedConditionText(s.conditions).map((t) => `    ${t}`) : ['    none (no systematic absences)']),
  ];
  return lines.join('\n') + '\n';
}

export const command: Command = {
  spec,
  async run(argv, ctx) {
    const args = parseArgs(spec, argv);
    if (args.flags.has('help')) {
      ctx.out(formatHelp(spec));
      return 0;
    }
    if (args.positional.length > 0) {
      const name = args.values.get('name');
      if (name !== undefined)
        throw usageError(`'${[name, ...args.positional].join(' ')}' was split at the spaces; quote a symbol with spaces: --name '${[name, ...args.positional].join(' ')}'`, 'groups');
      throw usageError(`'groups' takes no argument '${args.positional[0]}'; name a space group with --name SYMBOL or --number N`, 'groups');
    }
    const settings = selectSettings(args.values.get('name'), args.values.get('number'));
    if (args.flags.has('json')) {
      ctx.out(JSON.stringify(settings.map(settingJson)) + '\n');
      return 0;
    }
    if (settings.length === 1 || args.values.has('number')) ctx.out(settings.map(detailText).join('\n'));
    else ctx.out(tableText(settings));
    return 0;
  },
};
