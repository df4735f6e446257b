import { existsSync, realpathSync, renameSync, unlinkSync, writeFileSync } from 'node:fs';
import { basename, dirname, resolve } from 'node:path';
import { InputError, type ReflectionTable } from '../../core';
import type { Command } from '../context';
import { formatHelp, numberOption, parseArgs, usageError, type CommandSpec } from '../args';
import { loadModel, MODEL_BLOCK_OPTION } from '../load-model';
import { simulateData, type SimulationOptions } from '../../model';

const spec: CommandSpec = {
  name: 'simulate',
  summary: 'Write measured-looking reflection data computed from a trial model (deterministic for a given seed).',
  usage: 'simulate MODEL.cif --dmin D --seed S --out FILE.cif [options]',
  options: [
    { name: 'dmin', value: true, placeholder: 'D', help: 'resolution limit in angstrom (required)' },
    { name: 'seed', value: true, placeholder: 'S', help: 'seed of the random numbers (required; same seed, same file)' },
    { name: 'out', value: true, placeholder: 'FILE.cif', help: 'reflection file to write (CIF 1.1; never the model file)' },
    { name: 'unmerged', value: false, help: 'write individual observations at random symmetry equivalents (_diffrn_refln)' },
    { name: 'noise', value: true, placeholder: 'mean=1000,background=20,p=0.02', help: 'noise model: mean true intensity, background term, proportional error' },
    { name: 'incomplete', value: true, placeholder: 'FRACTION', help: 'leave out this fraction of reflections at random (default 0)' },
    { name: 'violations', value: true, placeholder: 'N', help: 'give N systematically absent reflections a weak intensity (default 0)' },
    { name: 'multiplicity', value: true, placeholder: 'M', help: 'mean observations per unique reflection with --unmerged (default 4)' },
    { name: 'wavelength', value: true, placeholder: 'ANGSTROM', help: 'wavelength written to the file (default 0.71073)' },
    MODEL_BLOCK_OPTION,
  ],
  details: `Intensities are k |F|^2 scaled to the chosen mean, with sigma^2 = I + background + (p I)^2 and
Io = I + sigma N(0,1) (negative values occur, as in real data). Merged output lists one hemisphere
(Friedel mates merged, symmetry equivalents kept). The file has the cell and the wavelength but no
space group: finding it is the point.`,
  minPositional: 1,
  maxPositional: 1,
};

const NOISE_KEYS: Record<string, keyof SimulationOptions> = { mean: 'meanIntensity', background: 'background', bg: 'background', p: 'p' };

function parseNoise(text: string): Partial<SimulationOptions> {
  const out: Record<string, number> = {};
  for (const part of text.split(',').map((s) => s.trim()).filter(Boolean)) {
    const m = /^([a-z]+)\s*=\s*(.+)$/i.exec(part);
    const key = m && NOISE_KEYS[m[1].toLowerCase()];
    if (!m || !key) throw usageError(`--noise: '${part}' is not one of mean=N, background=N, p=N`, 'simulate');
    const v = Number(m[2]);
    if (!Number.isFinite(v) || v < 0) throw usageError(`--noise: ${m[1]} needs a number >= 0, got '${m[2]}'`, 'simulate');
    out[key] = v;
  }
  return out as Partial<SimulationOptions>;
}

