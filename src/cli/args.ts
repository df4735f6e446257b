import { InputError } from '../core';

/**
 * A small, strict option parser shared by every command.
 * Options are declared per command; unknown options are a usage error (exit 2),
 * never silently ignored.
 */
export interface OptionSpec {
  /** Long name without dashes, e.g. 'cell'. */
  readonly name: string;
  /** true: takes a value (`--cell 1,2,3,90,90,90` or `--cell=...`). false: a flag. */
  readonly value: boolean;
  readonly help: string;
  /** Placeholder shown in help, e.g. 'a,b,c,al,be,ga'. */
  readonly placeholder?: string;
}

export interface CommandSpec {
  readonly name: string;
  readonly summary: string;
  /** Usage line after `lacuna `, e.g. 'inspect FILE [options]'. */
  readonly usage: string;
  readonly options: readonly OptionSpec[];
  /** Extra help paragraphs. */
  readonly details?: string;
  /** Positional argument count range. */
  readonly minPositional: number;
  readonly maxPositional: number;
}

export interface ParsedArgs {
  readonly positional: string[];
  readonly values: Map<string, string>;
  readonly flags: Set<string>;
}

export function usageError(message: string, command?: string): InputError {
  return new InputError(message, {}, command ? `See 'lacuna ${command} --help'.` : "See 'lacuna --help'.");
}

/** Options every command accepts. */
export const COMMON_OPTIONS: readonly OptionSpec[] = [
  { name: 'json', value: false, help: 'print one JSON document on stdout and nothing else there' },
  { name: 'help', value: false, help: 'show this help' },
  { name: 'profile', value: true, placeholder: 'FILE', help: 'lab profile (JSON) whose house rules apply; see public/profiles/' },
];

export function parseArgs(spec: CommandSpec, argv: readonly string[]): ParsedArgs {
  const all = [...spec.options, ...COMMON_OPTIONS];
  const byName = new Map(all.map((o) => [o.name, o]));
  const positional: string[] = [];
  const values = new Map<string, string>();
  const flags = new Set<string>();
  for (let j = 0; j < argv.length; j++) {
    const arg = argv[j];
    if (arg === '--') {
      positional.push(...argv.slice(j + 1));
      break;
    }
    if (arg.startsWith('--')) {
      const eq = arg.indexOf('=');
      const name = eq >= 0 ? arg.slice(2, eq) : arg.slice(2);
      const opt = byName.get(name);
      if (!opt) throw usageError(`unknown option '--${name}' for '${spec.name}'`, spec.name);
      if (opt.value) {
        let v: string | undefined;
        if (eq >= 0) v = arg.slice(eq + 1);
        else if (j + 1 < argv.length) v = argv[++j];
        if (v === undefined || v === '') throw usageError(`option '--${name}' needs a value${opt.placeholder ? ` (${opt.placeholder})` : ''}`, spec.name);
        if (values.has(name)) throw usageError(`option '--${name}' given twice`, spec.name);
        values.set(name, v);
      } else {
        if (eq >= 0) throw usageError(`option '--${name}' takes no value`, spec.name);
        flags.add(name);
      }
    } else if (arg.startsWith('-') && arg.length > 1 && !/^-\d/.test(arg)) {
      if (arg === '-h') { flags.add('help'); continue; }
      throw usageError(`unknown option '${arg}' (options are spelled with two dashes, e.g. --json)`, spec.name);
    } else {
      positional.push(arg);
    }
  }
  if (!flags.has('help')) {
    if (positional.length < spec.minPositional)
      throw usageError(`'${spec.name}' needs ${spec.minPositional === 1 ? 'an argument' : spec.minPositional + ' arguments'}: lacuna ${spec.usage}`, spec.name);
    if (positional.length > spec.maxPositional)
      throw usageError(`'${spec.name}' got an unexpected argument '${positional[spec.maxPositional]}'`, spec.name);
  }
  return { positional, values, flags };
}

export function formatHelp(spec: CommandSpec): string {
  const all = [...spec.options, ...COMMON_OPTIONS];
  const left = all.map((o) => `  --${o.name}${o.value ? ' ' + (o.placeholder ?? 'VALUE') : ''}`);
  const w = Math.max(...left.map((s) => s.length)) + 2;
  const lines = [`lacuna ${spec.usage}`, '', spec.summary, ''];
  if (spec.details) lines.push(spec.details.trim(), '');
  lines.push('Options:');
  all.forEach((o, j) => lines.push(left[j].padEnd(w) + o.help));
  return lines.join('\n') + '\n';
}

/** Parse a number option; a bad value is a usage error naming the option. */
export function numberOption(args: ParsedArgs, name: string, command: string, fallback?: number): number | undefined {
  const v = args.values.get(name);
  if (v === undefined) return fallback;
  const x = Number(v);
  if (!Number.isFinite(x)) throw usageError(`option '--${name}' needs a number, got '${v}'`, command);
  return x;
}
