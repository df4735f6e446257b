import type { Command } from '../context';
import { formatHelp, parseArgs, numberOption, usageError, type CommandSpec } from '../args';
import { DATA_OPTIONS, loadReflections } from '../load-data';
import { cellJson, loadModel, MODEL_BLOCK_OPTION } from '../load-model';
import { compareModelWithData, formFactorRangeWarning, prepareModel } from '../../model';
import { formatFloat32 } from '../../io';

const spec: CommandSpec = {
  name: 'compare',
  summary: 'Compare a trial model with measured data: least-squares scale, R1, wR2, goodness of fit and the worst-fitting reflections.',
  usage: 'compare MODEL.cif DATA [options]',
  options: [
    ...DATA_OPTIONS,
    MODEL_BLOCK_OPTION,
    { name: 'worst', value: true, placeholder: 'N', help: 'how many worst-fitting reflections to list (default 10)' },
  ],
  details: `Definitions (common practice): scale k minimises sum w (Io - k Ic)^2 with w = 1/sigma^2;
R1 = sum |Fo - Fc| / sum Fo over Io > 2 sigma (Fo = sqrt(Io), Fc = sqrt(k Ic));
wR2 = sqrt(sum w (Io - k Ic)^2 / sum w Io^2); GooF = sqrt(sum w (Io - k Ic)^2 / (n - 1)).
Rows with sigma <= 0 are left out and counted. Only the scale is fitted, no atom parameter.`,
  minPositional: 2,
  maxPositional: 2,
};

/** Relative difference of cell edges above which model and data probably do not belong together. */
const CELL_MISMATCH = 0.02;

export const command: Command = {
  spec,
  async run(argv, ctx) {
    const args = parseArgs(spec, argv);
    if (args.flags.has('help')) { ctx.out(formatHelp(spec)); return 0; }
    const nWorst = numberOption(args, 'worst', 'compare', 10)!;
    if (!(nWorst >= 0) || !Number.isInteger(nWorst)) throw usageError(`--worst needs a whole number >= 0, got ${nWorst}`, 'compare');
    const [modelPath, dataPath] = args.positional;
    const model = loadModel(modelPath, args, ctx);
    const data = loadReflections(dataPath, args, ctx);
    const warnings = [...model.warnings, ...data.meta.warnings];
    const dc = data.meta.cell;
    if (dc) {
      const worstEdge = Math.max(...(['a', 'b', 'c'] as const).map((e) => Math.abs(dc[e] - model.cell[e]) / model.cell[e]));
      const worstAngle = Math.max(...(['alpha', 'beta', 'gamma'] as const).map((e) => Math.abs(dc[e] - model.cell[e])));
      if (worstEdge > CELL_MISMATCH || worstAngle > 1)
        warnings.push(`the data's cell (${fmtCell(dc)}) differs from the model's (${fmtCell(model.cell)}); the model's cell is used`);
    }
    if (data.n === 0) throw usageError(`${dataPath} has no reflections to compare with`, 'compare');
    let maxInvD2 = 0;
    for (let j = 0; j < data.n; j++) maxInvD2 = Math.max(maxInvD2, model.cell.invDSquared(data.h[j], data.k[j], data.l[j]));
    const rangeWarning = formFactorRangeWarning(1 / Math.sqrt(maxInvD2));
    if (rangeWarning) warnings.push(rangeWarning);
    const r = compareModelWithData(prepareModel(model), data, { worst: nWorst });
    if (!r.ok) throw r.error;
    const c = r.value;
    if (c.excluded > 0) warnings.push(`${c.excluded} reflections with sigma <= 0 or a non-finite value were left out`);
    if (args.flags.has('json')) {
      ctx.out(JSON.stringify({
        model: modelPath, data: dataPath, cell: cellJson(model),
        n: c.n, excluded: c.excluded,
        scale: c.scale, r1: nullIfNaN(c.r1), r1_reflections: c.r1Count, wr2: nullIfNaN(c.wr2), goof: nullIfNaN(c.goof),
        worst: c.worst.map((w) => ({ h: w.h, k: w.k, l: w.l, i_obs: Number(formatFloat32(w.iObs)), sigma: Number(formatFloat32(w.sigma)), i_calc: round(w.iCalc, 3), deviation: round(w.deviation, 3) })),
        warnings,
      }) + '\n');
      return 0;
    }
    for (const w of warnings) if (!model.warnings.includes(w)) ctx.err(`warning: ${w}\n`);
    const lines = [
      `model ${modelPath} against ${dataPath}: ${c.n} reflections${c.excluded ? ` (${c.excluded} left out)` : ''}`,
      `scale k (Io = k Ic)  ${c.scale.toPrecision(6)}`,
      `R1 (Io > 2 sigma)    ${pct(c.r1)}  over ${c.r1Count} reflections`,
      `wR2 (all, on F^2)    ${pct(c.wr2)}`,
      `GooF                 ${Number.isFinite(c.goof) ? c.goof.toFixed(3) : 'n/a'}`,
    ];
    if (c.worst.length) {
      lines.push('', 'worst-fitting reflections:', '   h    k    l         Io      sigma      k*Ic   (Io-kIc)/sigma');
      for (const w of c.worst)
        lines.push(`${String(w.h).padStart(4)} ${String(w.k).padStart(4)} ${String(w.l).padStart(4)} ${w.iObs.toFixed(2).padStart(10)} ${w.sigma.toFixed(2).padStart(10)} ${w.iCalc.toFixed(2).padStart(10)} ${w.deviation.toFixed(2).padStart(14)}`);
    }
    ctx.out(lines.join('\n') + '\n');
    return 0;
  },
};

function fmtCell(c: { a: number; b: number; c: number; alpha: number; beta: number; gamma: number }): string {
  return [c.a, c.b, c.c, c.alpha, c.beta, c.gamma].map((v) => +v.toFixed(3)).join(', ');
}
function pct(x: number): string {
  return Number.isFinite(x) ? `${(100 * x).toFixed(2)} %` : 'n/a (no reflection with Io > 2 sigma)';
}
function nullIfNaN(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}
function round(x: number, d: number): number {
  const m = 10 ** d;
  return Math.round(x * m) / m;
}
