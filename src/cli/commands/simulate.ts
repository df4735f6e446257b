import { basename, resolve } from 'node:path';
import { InputError } from '../../core';
import { writeReflectionCif } from '../../io';
import { checkOutputPath, commandInputs, writeFileAtomically } from '../write-output';
import type { Command } from '../context';
import { formatHelp, numberOption, parseArgs, usageError, type CommandSpec } from '../args';
import { loadModel, MODEL_BLOCK_OPTION } from '../load-model';
import { formFactorRangeWarning, simulateData, type SimulationOptions } from '../../model';

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
    checkOutputPath(outFull, out, commandInputs(ctx, args, modelPath));
    const model = loadModel(modelPath, args, ctx);
    const options: SimulationOptions = {
      dmin, seed,
      unmerged: args.flags.has('unmerged'),
      incompleteness: numberOption(args, 'incomplete', 'simulate'),
      violations: numberOption(args, 'violations', 'simulate'),
      multiplicity: numberOption(args, 'multiplicity', 'simulate'),
      wavelength: numberOption(args, 'wavelength', 'simulate'),
      source: `lacuna simulate from the model ${basename(modelPath)}`,
      ...parseNoise(args.values.get('noise') ?? ''),
    };
    const rangeWarning = formFactorRangeWarning(dmin);
    if (rangeWarning) ctx.err(`warning: ${rangeWarning}\n`);
    const r = simulateData(model, options);
    if (!r.ok) throw new InputError(r.error.message, { file: modelPath }, r.error.hint);
    const { table, scale, absent, violations } = r.value;
    const header = [
      'Invented data computed from a trial model, not a measurement.',
      `d_min ${dmin} A, seed ${seed}, ${options.unmerged ? 'unmerged' : 'merged, one hemisphere'}, ` +
        `noise mean=${options.meanIntensity ?? 1000} background=${options.background ?? 20} p=${options.p ?? 0.02}` +
        (options.incompleteness ? `, incomplete ${options.incompleteness}` : '') + (violations.length ? `, ${violations.length} weak violations` : ''),
    ];
    writeFileAtomically(outFull, out, writeReflectionCif(table, { blockName: basename(out).replace(/\.[^.]*$/, ''), comments: header }));
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
