// Ranking benchmark: `lacuna rank` as a whole process on 1,000,000 reflections merged in P-1,
// with peak memory, for two cells (generated into a temp folder, never committed):
// - monoclinic: 2/m symmetry in the intensities and a 21 screw axis along b;
// - cubic (a = 40 A): m-3 symmetry in the intensities and the glides of P a -3. The cubic
//   metric admits far more candidate settings, rotations and conditions (about 60), so it is
//   the slow case.
// Then the full accuracy suite (all 230 standard settings and the common non-standard ones)
// on simulated data; LACUNA_BENCH_RANK_QUICK=1 skips the suite.
import { spawnSync } from 'node:child_process';
import { mkdirSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { median, reportBench } from './bench-util';
import { runSuite, suiteSettings } from '../analysis/rank-accuracy';

const root = process.env.LACUNA_ROOT ?? process.cwd();
const cli = resolve(root, 'src/cli/bin.mjs');
if (!existsSync(resolve(root, 'dist/cli/lacuna.js'))) spawnSync('npx', ['vite', 'build', '--mode', 'cli'], { cwd: root, stdio: 'inherit' });

type BenchCell = 'monoclinic' | 'cubic';

function makeFile(kind: BenchCell, target: number): { file: string; n: number } {
  let x = 88172645;
  const rnd = () => { x ^= x << 13; x >>>= 0; x ^= x >>> 17; x ^= x << 5; x >>>= 0; return x / 4294967296; };
  const cubic = kind === 'cubic';
  const a = cubic ? 40 : 30, b = cubic ? 40 : 32, c = cubic ? 40 : 36, beta = cubic ? 90 : 100;
  // resolution limit (sin(theta)/lambda)^2 * 4 chosen so that the half sphere holds about `target`
  const s2Max = cubic ? 3.85 : 5.8;
  // true intensities for the unique set, shared by the symmetry-equivalent indices
  const lines: string[] = [];
  const H = 80, K = 80, L = 90;
  const cb = Math.cos((beta * Math.PI) / 180), sb = Math.sin((beta * Math.PI) / 180);
  const cache = new Map<number, number>();
  for (let h = -H; h <= H && lines.length < target; h++)
    for (let k = 0; k <= K && lines.length < target; k++)
      for (let l = -L; l <= L && lines.length < target; l++) {
        if (k === 0 && (l < 0 || (l === 0 && h <= 0))) continue;
        const s2 = (h * h / (a * a) + l * l / (c * c) - (2 * h * l * cb) / (a * c)) / (sb * sb) + (k * k) / (b * b);
        if (s2 > s2Max) continue;
        let key: number;
        if (cubic) {
          // m-3: sign changes and cyclic permutations of (h, k, l)
          const p0 = Math.abs(h), p1 = Math.abs(k), p2 = Math.abs(l);
          key = Math.min((p0 * 200 + p1) * 200 + p2, (p1 * 200 + p2) * 200 + p0, (p2 * 200 + p0) * 200 + p1);
        } else key = (h >= 0 ? h : -h) * 100000 + k * 1000 + (h >= 0 ? l : -l) + 500;
        let t = cache.get(key);
        if (t === undefined) { t = -Math.log(1 - rnd()) * 1000 * Math.exp(-2 * s2); cache.set(key, t); }
        if (cubic) {
          // P a -3: 0kl k = 2n, h0l l = 2n, hk0 h = 2n
          if ((h === 0 && k % 2 !== 0) || (k === 0 && l % 2 !== 0) || (l === 0 && h % 2 !== 0)) t = 0;
        } else if (h === 0 && l === 0 && k % 2 === 1) t = 0;
        const s = Math.sqrt(t + 20 + 0.0009 * t * t);
        lines.push(`${h} ${k} ${l} ${(t + s * (rnd() + rnd() + rnd() - 1.5) * 2).toFixed(1)} ${s.toFixed(1)}`);
      }
  const head = [`data_bench_rank_${kind}`, `_cell_length_a ${a}`, `_cell_length_b ${b}`, `_cell_length_c ${c}`, '_cell_angle_alpha 90', `_cell_angle_beta ${beta}`, '_cell_angle_gamma 90',
    'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_squared_meas', '_refln_F_squared_sigma'];
  const dir = join(tmpdir(), 'lacuna-bench-data');
  mkdirSync(dir, { recursive: true });
  const file = join(dir, `rank-1m-${kind}.cif`);
  writeFileSync(file, head.join('\n') + '\n' + lines.join('\n') + '\n');
  process.stderr.write(`rank bench: ${lines.length} reflections (${kind} cell) in ${file}\n`);
  return { file, n: lines.length };
}

function benchRank(kind: BenchCell): void {
  const { file, n } = makeFile(kind, 1_000_000);
  const times: number[] = [];
  const rss: number[] = [];
  let top = '';
  for (let r = 0; r < 5; r++) {
    const t0 = performance.now();
    const p = spawnSync('/usr/bin/time', ['-f', '%M', process.execPath, cli, 'rank', file, '--json'], { encoding: 'utf8', maxBuffer: 256 << 20 });
    times.push((performance.now() - t0) / 1000);
    if (p.status !== 0) throw new Error(`lacuna rank failed: ${p.stderr}`);
    rss.push(Number(p.stderr.trim().split('\n').pop()) / 1024);
    top = JSON.parse(p.stdout).candidates[0].hm;
  }
  const count = `${(n / 1e6).toFixed(2)}M`;
  reportBench('rank', { name: `lacuna rank, ${count} reflections merged in P-1, ${kind} cell (whole process)`, median: median(times), unit: 's', runs: times.length, target: '<= 1.5 s', note: `top: ${top}` });
  reportBench('rank', { name: `lacuna rank, ${count} reflections, ${kind} cell: peak resident memory`, median: median(rss), unit: 'MB', runs: rss.length, target: '< 300 MB' });
}

benchRank('monoclinic');
benchRank('cubic');
if (process.env.LACUNA_BENCH_RANK_QUICK === '1') process.exit(0);

const { standard, nonStandard } = suiteSettings();
const t0 = performance.now();
const o = runSuite([...standard, ...nonStandard]);
const secs = (performance.now() - t0) / 1000;
process.stderr.write(o.failures.join('\n') + '\n');
reportBench('rank', { name: `accuracy suite, top class right (${o.total} settings)`, median: (100 * o.top1) / o.total, unit: '%', runs: 1, target: '>= 97 %', note: `${secs.toFixed(0)} s` });
reportBench('rank', { name: 'accuracy suite, truth among the top 3 classes', median: (100 * o.top3) / o.total, unit: '%', runs: 1 });
reportBench('rank', { name: 'accuracy suite, truth among the top 5 classes', median: (100 * o.top5) / o.total, unit: '%', runs: 1, target: '>= 99 %' });
reportBench('rank', { name: 'accuracy suite, confident wrong answers (p > 0.9)', median: o.confidentWrong, unit: 'cases', runs: 1, target: '0' });

const weak = runSuite([...standard, ...nonStandard], 1000, 'weak');
process.stderr.write(weak.failures.join('\n') + '\n');
reportBench('rank', { name: `accuracy suite, weak incomplete data, top class right`, median: (100 * weak.top1) / weak.total, unit: '%', runs: 1, target: '(no target)' });
reportBench('rank', { name: 'accuracy suite, weak data, truth among the top 5 / confident wrong', median: (100 * weak.top5) / weak.total, unit: '%', runs: 1, target: '>= 99 %', note: `${weak.confidentWrong} confident wrong` });

const dep = runSuite([...standard, ...nonStandard], 1000, 'deposited');
process.stderr.write(dep.failures.join('\n') + '\n');
reportBench('rank', { name: 'accuracy suite, deposited-style files (ASU, absences removed), top class right', median: (100 * dep.top1) / dep.total, unit: '%', runs: 1, target: '(no target)' });
reportBench('rank', { name: 'accuracy suite, deposited-style files, truth among the top 5', median: (100 * dep.top5) / dep.total, unit: '%', runs: 1, target: '>= 99 %', note: `${dep.confidentWrong} confident wrong` });
