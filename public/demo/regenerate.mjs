#!/usr/bin/env node
// Regenerates the demo reflection files public/demo/*.cif from the invented models in
// public/demo/models/ with the project's own simulator (`lacuna simulate`), and writes
// public/demo/demo.json, the list the app reads. Deterministic: same seeds, same files.
//
// Usage (from the repository root, after `npm ci`, which builds the command-line tool):
//   node public/demo/regenerate.mjs
import { existsSync, writeFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const root = resolve(here, '../..');
const bundle = resolve(root, 'dist/cli/lacuna.js');
if (!existsSync(bundle)) {
  console.error('error: dist/cli/lacuna.js is missing; run `npm ci` or `npx vite build --mode cli` first');
  process.exit(1);
}
const { runCli } = await import(pathToFileURL(bundle).href);

/** The invented samples of the invented Quarrymoor Materials Lab. */
const SAMPLES = [
  {
    file: 'qm-101.cif', model: 'models/qm-101.cif', title: 'QM-101, teal needles', system: 'monoclinic',
    args: ['--dmin', '0.8', '--seed', '101', '--violations', '3'],
    look_for: 'h0l present only with l even (a c-glide perpendicular to b) and 0k0 only with k even (a 2_1 screw axis along b); three weak violations from multiple diffraction.',
  },
  {
    file: 'qm-102.cif', model: 'models/qm-102.cif', title: 'QM-102, colourless plates', system: 'monoclinic',
    args: ['--dmin', '0.8', '--seed', '102', '--incomplete', '0.05'],
    look_for: 'every hkl with h+k odd is missing: a C-centred lattice. 5 % of the reflections were left out at random.',
  },
  {
    file: 'qm-103.cif', model: 'models/qm-103.cif', title: 'QM-103, pale yellow prisms', system: 'orthorhombic',
    args: ['--dmin', '0.8', '--seed', '103', '--unmerged', '--multiplicity', '4'],
    look_for: 'unmerged observations; acentric intensity statistics; only the axial rows h00, 0k0, 00l (odd indices absent) show the three screw axes.',
  },
  {
    file: 'qm-104.cif', model: 'models/qm-104.cif', title: 'QM-104, dark red blocks', system: 'monoclinic',
    args: ['--dmin', '0.8', '--seed', '104'],
    look_for: 'reflections with k+l odd are weak (a heavy atom on an inversion centre gives them nothing) but clearly present: pseudo-centring, not an A-centred lattice.',
  },
];

const ctx = {
  out: (t) => process.stdout.write(t),
  err: (t) => process.stderr.write(t),
  interactive: false,
  cwd: here,
};
for (const s of SAMPLES) {
  const code = await runCli(['simulate', s.model, '--out', s.file, ...s.args], ctx);
  if (code !== 0) {
    console.error(`error: simulating ${s.file} failed (exit ${code})`);
    process.exit(code);
  }
}
const manifest = {
  note: 'Invented data: the lab, the samples and the structures are made up; the files were computed by lacuna simulate.',
  default: SAMPLES[0].file,
  samples: SAMPLES.map(({ args, ...rest }) => ({
    ...rest,
    simulate: `lacuna simulate ${rest.model} --out ${rest.file} ${args.join(' ')}`,
    simulate_args: ['simulate', rest.model, '--out', rest.file, ...args],
  })),
};
writeFileSync(resolve(here, 'demo.json'), JSON.stringify(manifest, null, 2) + '\n');
console.log('wrote demo.json');
