// Structure-factor benchmark: 20,000 reflections x 200 atoms x 8 operations (C 1 2/c 1,
// every fourth atom anisotropic), the kernel alone (model prepared once). Target <= 1 s median.
import { makeCell } from '../../src/lattice';
import { atomSitesFromList, computeStructureFactors, prepareModel, SeededRandom, type CrystalModel } from '../../src/model';
import { findSetting } from '../../src/symmetry';
import { median, reportBench, timeRuns } from './bench-util';

const rng = new SeededRandom(20_000);
const cell = makeCell({ a: 24.1, b: 18.7, c: 27.3, alpha: 90, beta: 104.2, gamma: 90 });
const setting = findSetting('C 1 2/c 1');
if (!cell.ok || !setting) throw new Error('bench setup failed');
const elements = ['C', 'C', 'C', 'N', 'O', 'O', 'S', 'Br'];
const atoms = Array.from({ length: 200 }, (_, j) => ({
  label: `A${j}`, element: elements[j % elements.length],
  x: rng.uniform(), y: rng.uniform(), z: rng.uniform(), uiso: 0.02 + 0.02 * rng.uniform(),
  aniso: j % 4 === 0 ? [0.02, 0.025, 0.03, 0.002, 0.004, -0.001] : undefined,
}));
const model: CrystalModel = { source: 'bench', cell: cell.value, ops: setting.ops, atoms: atomSitesFromList(atoms), warnings: [] };
const pm = prepareModel(model);
if (pm.nOps !== 8) throw new Error(`expected 8 operations, got ${pm.nOps}`);

const N = 20_000;
const h = new Int32Array(N), k = new Int32Array(N), l = new Int32Array(N);
for (let j = 0; j < N; j++) {
  h[j] = rng.below(41) - 20; k[j] = rng.below(31) - 15; l[j] = rng.below(25) + 1;
}
const re = new Float64Array(N), im = new Float64Array(N);
const runs = 7;
const t = timeRuns(() => computeStructureFactors(pm, h, k, l, re, im), runs, 1);
reportBench('model', {
  name: 'structure factors 20k refl x 200 atoms x 8 ops', median: median(t), unit: 's', runs, target: '<= 1 s',
  note: `${((N * 200 * 8) / median(t) / 1e6).toFixed(0)} M atom-operation terms/s; 1/4 of atoms anisotropic`,
});
