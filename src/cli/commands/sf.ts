import type { Command } from '../context';
import { formatHelp, numberOption, parseArgs, usageError, type CommandSpec } from '../args';
import { cellJson, loadModel, MODEL_BLOCK_OPTION } from '../load-model';
import { computeStructureFactors, formFactorRangeWarning, hemisphereIndices, prepareModel } from '../../model';

const spec: CommandSpec = {
  name: 'sf',
  summary: 'Structure factors of a trial model: |F| in electrons and phase in degrees for every reflection of one hemisphere to the resolution limit.',
  usage: 'sf MODEL.cif --dmin D [options]',
  options: [
    { name: 'dmin', value: true, placeholder: 'D', help: 'resolution limit in angstrom (required)' },
    MODEL_BLOCK_OPTION,
  ],
  details: `The model is a CIF 1.1 structure file: cell, symmetry operations or space-group name, atom sites
(U_iso/B_iso or anisotropic U). Form factors: International Tables Vol. C, Table 6.1.1.4; ions (O2-, Fe3+) Waasmaier & Kirfel (1995).
F(h) = sum occ f(s) DW sum_ops exp(2 pi i h.(R x + t)); atoms on special positions count once.
Reflections: h,k,l with l > 0, or l = 0 and k > 0, or l = k = 0 and h > 0 (one hemisphere).`,
  minPositional: 1,
  maxPositional: 1,
};

export const command: Command = {
  spec,
  async run(argv, ctx) {
    const args = parseArgs(spec, argv);
    if (args.flags.has('help')) { ctx.out(formatHelp(spec)); return 0; }
    const dmin = numberOption(args, 'dmin', 'sf');
    if (dmin === undefined) throw usageError("'sf' needs --dmin D (resolution limit in angstrom)", 'sf');
    if (!(dmin > 0)) throw usageError(`--dmin must be a positive number of angstrom, got ${dmin}`, 'sf');
    const path = args.positional[0];
    const model = loadModel(path, args, ctx);
    const hkl = hemisphereIndices(model.cell, dmin);
    if (!hkl.ok) throw usageError(`--dmin ${dmin}: ${hkl.error.message}`, 'sf');
    const { h, k, l } = hkl.value;
    const rangeWarning = formFactorRangeWarning(dmin);
    if (rangeWarning) { model.warnings.push(rangeWarning); ctx.err(`warning: ${rangeWarning}\n`); }
    const n = h.length;
    const re = new Float64Array(n), im = new Float64Array(n);
    computeStructureFactors(prepareModel(model), h, k, l, re, im);
    // |F| below 1e-6 electrons is rounding noise (systematic absences): report 0 with phase 0
    const f = (j: number) => { const v = Math.hypot(re[j], im[j]); return v < 1e-6 ? 0 : v; };
    const phase = (j: number) => {
      if (f(j) === 0) return 0;
      const p = (Math.atan2(im[j], re[j]) * 180) / Math.PI;
      if (Math.abs(p) < 5e-10) return 0; // no -0 or -1e-14 in the output
      return p <= -180 + 5e-10 ? 180 : p; // phases in (-180, 180]
    };
    if (args.flags.has('json')) {
      const reflections = [];
      for (let j = 0; j < n; j++) reflections.push({ h: h[j], k: k[j], l: l[j], f: round(f(j), 6), phase: round(phase(j), 4) });
      ctx.out(JSON.stringify({
        model: path, cell: cellJson(model), space_group: model.spaceGroupName ?? null, operations: model.ops.length,
        atoms: model.atoms.n, dmin, warnings: model.warnings, reflections,
      }) + '\n');
      return 0;
    }
    const lines = [
      `model ${path}: ${model.atoms.n} atom sites, ${model.ops.length} symmetry operations${model.spaceGroupName ? ` (${model.spaceGroupName})` : ''}`,
      `${n} reflections with d >= ${dmin} angstrom (one hemisphere); |F| in electrons, phase in degrees`,
      '   h    k    l          |F|     phase',
    ];
    for (let j = 0; j < n; j++)
      lines.push(`${pad(h[j], 4)} ${pad(k[j], 4)} ${pad(l[j], 4)} ${f(j).toFixed(3).padStart(12)} ${phase(j).toFixed(2).padStart(9)}`);
    ctx.out(lines.join('\n') + '\n');
    return 0;
  },
};

function round(x: number, digits: number): number {
  const m = 10 ** digits;
  return Math.round(x * m) / m;
}
function pad(v: number, w: number): string {
  return String(v).padStart(w);
}
