import { basename, resolve } from 'node:path';
import { deflateSync } from 'node:zlib';
import { InputError } from '../../core';
import { makeCell } from '../../lattice';
import { getSetting, isSystematicallyAbsent } from '../../symmetry';
import { drawLayerMap, encodePng, onLayer, parseLayerPlane } from '../../../shaders-free-render';
import type { Command } from '../context';
import { formatHelp, numberOption, parseArgs, usageError, type CommandSpec } from '../args';
import { DATA_OPTIONS, loadReflections } from '../load-data';
import { checkOutputPath, commandInputs, writeFileAtomically } from '../write-output';

const spec: CommandSpec = {
  name: 'layer',
  summary: 'Draw one reciprocal-lattice layer (e.g. hk0) as a PNG picture, in true geometry, with a legend and axis labels.',
  usage: 'layer FILE --plane hk0 --out FILE.png [--size N] [--group SYMBOL] [--json]',
  options: [
    { name: 'plane', value: true, placeholder: 'LAYER', help: 'the layer: hk0, h0l, 0kl, hk1, h1l, 1kl, hhl, hkN/hNl/Nkl, or u,v,w,n for u h + v k + w l = n' },
    { name: 'out', value: true, placeholder: 'FILE.png', help: 'where to write the picture (written whole or not at all)' },
    { name: 'size', value: true, placeholder: 'N', help: 'width and height in pixels (200..4000, default 900)' },
    { name: 'group', value: true, placeholder: 'SYMBOL', help: 'mark the nodes this space-group setting forbids (number, Hermann-Mauguin or Hall symbol)' },
    ...DATA_OPTIONS,
  ],
  details: [
    'Spots are coloured and sized by intensity on a perceptually ordered scale (square root, saturating at the 98th percentile of the layer).',
    'With --group, hollow teal diamonds mark the nodes that setting forbids, and filled red diamonds those measured with I/sigma >= 3 anyway.',
    'A space group chosen from absences is a hypothesis that structure solution and refinement must confirm.',
  ].join('\n'),
  minPositional: 1,
  maxPositional: 1,
};

export const command: Command = {
  spec,
  async run(argv, ctx) {
    const args = parseArgs(spec, argv);
    if (args.flags.has('help')) { ctx.out(formatHelp(spec)); return 0; }
    const planeText = args.values.get('plane');
    if (planeText === undefined) throw usageError("'layer' needs --plane (e.g. --plane hk0)", 'layer');
    const outShown = args.values.get('out');
    if (outShown === undefined) throw usageError("'layer' needs --out FILE.png", 'layer');
    const plane = parseLayerPlane(planeText);
    if (typeof plane === 'string') throw new InputError(plane, { file: '--plane' });
    const size = numberOption(args, 'size', 'layer', 900)!;
    if (!Number.isInteger(size) || size < 200 || size > 4000) throw usageError(`option '--size' must be a whole number from 200 to 4000, got '${args.values.get('size')}'`, 'layer');
    const groupText = args.values.get('group');
    const setting = groupText !== undefined ? getSetting(groupText) : undefined;
    const path = args.positional[0];
    const outFull = resolve(ctx.cwd, outShown);
    checkOutputPath(outFull, outShown, commandInputs(ctx, args, path));

    const table = loadReflections(path, args, ctx);
    if (!table.meta.cell) throw new InputError('the file gives no unit cell; a layer in true geometry needs one', { file: path }, 'Give it with --cell a,b,c,alpha,beta,gamma.');
    const cell = makeCell(table.meta.cell, { file: path });
    if (!cell.ok) throw cell.error;
    let onThis = 0;
    for (let r = 0; r < table.n; r++) if (onLayer(plane, table.h[r], table.k[r], table.l[r])) onThis++;

    const result = drawLayerMap({
      width: size, height: size, plane, recip: cell.value.frac, data: table,
      forbidden: setting ? (h, k, l) => isSystematicallyAbsent(setting, h, k, l) : undefined,
      ruleText: setting ? setting.hm : undefined,
      title: basename(path) + (table.meta.block ? ` (${table.meta.block})` : ''),
      textScale: Math.max(1, Math.round(size / 450)),
    });
    writeFileAtomically(outFull, outShown, encodePng(result.image, (b) => deflateSync(b, { level: 6 })));

    const summary = {
      input: path, out: outShown, plane: plane.name, size,
      reflections_on_layer: onThis, spots_drawn: result.spotCount,
      group: setting ? setting.hm : null, forbidden_nodes_marked: result.forbiddenMarked, violations: result.violations,
    };
    if (args.flags.has('json')) ctx.out(JSON.stringify(summary, null, 2) + '\n');
    else {
      ctx.out(`wrote ${outShown}: layer ${plane.name}, ${onThis} reflections on it, ${result.spotCount} drawn, ${size}x${size} pixels\n`);
      if (setting) ctx.out(`marked ${result.forbiddenMarked} nodes that ${setting.hm} forbids; ${result.violations} of them measured with I/sigma >= 3\n`);
      if (onThis === 0) ctx.err(`note: no reflection of ${path} lies on layer ${plane.name}\n`);
    }
    return 0;
  },
};
