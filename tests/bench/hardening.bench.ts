// Hardening benchmark: 10 MB adversarial inputs (each must be read or refused within
// 2 s), a long fuzz run (many more inputs than CI's fixed-seed run), and a
// 10,000,000-observation unmerged file through `lacuna inspect` and `lacuna rank` as
// whole processes, with peak resident memory (target <= 1 GB). Generated files go to
// the temp folder and are removed afterwards.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, mkdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { readReflections } from '../../src/io';
import { runCli } from '../../src/cli';
import { ADVERSARIAL_NAMES, makeAdversarial } from '../fuzz/adversarial-inputs';
import { SEEDS } from '../fuzz/seeds';
import { applyMutations, mutatedFileArb } from '../fuzz/mutate';
import { checkRead } from '../fuzz/invariants';
import { writeUnmergedCif } from '../large/make-unmerged';
import { median, reportBench, timeRuns } from './bench-util';
import fc from 'fast-check';

const root = process.env.LACUNA_ROOT ?? process.cwd();

const work = mkdtempSync(join(tmpdir(), 'lacuna-hardening-'));
let failed = false;

try {
  // --- adversarial inputs: median of 3 reads each; the slowest is reported
  let worst = { name: '', s: 0 };
  const slow: string[] = [];
  for (const name of ADVERSARIAL_NAMES) {
    const bytes = makeAdversarial(name);
    const t = median(timeRuns(() => { readReflections(bytes, { source: name }); }, 3, 1));
    process.stderr.write(`hardening: ${name} ${(t * 1000).toFixed(0)} ms\n`);
    if (t > worst.s) worst = { name, s: t };
    if (t > 2) slow.push(name);
  }
  reportBench('hardening', {
    name: `10 MB adversarial inputs (${ADVERSARIAL_NAMES.length} kinds), slowest read or refusal`, median: worst.s, unit: 's', runs: 3,
    target: '<= 2 s each', note: slow.length ? `OVER 2 s: ${slow.join(', ')}` : `slowest: ${worst.name}`,
  });

  // --- long fuzz run, in-process (CI runs the same properties with a fixed seed and fewer runs)
  const runs = Number(process.env.LACUNA_FUZZ_LONG_RUNS ?? 200_000);
  const seed = Number(process.env.LACUNA_FUZZ_SEED ?? Date.now() % 1_000_000);
  let problems = 0;
  const t0 = performance.now();
  const res = fc.check(
    fc.property(mutatedFileArb(Object.keys(SEEDS), 8), ({ seed: s, muts }) => {
      const bytes = applyMutations(SEEDS[s], muts);
      let p: string[];
      try { p = checkRead(bytes, readReflections(bytes, { source: 'fuzz-input' }), 'fuzz-input'); } catch (e) { p = [String(e)]; }
      if (p.length) { problems++; process.stderr.write(`hardening: fuzz problem: ${p.join('; ')}\n`); }
      return p.length === 0;
    }),
    { seed, numRuns: runs, endOnFailure: true },
  );
  const cliRuns = Math.ceil(runs / 40);
  const cliDir = join(work, 'cli');
  mkdirSync(cliDir);
  const cliRes = await fc.check(
    fc.asyncProperty(mutatedFileArb(Object.keys(SEEDS), 4), fc.constantFrom('inspect', 'rank', 'lattice', 'layer'), async ({ seed: s, muts }, cmd) => {
      writeFileSync(join(cliDir, 'data.cif'), applyMutations(SEEDS[s], muts));
      let err = '';
      const argv = cmd === 'layer' ? [cmd, 'data.cif', '--plane', 'hk0', '--out', 'l.png', '--size', '200'] : [cmd, 'data.cif', '--json'];
      const code = await runCli(argv, { out: () => {}, err: (t) => { err += t; }, interactive: false, cwd: cliDir });
      const fine = code === 0 || (code === 2 && err.startsWith('error: '));
      if (!fine) { problems++; process.stderr.write(`hardening: fuzz problem: ${cmd} exit ${code}: ${err.slice(0, 500)}\n`); }
      return fine;
    }),
    { seed, numRuns: cliRuns, endOnFailure: true },
  );
  const fuzzS = (performance.now() - t0) / 1000;
  if (res.failed || cliRes.failed) failed = true;
  reportBench('hardening', {
    name: `fuzz long run: ${runs} mutated files + ${cliRuns} command runs (seed ${seed})`, median: fuzzS, unit: 's', runs: 1,
    target: '0 failures', note: `${problems} failures, ${((runs + cliRuns) / fuzzS).toFixed(0)} inputs/s`,
  });

  // --- 10M-observation unmerged file, whole processes, with peak resident memory
  const rows = Number(process.env.LACUNA_LARGE_ROWS ?? 10_000_000);
  const big = join(work, 'long-collection.cif');
  const label = rows >= 1e6 ? `${(rows / 1e6).toFixed(0)}M` : rows.toLocaleString('en');
  const tGen = performance.now();
  writeUnmergedCif(big, rows);
  const mb = statSync(big).size / 1e6;
  process.stderr.write(`hardening: wrote ${rows} observations (${mb.toFixed(0)} MB) in ${((performance.now() - tGen) / 1000).toFixed(1)} s\n`);

  // a private CLI bundle (dist/ may be rebuilt by others meanwhile) and a wrapper that reports peak RSS
  const bundleDir = join(work, 'cli-bundle');
  const b = spawnSync('npx', ['vite', 'build', '--mode', 'cli', '--outDir', bundleDir, '--emptyOutDir'], { cwd: root, encoding: 'utf8' });
  if (b.status !== 0) throw new Error(`CLI build failed: ${b.stderr}`);
  const wrapper = join(work, 'measure.mjs');
  writeFileSync(wrapper, [
    `const { runCli } = await import(${JSON.stringify(pathToFileURL(join(bundleDir, 'lacuna.js')).href)});`,
    `let out = 0; const code = await runCli(process.argv.slice(2), { out: (t) => { out += t.length; }, err: (t) => process.stderr.write(t), interactive: false, cwd: process.cwd() });`,
    `process.stdout.write(JSON.stringify({ code, out, maxRssKb: process.resourceUsage().maxRSS }) + '\\n');`,
  ].join('\n'));
  for (const cmd of ['inspect', 'rank']) {
    const wall: number[] = [];
    let rss = 0;
    for (let j = 0; j < 3; j++) {
      const t = performance.now();
      const r = spawnSync(process.execPath, [wrapper, cmd, big, '--json'], { cwd: work, encoding: 'utf8', maxBuffer: 1 << 20 });
      wall.push((performance.now() - t) / 1000);
      const m = JSON.parse(r.stdout.trim().split('\n').pop() ?? '{}');
      if (r.status !== 0 || m.code !== 0) { failed = true; process.stderr.write(`hardening: ${cmd} failed: ${r.stderr.slice(0, 500)}\n`); }
      rss = Math.max(rss, (m.maxRssKb ?? 0) / 1024);
    }
    reportBench('hardening', {
      name: `lacuna ${cmd}, ${label}-observation unmerged CIF (${mb.toFixed(0)} MB), whole process`, median: median(wall), unit: 's', runs: wall.length,
    });
    reportBench('hardening', {
      name: `lacuna ${cmd}, ${label} observations: peak resident memory`, median: rss, unit: 'MB', runs: wall.length, target: '<= 1024 MB',
      note: rss > 1024 ? 'OVER the bound' : 'largest of the runs',
    });
    if (rss > 1024) failed = true;
  }
} finally {
  rmSync(work, { recursive: true, force: true });
}
if (failed) process.exitCode = 1;
