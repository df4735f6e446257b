import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { runCli } from '../../src/cli';
import { realdata } from '../helpers/paths';
import { captureCli } from '../helpers/capture-cli';

const capture = captureCli;
async function inspect(args: string[], cwd?: string) {
  const c = capture(cwd);
  const code = await runCli(['inspect', ...args], c.ctx);
  return { code, out: c.out, err: c.err };
}

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'lacuna-inspect-')); });
afterAll(() => { rmSync(dir, { recursive: true, force: true }); });

describe('lacuna inspect on the real data (counts and cells from shared/realdata/README.md and the files)', () => {
  it('cod-1560875 --json has the contract keys and the right counts', async () => {
    const r = await inspect([realdata('cod-1560875.cif'), '--json']);
    expect(r.code).toBe(0);
    expect(r.err).toBe('');
    const j = JSON.parse(r.out);
    for (const key of ['reflections', 'rejected', 'unique', 'cell', 'd_min', 'd_max', 'mean_i_over_sigma', 'warnings', 'multiplicity', 'fraction_negative', 'rejected_reasons', 'wavelength', 'origin'])
      expect(j).toHaveProperty(key);
    expect(j.reflections).toBe(2551);
    expect(j.rejected).toBe(0);
    expect(j.unique).toBe(2551);
    expect(j.cell).toEqual({ a: 8.72, b: 8.93, c: 12.94, alpha: 90, beta: 90.32, gamma: 90 });
    expect(j.wavelength).toBe(0.71073);
    expect(j.origin).toBe('intensity');
    expect(j.d_min).toBeLessThan(j.d_max);
    expect(j.d_min).toBeGreaterThan(0.5);
  });
  it('cod-2014121 text output is readable and states the counts', async () => {
    const r = await inspect([realdata('cod-2014121.cif')]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/accepted\s+3651/);
    expect(r.out).toMatch(/rejected\s+0/);
    expect(r.out).toMatch(/cell\s+a 19.479 {2}b 5.61 {2}c 33.586/);
    expect(r.out).toMatch(/wavelength\s+not given/);
  });
  it('d range agrees with the largest and smallest 1/d over the rows (independent computation, orthorhombic formula)', async () => {
    const r = await inspect([realdata('cod-2014121.cif'), '--json']);
    const j = JSON.parse(r.out);
    const text = readFileSync(realdata('cod-2014121.cif'), 'latin1');
    let lo = Infinity, hi = 0;
    for (const s of text.split('\n')) {
      const f = s.trim().split(/\s+/).map(Number);
      if (f.length !== 5 || f.some((x) => !Number.isFinite(x))) continue;
      const q = (f[0] / 19.479) ** 2 + (f[1] / 5.61) ** 2 + (f[2] / 33.586) ** 2;
      lo = Math.min(lo, q); hi = Math.max(hi, q);
    }
    expect(j.d_min).toBeCloseTo(1 / Math.sqrt(hi), 10);
    expect(j.d_max).toBeCloseTo(1 / Math.sqrt(lo), 10);
  });
});

describe('lacuna inspect on other inputs', () => {
  it('reads gzip content whatever the file name, text with --cell, and reports rejections', async () => {
    const text = 'h k l I sigI\n1 0 0 10 1\n0 2 0 -5 1\n0 0 3 7 0\n1 0 0 12 1\n';
    writeFileSync(join(dir, 'data.hkl.gz'), gzipSync(text));
    writeFileSync(join(dir, 'no-suffix'), gzipSync(text));
    for (const f of ['data.hkl.gz', 'no-suffix']) {
      const r = await inspect([f, '--json', '--cell', '10,10,10,90,90,90'], dir);
      expect(r.code).toBe(0);
      const j = JSON.parse(r.out);
      expect(j.reflections).toBe(3);
      expect(j.rejected).toBe(1);
      expect(j.rejected_reasons).toEqual({ 'sigma <= 0': 1 });
      expect(j.unique).toBe(2);
      expect(j.multiplicity).toBe(1.5);
      expect(j.fraction_negative).toBeCloseTo(1 / 3, 12);
      expect(j.d_min).toBeCloseTo(5, 12); // 0 2 0 in a 10 A cubic cell
      expect(j.d_max).toBeCloseTo(10, 12);
      expect(j.mean_i_over_sigma).toBeCloseTo((10 - 5 + 12) / 3, 6);
    }
    const t = await inspect(['data.hkl.gz', '--cell', '10,10,10,90,90,90'], dir);
    expect(t.out).toMatch(/1 sigma <= 0 \(line 4\)/);
  });
  it('without a cell: resolution unknown and a warning', async () => {
    writeFileSync(join(dir, 'nocell.txt'), 'h k l F sigF\n1 2 3 4 1\n');
    const r = await inspect(['nocell.txt', '--json'], dir);
    const j = JSON.parse(r.out);
    expect(j.cell).toBeNull();
    expect(j.d_min).toBeNull();
    expect(j.origin).toBe('amplitude');
    expect(j.warnings.join('\n')).toMatch(/no unit cell/);
    expect(j.warnings.join('\n')).toMatch(/I = F\^2/);
  });
});

describe('lacuna inspect errors: exit 2 and an error: line with file and line', () => {
  it('a broken CIF names the line', async () => {
    const lines = readFileSync(realdata('cod-1560875.cif'), 'latin1').split('\n').slice(0, 20);
    lines.push('1 2 3 4');
    writeFileSync(join(dir, 'broken.cif'), lines.join('\n') + '\n');
    const r = await inspect(['broken.cif'], dir);
    expect(r.code).toBe(2);
    expect(r.out).toBe('');
    expect(r.err).toMatch(/^error: broken\.cif:21:7: the last row of the reflection loop has 4 values for 5 tags: the file ends in the middle of a row and looks cut off; copy or export it again\n$/);
  });
  it('missing file, bad --cell, bad block, unknown option, no file', async () => {
    let r = await inspect(['nope.cif'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^error: nope\.cif: cannot read the file: no such file/);
    r = await inspect([realdata('cod-1560875.cif'), '--cell', '1,2,3,90,90'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^error: --cell needs six numbers/);
    r = await inspect([realdata('cod-1560875.cif'), '--block', 'other'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/no data block named 'other' \(blocks in the file: cod1560875\)/);
    r = await inspect([realdata('cod-1560875.cif'), '--frobnicate'], dir);
    expect(r.code).toBe(2);
    r = await inspect([], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^error: 'inspect' needs an argument/);
    writeFileSync(join(dir, 'bad.gz'), Buffer.from([0x1f, 0x8b, 1, 2, 3]));
    r = await inspect(['bad.gz'], dir);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^error: bad\.gz: the file looks gzip-compressed but does not decompress/);
  });
  it('--help exits 0 and lists the options', async () => {
    const r = await inspect(['--help']);
    expect(r.code).toBe(0);
    for (const o of ['--cell', '--columns', '--block', '--json']) expect(r.out).toContain(o);
  });
});
