// Viewer benchmarks in headless Chromium without a GPU (Debian's /usr/bin/chromium):
//   the CPU renderer (shaders-free-render) at 100,000 and 1,000,000 points, software WebGL beside it,
//   and the time from choosing a 100,000-reflection file to the first picture.
// Plain .mjs (not bundled) so serve.mjs finds the repository from its own path.
// Rows in the run.mjs format: {"bench","name","median","unit","runs","target","note"}.
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { startServer } from '../../src/cli/serve.mjs';

const CHROMIUM = '/usr/bin/chromium';
const FLAGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--enable-unsafe-swiftshader'];
const RUNS = 3;

function report(name, values, unit, target, note) {
  const s = [...values].sort((a, b) => a - b);
  const median = s.length % 2 ? s[s.length >> 1] : 0.5 * (s[s.length / 2 - 1] + s[s.length / 2]);
  process.stdout.write(JSON.stringify({ bench: 'view', name, median, unit, runs: values.length, target, note }) + '\n');
}

if (!existsSync(CHROMIUM)) {
  console.error(`view bench: ${CHROMIUM} not found (Debian package 'chromium'); skipped`);
  process.exit(process.env.CI === 'true' ? 1 : 0);
}

/** A CIF 1.1 file with `n` invented reflections (monoclinic cell), written without the app's code. */
function cifWith(n) {
  const lines = ['data_bench', '_cell_length_a 10.2', '_cell_length_b 12.6', '_cell_length_c 14.1', '_cell_angle_alpha 90', '_cell_angle_beta 101.5', '_cell_angle_gamma 90',
    'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_squared_meas', '_refln_F_squared_sigma'];
  let count = 0;
  const R = Math.ceil(Math.cbrt(n) / 2) + 1;
  outer: for (let h = -R; h <= R; h++) for (let k = -R; k <= R; k++) for (let l = -R; l <= R; l++) {
    if (h === 0 && k === 0 && l === 0) continue;
    const i = 50 + ((h * 7919 + k * 104729 + l * 1299709) >>> 0) % 5000;
    lines.push(`${h} ${k} ${l} ${i}.0 ${(Math.sqrt(i) + 2).toFixed(1)}`);
    if (++count >= n) break outer;
  }
  return lines.join('\n') + '\n';
}

const server = await startServer({ port: 0, build: true, log: (s) => process.stderr.write(s) });
const base = server.url.replace('localhost', '127.0.0.1');
const dir = mkdtempSync(join(tmpdir(), 'lacuna-view-bench-'));
const context = await chromium.launchPersistentContext(join(dir, 'profile'), { executablePath: CHROMIUM, headless: true, args: FLAGS, viewport: { width: 1366, height: 768 } });

async function frameTime(renderer, points, frames) {
  const page = await context.newPage();
  await page.goto(`${base}?renderer=${renderer}&synthetic=${points}&bench=${frames}`);
  await page.waitForFunction(() => document.getElementById('bench-result')?.textContent, null, { timeout: 300_000 });
  const r = JSON.parse(await page.locator('#bench-result').textContent());
  await page.close();
  if (r.renderer !== renderer) throw new Error(`asked for ${renderer}, the page used ${r.renderer}`);
  return r;
}

try {
  const size = '1366x768 window (3D view about 500x430 px)';
  for (const [points, target] of [[100_000, '<= 4 ms'], [1_000_000, '<= 25 ms']]) {
    const t = [];
    for (let j = 0; j < RUNS; j++) t.push((await frameTime('cpu', points, 60)).ms_per_frame);
    report(`CPU renderer, ${points.toLocaleString('en')} points`, t, 'ms/frame', target, `median frame of 60, steady rotation; ${size}`);
  }
  for (const [points, frames] of [[100_000, 10], [1_000_000, 3]]) {
    const t = [];
    for (let j = 0; j < RUNS; j++) t.push((await frameTime('webgl', points, frames)).ms_per_frame);
    report(`software WebGL (SwiftShader), ${points.toLocaleString('en')} points`, t, 'ms/frame', '(for comparison)', `three.js PointsMaterial, median frame of ${frames}`);
  }
  const file = join(dir, 'bench-100k.cif');
  writeFileSync(file, cifWith(100_000));
  const first = [];
  for (let j = 0; j < RUNS; j++) {
    const page = await context.newPage();
    await page.goto(`${base}?renderer=auto&data=none.cif`);
    await page.waitForSelector('body[data-app="ready"]', { state: 'attached' });
    await page.waitForSelector('#message:not([hidden])');
    await page.locator('#file-input').setInputFiles(file);
    await page.waitForFunction(() => document.body.dataset.firstPictureMs, null, { timeout: 120_000 });
    first.push(Number(await page.evaluate(() => document.body.dataset.firstPictureMs)) / 1000);
    await page.close();
  }
  report('first picture of a 100,000-reflection CIF', first, 's', '<= 1 s', 'from choosing the file to the first frame (read, parse in the worker, draw)');
} finally {
  await context.close();
  await server.close();
  rmSync(dir, { recursive: true, force: true });
}