export const command: Command = {
  spec,
  async run(argv, ctx) {
    const args = parseArgs(spec, argv);
    if (args.flags.has('help')) { ctx.out(formatHelp(spec)); return 0; }
    const dmin = numberOption(args, 'dmin', 'simulate');
    const seed = numberOption(args, 'seed', 'simulate');
    const out = args.values.get('out');
    if (dmin === undefined) throw usageError("'simulate' needs --dmin D (resolution limit in angstrom)", 'simulate');
    if (seed === undefined) throw usageError("'simulate' needs --seed S (any whole number; the same seed gives the same file)", 'simulate');
    if (!Number.isInteger(seed)) throw usageError(`--seed needs a whole number, got ${seed}`, 'simulate');
    if (out === undefined) throw usageError("'simulate' needs --out FILE.cif", 'simulate');
    const modelPath = args.positional[0];
    const outFull = resolve(ctx.cwd, out);
    const modelFull = resolve(ctx.cwd, modelPath);
    if (sameFile(outFull, modelFull)) throw usageError(`--out ${out} is the model file; choose another name (the input is never overwritten)`, 'simulate');
    const model = loadModel(modelPath, args, ctx);
    const options: SimulationOptions = {
      dmin, seed,
      unmerged: args.flags.has('unmerged'),
      incompleteness: numberOption(args, 'incomplete', 'simulate'),
      violations: numberOption(args, 'violations', 'simulate'),
      multiplicity: numberOption(args, 'multiplicity', 'simulate'),
      wavelength: numberOption(args, 'wavelength', 'simulate'),
      source: out,
      ...parseNoise(args.values.get('noise') ?? ''),
    };
    const r = simulateData(model, options);
    if (!r.ok) throw new InputError(r.error.message, { file: modelPath }, r.error.hint);
    const { table, scale, absent, violations } = r.value;
    const header = [
      `Simulated by 'lacuna simulate' from the model ${basename(modelPath)}: invented data, not a measurement.`,
      `d_min ${dmin} A, seed ${seed}, ${options.unmerged ? 'unmerged' : 'merged, one hemisphere'}, ` +
        `noise mean=${options.meanIntensity ?? 1000} background=${options.background ?? 20} p=${options.p ?? 0.02}` +
        (options.incompleteness ? `, incomplete ${options.incompleteness}` : '') + (violations.length ? `, ${violations.length} weak violations` : ''),
    ];
    writeAtomically(outFull, out, formatReflectionCif(table, basename(out).replace(/\.[^.]*$/, ''), header));
    const summary = {
      out, model: modelPath, reflections: table.n, unmerged: Boolean(options.unmerged), dmin, seed,
      scale, absent, violations,
    };
    if (args.flags.has('json')) ctx.out(JSON.stringify(summary) + '\n');
    else
      ctx.out(`wrote ${table.n} ${options.unmerged ? 'observations' : 'reflections'} to ${out} (d >= ${dmin} A, seed ${seed}; ` +
        `${absent} systematically absent positions${violations.length ? `, ${violations.length} given weak intensity` : ''})\n`);
    return 0;
  },
};

function sameFile(a: string, b: string): boolean {
  if (a === b) return true;
  try {
    return existsSync(a) && existsSync(b) && realpathSync(a) === realpathSync(b);
  } catch {
    return false;
  }
}

/** Write to a temporary file beside the target, then rename: a reader never sees half a file. */
function writeAtomically(full: string, shown: string, text: string): void {
  const tmp = resolve(dirname(full), `.${basename(full)}.${process.pid}.tmp`);
  try {
    writeFileSync(tmp, text);
    renameSync(tmp, full);
  } catch (e) {
    try { unlinkSync(tmp); } catch { /* nothing to clean */ }
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError(`cannot write the file: ${code === 'ENOENT' ? 'no such directory' : code === 'EACCES' ? 'permission denied' : (e as Error).message}`, { file: shown });
  }
}

/** Temporary local writer until the io layer's CIF writer is available. */
function formatReflectionCif(table: ReflectionTable, blockName: string, comments: string[]): string {
  const m = table.meta;
  const lines = comments.map((c) => `# ${c}`);
  lines.push(`data_${blockName.replace(/\s+/g, '_') || 'simulated'}`);
  if (m.cell) {
    const c = m.cell;
    lines.push(`_cell_length_a ${c.a}`, `_cell_length_b ${c.b}`, `_cell_length_c ${c.c}`,
      `_cell_angle_alpha ${c.alpha}`, `_cell_angle_beta ${c.beta}`, `_cell_angle_gamma ${c.gamma}`);
  }
  if (m.wavelength) lines.push(`_diffrn_radiation_wavelength ${m.wavelength}`);
  const p = m.unmerged ? '_diffrn_refln' : '_refln';
  lines.push('loop_', `${p}_index_h`, `${p}_index_k`, `${p}_index_l`,
    m.unmerged ? '_diffrn_refln_intensity_net' : '_refln_F_squared_meas', m.unmerged ? '_diffrn_refln_intensity_u' : '_refln_F_squared_sigma');
  for (let j = 0; j < table.n; j++)
    lines.push(`${table.h[j]} ${table.k[j]} ${table.l[j]} ${+table.i[j].toFixed(2)} ${+table.sigma[j].toFixed(2)}`);
  return lines.join('\n') + '\n';
}
