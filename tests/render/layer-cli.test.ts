import { describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { inflateSync } from 'node:zlib';
import { runCli } from '../../src/cli';
import { decodePng } from '../../shaders-free-render';
import { REPO_ROOT, realdata } from '../helpers/paths';
import { captureCli } from '../helpers/capture-cli';

const capture = () => captureCli(REPO_ROOT);

const DEMO = resolve(REPO_ROOT, 'public/demo/qm-101.cif');

describe('lacuna layer', () => {
  it('writes a PNG of the requested size with one spot per reflection on the layer', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'lacuna-layer-'));
    const out = join(dir, 'h0l.png');
    const c = capture();
    expect(await runCli(['layer', DEMO, '--plane', 'h0l', '--out', out, '--size', '400', '--group', '14', '--json'], c.ctx)).toBe(0);
    const summary = JSON.parse(c.out);
    // Count the h0l reflections independently of the renderer: rows with k = 0 in the file.
    const rows = readFileSync(DEMO, 'utf8').split('\n').filter((s) => /^-?\d+ -?\d+ -?\d+ /.test(s)).map((s) => s.split(/\s+/).map(Number));
    const expected = rows.filter((r) => r[1] === 0).length;
    expect(summary.reflections_on_layer).toBe(expected);
    expect(summary.spots_drawn).toBe(expected);
    expect(summary.group).toBe('P 1 21/c 1');
    expect(summary.forbidden_nodes_marked).toBeGreaterThan(0);
    const png = decodePng(new Uint8Array(readFileSync(out)), (b) => inflateSync(b));
    expect([png.width, png.height]).toEqual([400, 400]);
    const colours = new Set<number>();
    for (let p = 0; p < png.data.length; p += 4 * 7) colours.add((png.data[p] << 16) | (png.data[p + 1] << 8) | png.data[p + 2]);
    expect(colours.size).toBeGreaterThan(20);
    expect(readdirSync(dir)).toEqual(['h0l.png']); // no temporary file left behind
  });

  it('draws a real data set (COD 2014121, published P c a 21) with its forbidden 0kl nodes', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'lacuna-layer-'));
    const c = capture();
    expect(await runCli(['layer', realdata('cod-2014121.cif'), '--plane', '0kl', '--out', join(dir, 'a.png'), '--group', 'P c a 21', '--json'], c.ctx)).toBe(0);
    const s = JSON.parse(c.out);
    expect(s.spots_drawn).toBe(s.reflections_on_layer);
    // The deposited data had the forbidden reflections removed (shared/realdata/README.md): none can violate.
    expect(s.violations).toBe(0);
  });

  it('refuses bad input with exit 2 and a located message', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'lacuna-layer-'));
    const cases: Array<[string[], RegExp]> = [
      [['layer', DEMO, '--plane', 'hx0', '--out', join(dir, 'x.png')], /^error: --plane: unknown layer 'hx0'/],
      [['layer', DEMO, '--plane', '2,2,0,1', '--out', join(dir, 'x.png')], /no reciprocal-lattice node lies on/],
      [['layer', DEMO, '--out', join(dir, 'x.png')], /needs --plane/],
      [['layer', DEMO, '--plane', 'hk0', '--out', join(dir, 'x.png'), '--size', '12'], /--size/],
      [['layer', join(dir, 'missing.cif'), '--plane', 'hk0', '--out', join(dir, 'x.png')], /missing\.cif: cannot read the file/],
      [['layer', DEMO, '--plane', 'hk0', '--out', join(dir, 'no-such-dir', 'x.png')], /does not exist/],
      [['layer', DEMO, '--plane', 'hk0', '--out', DEMO], /never overwrites its input/],
      [['layer', DEMO, '--plane', 'hk0', '--out', join(dir, 'x.png'), '--group', 'Q 9'], /unknown space-group symbol/],
    ];
    for (const [argv, re] of cases) {
      const c = capture();
      expect(await runCli(argv, c.ctx), argv.join(' ')).toBe(2);
      expect(c.err, argv.join(' ')).toMatch(re);
    }
    expect(existsSync(join(dir, 'x.png'))).toBe(false);
  });
});
