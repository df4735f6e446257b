// Symmetry benchmark: building every setting from its Hall symbol, deriving the conditions,
// and the whole-table absence test: absence flags of 1,000,000 reflections for all 559
// settings at once (issue 3 target <= 0.3 s; gemmi's C++ scan, one vectorised call per
// setting, takes about 27 s on this machine for the same work).
import {
  absenceBits,
  allSettings,
  buildConditionCatalogue,
  classifyReflections,
  countAbsentPerSetting,
  evaluateConditions,
} from '../../src/symmetry';
import { median, reportBench, timeRuns } from './bench-util';

const N = 1_000_000;

let t0 = performance.now();
const settings = allSettings();
const tableMs = performance.now() - t0;
reportBench('symmetry', { name: `allSettings(): ${settings.length} settings, groups built lazily`, median: tableMs, unit: 'ms', runs: 1, target: '<= 50 ms (or lazily)' });

t0 = performance.now();
let nOps = 0;
for (const s of settings) nOps += s.ops.length;
const buildMs = performance.now() - t0;
reportBench('symmetry', { name: `build all ${settings.length} groups from Hall symbols (cold)`, median: buildMs, unit: 'ms', runs: 1, note: `${nOps} operations` });

t0 = performance.now();
let nCond = 0;
for (const s of settings) nCond += s.conditions.length;
const condMs = performance.now() - t0;
reportBench('symmetry', { name: 'derive conditions of every setting (cold)', median: condMs, unit: 'ms', runs: 1, note: `${nCond} conditions` });

t0 = performance.now();
const cat = buildConditionCatalogue(settings);
const catMs = performance.now() - t0;
reportBench('symmetry', { name: 'condition catalogue (cold)', median: catMs, unit: 'ms', runs: 1, note: `${cat.conditions.length} distinct conditions` });

// deterministic pseudo-random indices (xorshift) in a box like a 0.8 A data set of a 40 A cell
let x = 88172645;
const rnd = () => { x ^= x << 13; x >>>= 0; x ^= x >>> 17; x ^= x << 5; x >>>= 0; return x / 4294967296; };
const h = new Int16Array(N), k = new Int16Array(N), l = new Int16Array(N);
for (let i = 0; i < N; i++) {
  h[i] = Math.floor(rnd() * 101) - 50;
  k[i] = Math.floor(rnd() * 101) - 50;
  l[i] = Math.floor(rnd() * 101) - 50;
}
// and a set where every reflection lies on a zone or row (the slow path)
const hz = new Int16Array(N), kz = new Int16Array(N), lz = new Int16Array(N);
for (let i = 0; i < N; i++) {
  const a = Math.floor(rnd() * 61) - 30, b = Math.floor(rnd() * 61) - 30;
  const which = i % 6;
  hz[i] = which === 0 ? 0 : which === 3 ? a : a;
  kz[i] = which === 1 ? 0 : which === 3 ? a : which === 4 ? -a : b;
  lz[i] = which === 2 ? 0 : which === 5 ? 0 : b;
}

const classOf = new Uint32Array(N);
let counts: Int32Array = new Int32Array(0);
const tAbs = timeRuns(() => {
  const classes = classifyReflections(cat, h, k, l, N, classOf);
  counts = countAbsentPerSetting(cat, classes);
}, 7, 2);
const fdm = settings.findIndex((s) => s.hm === 'F d -3 m:1');
reportBench('symmetry', {
  name: `absence flags, 1M reflections x ${settings.length} settings (classes + counts)`,
  median: median(tAbs),
  unit: 's',
  runs: tAbs.length,
  target: '<= 0.3 s',
  note: `P 1: ${counts[0]} absent, F d -3 m:1: ${counts[fdm]} absent`,
});

const tZone = timeRuns(() => { countAbsentPerSetting(cat, classifyReflections(cat, hz, kz, lz, N, classOf)); }, 5, 1);
reportBench('symmetry', { name: `same, 1M reflections all on zones/rows`, median: median(tZone), unit: 's', runs: tZone.length, target: '<= 0.3 s', note: 'worst case: every reflection special' });

const out = new Uint32Array(N * cat.settingWords);
const tBits = timeRuns(() => { absenceBits(cat, h, k, l, N, out); }, 5, 1);
reportBench('symmetry', { name: `absence bit matrix, 1M x ${settings.length} materialised (${(out.byteLength / 1e6).toFixed(0)} MB)`, median: median(tBits), unit: 's', runs: tBits.length });

const viol = new Uint32Array(N * cat.conditionWords);
const tCond = timeRuns(() => { evaluateConditions(cat, h, k, l, N, viol); }, 7, 2);
reportBench('symmetry', { name: `broken-condition bits, 1M reflections x ${cat.conditions.length} conditions`, median: median(tCond), unit: 's', runs: tCond.length });
