// Reading benchmark: a generated 1,000,000-reflection mmCIF file (about 23 MB,
// written to a temp folder, never committed) read into the ReflectionTable, and
// `lacuna inspect` on it as a whole process.
import { execFileSync, spawnSync } from 'node:child_process';
import { appendFileSync, existsSync, mkdirSync, readFileSync, statSync, unlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { gzipSync } from 'node:zlib';
import { readReflections } from '../../src/io';
import { median, reportBench, timeRuns } from './bench-util';

const ROWS = 1_000_000;

/** User + system CPU seconds of finished child processes (Linux /proc; NaN elsewhere). */
function childrenCpuSeconds(): number {
  try {
    const stat = readFileSync('/proc/self/stat', 'utf8');
    const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    // fields 16 and 17 of proc(5), cutime and cstime, counted from field 3 here; clock ticks of 1/100 s
    return (Number(f[13]) + Number(f[14])) / 100;
  } catch {
    return NaN;
  }
}
const root = process.env.LACUNA_ROOT ?? process.cwd();

/** Deterministic pseudo-random data (xorshift), so every run reads the same file. */
function makeMmcif(rows: number): Uint8Array {
  let x = 2463534242;
  const rnd = () => { x ^= x << 13; x >>>= 0; x ^= x >>> 17; x ^= x << 5; x >>>= 0; return x / 4294967296; };
  const parts: string[] = [
    'data_bench_generated',
    '_cell.length_a 61.20', '_cell.length_b 71.35', '_cell.length_c 82.10',
    '_cell.angle_alpha 90.00', '_cell.angle_beta 97.20', '_cell.angle_gamma 90.00',
    'loop_', '_refln.index_h', '_refln.index_k', '_refln.index_l', '_refln.intensity_meas', '_refln.intensity_sigma',
  ];
  const lines: string[] = [];
  for (let j = 0; j < rows; j++) {
    const h = Math.floor(rnd() * 81) - 40, k = Math.floor(rnd() * 81) - 40, l = Math.floor(rnd() * 61) - 30 || 1;
    const i = rnd() * 9000 - 500;
    lines.push(`${h} ${k} ${l} ${i.toFixed(2)} ${(5 + rnd() * 60).toFixed(1)}`);
  }
  return new TextEncoder().encode(parts.join('\n') + '\n' + lines.join('\n') + '\n');
}

const dir = join(tmpdir(), 'lacuna-bench-data');
mkdirSync(dir, { recursive: true });
const file = join(dir, 'refl-1m.cif');
const bytes = makeMmcif(ROWS);
writeFileSync(file, bytes);
writeFileSync(file + '.gz', gzipSync(bytes, { level: 6 }));
const mb = bytes.length / 1e6;

let n = 0;
let held = 0;
// CPU time beside wall time: on a shared, busy machine wall time includes waiting for a core
const cpu: number[] = [];
const times = timeRuns(() => {
  const c0 = process.cpuUsage();
  const r = readReflections(bytes, { source: file });
  if (!r.ok) throw r.error;
  const t = r.value;
  n = t.n;
  held = t.h.buffer.byteLength + t.k.buffer.byteLength + t.l.buffer.byteLength + t.i.buffer.byteLength + t.sigma.buffer.byteLength;
  const c = process.cpuUsage(c0);
  cpu.push((c.user + c.system) / 1e6);
}, 7, 2);
cpu.splice(0, 2); // the warm-up runs
if (n !== ROWS) throw new Error(`read ${n} reflections, expected ${ROWS}`);
const m = median(times);
reportBench('io', { name: `read 1M-row mmCIF (${mb.toFixed(1)} MB) to table`, median: m, unit: 's', runs: times.length, target: '<= 0.2 s', note: `${(mb / m).toFixed(0)} MB/s; cpu ${median(cpu).toFixed(3)} s` });
reportBench('io', { name: 'bytes held per reflection after reading', median: held / n, unit: 'B', runs: 1, target: '<= 20 B' });

// the real data set, small-file overhead
const real = resolve(root, '../shared/realdata/cod-2014121.cif');
if (existsSync(real)) {
  const rb = new Uint8Array(readFileSync(real));
  const t2 = timeRuns(() => { const r = readReflections(rb, { source: real }); if (!r.ok) throw r.error; }, 21, 5);
  reportBench('io', { name: 'read cod-2014121.cif (3651 rows)', median: median(t2) * 1000, unit: 'ms', runs: t2.length });
}

// `lacuna inspect` as a whole process (node start, bundle load, read, summary)
const bundle = resolve(root, 'dist/cli/lacuna.js');
// rebuild, so the figure is for the current sources, not an old bundle
execFileSync('npx', ['vite', 'build', '--mode', 'cli'], { cwd: root, stdio: 'ignore' });
if (!existsSync(bundle)) throw new Error(`the CLI bundle ${bundle} was not built`);
const bin = resolve(root, 'src/cli/bin.mjs');
for (const [label, path, target] of [['', file, '< 0.5 s'], [' (gzip)', file + '.gz', '']] as const) {
  const wall: number[] = [];
  const childCpu: number[] = [];
  for (let j = 0; j < 6; j++) {
    const c0 = childrenCpuSeconds();
    const t0 = performance.now();
    const r = spawnSync(process.execPath, [bin, 'inspect', path, '--json'], { encoding: 'utf8' });
    const dt = (performance.now() - t0) / 1000;
    if (r.status !== 0) throw new Error(`lacuna inspect failed: ${r.stderr}`);
    if (j > 0) { wall.push(dt); childCpu.push(childrenCpuSeconds() - c0); }
  }
  const cpuNote = Number.isFinite(childCpu[0]) ? `cpu ${median(childCpu).toFixed(2)} s` : '';
  reportBench('io', { name: `lacuna inspect 1M-row mmCIF${label}, whole process`, median: median(wall), unit: 's', runs: wall.length, target, note: cpuNote });
}

// Optional (LACUNA_BENCH_BIG=1): a file larger than the longest JavaScript string
// (26M rows, about 585 MB), read by `lacuna inspect` as a whole process.
if (process.env.LACUNA_BENCH_BIG === '1') {
  const big = join(dir, 'refl-big.cif');
  const start = bytes.indexOf(10, findTag(bytes)) + 1;
  const body = bytes.subarray(start);
  writeFileSync(big, bytes.subarray(0, start));
  for (let j = 0; j < 26; j++) appendFileSync(big, body);
  const c0 = childrenCpuSeconds();
  const t0 = performance.now();
  const r = spawnSync(process.execPath, [bin, 'inspect', big, '--json'], { encoding: 'utf8', maxBuffer: 1 << 20 });
  const dt = (performance.now() - t0) / 1000;
  if (r.status !== 0) throw new Error(`lacuna inspect on the big file failed: ${r.stderr}`);
  const rows = JSON.parse(r.stdout).reflections as number;
  if (rows !== 26 * ROWS) throw new Error(`big file: ${rows} reflections, expected ${26 * ROWS}`);
  reportBench('io', { name: `lacuna inspect ${(statSync(big).size / 1e6).toFixed(0)} MB mmCIF (26M rows)`, median: dt, unit: 's', runs: 1, note: `cpu ${(childrenCpuSeconds() - c0).toFixed(1)} s` });
  unlinkSync(big);
}
/** Offset of the last loop tag line of the generated file. */
function findTag(b: Uint8Array): number {
  return Buffer.from(b.buffer, b.byteOffset, b.byteLength).indexOf('_refln.intensity_sigma');
}
