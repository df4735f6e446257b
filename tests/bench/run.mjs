#!/usr/bin/env node
// `npm run bench`: runs every benchmark in tests/bench and prints one table of medians.
//
// A benchmark is a file tests/bench/NAME.bench.ts (or .bench.mjs). Each runs in its own
// Node process (fresh heap; started with --expose-gc), .ts files bundled first with vite.
// It reports by printing result rows on stdout, one JSON object per line:
//   {"bench":"io","name":"read 1M mmCIF","median":0.143,"unit":"s","runs":7,"target":"<= 0.2 s","note":"..."}
// Lines that are not such objects are passed through to stderr. See DEVELOPERS.md.
//
// Usage: node tests/bench/run.mjs [FILTER]   (FILTER: substring of the bench file names)
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { availableParallelism, cpus, tmpdir } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const root = resolve(here, '../..');
const filter = process.argv[2] ?? '';
const files = readdirSync(here)
  .filter((f) => /\.bench\.(ts|mjs)$/.test(f) && f.includes(filter))
  .sort();
if (files.length === 0) {
  console.error(`bench: no *.bench.ts or *.bench.mjs files in ${here}${filter ? ` matching '${filter}'` : ''}`);
  process.exit(2);
}

const out = mkdtempSync(join(tmpdir(), 'lacuna-bench-'));
const rows = [];
const failures = [];
try {
  const { build } = await import('vite');
  for (const f of files) {
    let entry = join(here, f);
    if (f.endsWith('.ts')) {
      const name = basename(f, '.ts');
      await build({
        configFile: false,
        root,
        logLevel: 'warn',
        // bundles run from the temp folder, where node_modules cannot be found: bundle the test-only packages
        ssr: { noExternal: ['fast-check', 'pure-rand'] },
        build: {
          ssr: entry,
          outDir: join(out, name),
          emptyOutDir: true,
          target: 'node20',
          minify: false,
          rollupOptions: { output: { entryFileNames: `${name}.mjs`, format: 'es' } },
        },
      });
      entry = join(out, name, `${name}.mjs`);
    }
    process.stderr.write(`bench: running ${f}\n`);
    const r = spawnSync(process.execPath, ['--expose-gc', entry], {
      cwd: root,
      encoding: 'utf8',
      maxBuffer: 64 << 20,
      env: { ...process.env, LACUNA_ROOT: root },
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    for (const line of (r.stdout ?? '').split('\n')) {
      const t = line.trim();
      if (!t) continue;
      let row;
      try { row = t.startsWith('{"bench"') ? JSON.parse(t) : undefined; } catch { row = undefined; }
      if (row) rows.push(row);
      else process.stderr.write(t + '\n');
    }
    if (r.status !== 0) failures.push(`${f}: exit code ${r.status}${r.error ? ' (' + r.error.message + ')' : ''}`);
  }
} finally {
  rmSync(out, { recursive: true, force: true });
}

const cores = typeof availableParallelism === 'function' ? availableParallelism() : cpus().length;
const fmt = (x) => (typeof x === 'number' ? (Math.abs(x) >= 100 ? x.toFixed(0) : Math.abs(x) >= 1 ? x.toFixed(2) : x.toPrecision(3)) : String(x ?? ''));
const table = [['bench', 'measure', 'median', 'unit', 'runs', 'target', 'note']];
for (const r of rows) table.push([r.bench, r.name, fmt(r.median), r.unit ?? '', String(r.runs ?? ''), r.target ?? '', r.note ?? '']);
const widths = table[0].map((_, j) => Math.max(...table.map((row) => row[j].length)));
console.log(`Lacuna benchmarks: ${cores} cores (${cpus()[0]?.model ?? 'unknown cpu'}), Node ${process.version}, medians`);
for (const [j, row] of table.entries()) {
  console.log(row.map((c, k) => (k === 2 || k === 4 ? c.padStart(widths[k]) : c.padEnd(widths[k]))).join('  ').trimEnd());
  if (j === 0) console.log(widths.map((w) => '-'.repeat(w)).join('  '));
}
if (failures.length) {
  console.error('bench: failures:\n  ' + failures.join('\n  '));
  process.exit(1);
}
