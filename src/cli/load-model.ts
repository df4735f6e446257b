import { InputError } from '../core';
import { parseModelCif, type CrystalModel } from '../model';
import type { OptionSpec, ParsedArgs } from './args';
import type { CliContext } from './context';
import { readInputBytes } from './load-data';

/** The option that picks the model's CIF block (shared by sf, compare, simulate). */
export const MODEL_BLOCK_OPTION: OptionSpec = {
  name: 'model-block', value: true, placeholder: 'NAME', help: 'CIF data block of the model (default: the first block with atom sites)',
};

/** Read a model CIF (gzip allowed) and print its warnings to stderr unless --json keeps stdout clean (warnings still go to stderr). */
export function loadModel(path: string, args: ParsedArgs, ctx: CliContext): CrystalModel {
  const bytes = readInputBytes(path, ctx);
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new InputError('the model file is not UTF-8 text', { file: path });
  }
  const r = parseModelCif(text, path, { block: args.values.get('model-block') });
  if (!r.ok) throw r.error;
  for (const w of r.value.warnings) ctx.err(`warning: ${path}: ${w}\n`);
  return r.value;
}

/** The cell as the JSON output gives it. */
export function cellJson(model: CrystalModel) {
  const { a, b, c, alpha, beta, gamma } = model.cell;
  return { a, b, c, alpha, beta, gamma };
}
