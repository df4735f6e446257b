// Lattice benchmark: Niggli reduction of the 485 fixture cells, the Bravais search on a cubic F
// primitive cell (the largest case: 9 twofold axes, every subgroup) and on a monoclinic cell, and
// reindexing 1,000,000 reflections. No published target; medians for the record.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { tableFromArrays } from '../../src/core';
import { findBravaisCandidates, niggliReduce, parseChangeOfBasis, reindexTable } from '../../src/lattice';
import { median, reportBench, timeRuns } from './bench-util';

const root = process.env.LACUNA_ROOT ?? process.cwd();
const fixture = JSON.parse(readFileSync(resolve(root, 'tests/reference/lattice-niggli.json'), 'utf8')) as { cases: { input: number[] }[] };
const cells = fixture.cases.map((c) => ({ a: c.input[0], b: c.input[1], c: c.input[2], alpha: c.input[3], beta: c.input[4], gamma: c.input[5] }));

let t = timeRuns(() => { for (const c of cells) niggliReduce(c); }, 9);
reportBench('lattice', { name: `Niggli reduction of ${cells.length} cells`, median: median(t) * 1000, unit: 'ms', runs: t.length });

t = timeRuns(() => { findBravaisCandidates({ a: 5, b: 5, c: 5, alpha: 60, beta: 60, gamma: 60 }); }, 9);
reportBench('lattice', { name: 'Bravais search, cF primitive cell (worst case)', median: median(t) * 1000, unit: 'ms', runs: t.length, target: '<= 100 ms (interactive)' });

t = timeRuns(() => { findBravaisCandidates({ a: 8.72, b: 8.93, c: 12.94, alpha: 90, beta: 90.32, gamma: 90 }); }, 9);
reportBench('lattice', { name: 'Bravais search, near-orthorhombic monoclinic cell', median: median(t) * 1000, unit: 'ms', runs: t.length });

const N = 1_000_000;
let s = 12345;
const rnd = (m: number) => { s = (s * 1103515245 + 12345) >>> 0; return (s % (2 * m + 1)) - m; };
const cols = { h: new Int16Array(N), k: new Int16Array(N), l: new Int16Array(N), i: new Float32Array(N), sigma: new Float32Array(N) };
for (let j = 0; j < N; j++) { cols.h[j] = rnd(40); cols.k[j] = rnd(40); cols.l[j] = rnd(40); cols.i[j] = j; cols.sigma[j] = 1; }
const table = tableFromArrays(cols, { source: 'bench' });
const p = parseChangeOfBasis('a,b,a+c');
if (!p.ok) throw p.error;
t = timeRuns(() => { reindexTable(table, p.value); }, 7);
reportBench('lattice', { name: 'reindex 1,000,000 reflections (a,b,a+c)', median: median(t), unit: 's', runs: t.length, target: '<= 0.2 s' });
