import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli';
import { readReflections } from '../../src/io';
import { parseChangeOfBasis, reindexTable } from '../../src/lattice';
import { realdata, REPO_ROOT } from '../helpers/paths';
import { captureCli } from '../helpers/capture-cli';

const capture = captureCli;

function read(path: string) {
  const r = readReflections(new Uint8Array(readFileSync(path)), { source: path });
  if (!r.ok) throw r.error;
  return r.value;
}

describe('lacuna reindex', () => {
  const dir = mkdtempSync(join(tmpdir(), 'lacuna-reindex-'));
  const input = realdata('cod-1560875.cif');

  it('writes a CIF that reads back as exactly the reindexed table', async () => {
    const out = join(dir, 'c-setting.cif');
    const c = capture();
    expect(await runCli(['reindex', input, '--transform', 'a,b,a+c', '--out', out], c.ctx)).toBe(0);
    expect(c.out).toMatch(/wrote .*2551 reflections reindexed with a,b,a\+c \(det 1\)/);
    const p = parseChangeOfBasis('a,b,a+c');
    if (!p.ok) throw p.error;
    const expected = reindexTable(read(input), p.value);
    if (!expected.ok) throw expected.error;
    const back = read(out);
    expect(back.n).toBe(expected.value.n);
    expect(Array.from(back.h)).toEqual(Array.from(expected.value.h));
    expect(Array.from(back.k)).toEqual(Array.from(expected.value.k));
    expect(Array.from(back.l)).toEqual(Array.from(expected.value.l));
    expect(Array.from(back.i)).toEqual(Array.from(expected.value.i));
    expect(Array.from(back.sigma)).toEqual(Array.from(expected.value.sigma));
    expect(back.meta.cell).toEqual(expected.value.meta.cell);
  });

  it('round trips through two files back to the original data', async () => {
    const mid = join(dir, 'mid.cif');
    const end = join(dir, 'end.cif');
    expect(await runCli(['reindex', input, '--transform', 'b,c,a', '--out', mid], capture().ctx)).toBe(0);
    expect(await runCli(['reindex', mid, '--transform', 'c,a,b', '--out', end], capture().ctx)).toBe(0);
    const a = read(input), b = read(end);
    expect(Array.from(b.h)).toEqual(Array.from(a.h));
    expect(Array.from(b.k)).toEqual(Array.from(a.k));
    expect(Array.from(b.l)).toEqual(Array.from(a.l));
    expect(Array.from(b.i)).toEqual(Array.from(a.i));
    expect(Array.from(b.sigma)).toEqual(Array.from(a.sigma));
    for (const k of ['a', 'b', 'c', 'alpha', 'beta', 'gamma'] as const) expect(b.meta.cell![k]).toBeCloseTo(a.meta.cell![k], 9);
  });

  it('never overwrites its input and explains bad transforms with exit 2', async () => {
    const copy = join(dir, 'copy.cif');
    writeFileSync(copy, readFileSync(input));
    const before = readFileSync(copy, 'utf8');
    const c1 = capture(dir);
    expect(await runCli(['reindex', 'copy.cif', '--transform', 'b,c,a', '--out', './copy.cif'], c1.ctx)).toBe(2);
    expect(c1.err).toMatch(/^error: .*never overwrites its input/);
    expect(readFileSync(copy, 'utf8')).toBe(before);
    const c2 = capture();
    expect(await runCli(['reindex', input, '--transform', 'a,b,a+b', '--out', join(dir, 'x.cif')], c2.ctx)).toBe(2);
    expect(c2.err).toMatch(/^error: --transform: .*singular/);
    expect(existsSync(join(dir, 'x.cif'))).toBe(false);
    const c3 = capture();
    expect(await runCli(['reindex', input, '--transform', '1/2a+1/2b,-1/2a+1/2b,c', '--out', join(dir, 'x.cif')], c3.ctx)).toBe(2);
    expect(c3.err).toMatch(/non-integer indices/);
    const c4 = capture();
    expect(await runCli(['reindex', input, '--out', join(dir, 'x.cif')], c4.ctx)).toBe(2);
    expect(c4.err).toMatch(/needs --transform/);
  });

  it('warns on stderr when the hand changes (a,b,-a-c has determinant -1)', async () => {
    const c = capture();
    expect(await runCli(['reindex', input, '--transform', 'a,b,-a-c', '--out', join(dir, 'left.cif')], c.ctx)).toBe(0);
    expect(c.err).toMatch(/^warning: .*left-handed/);
  });

  it('drops and counts non-integral rows only when asked', async () => {
    const c = capture();
    const code = await runCli(['reindex', input, '--transform', '1/2a+1/2b,-1/2a+1/2b,c', '--drop-nonintegral', '--out', join(dir, 'p.cif'), '--json'], c.ctx);
    expect(code).toBe(0);
    const doc = JSON.parse(c.out);
    expect(doc.left_out).toBeGreaterThan(0);
    expect(doc.reflections_in).toBe(doc.reflections_out + doc.left_out);
    expect(doc.warnings.join()).toMatch(/left out/);
  });
});

describe('lacuna reindex to the lab\'s text export', () => {
  const dir = mkdtempSync(join(tmpdir(), 'lacuna-reindex-text-'));
  const input = realdata('cod-1560875.cif');
  it('writes the profile\'s column names and delimiter, and the text reads back to the same numbers', async () => {
    const out = join(dir, 'export.csv');
    const c = capture(REPO_ROOT);
    expect(await runCli(['reindex', input, '--transform', 'a,b,a+c', '--out', out, '--profile', 'public/profiles/fernbrook-copper-source.json'], c.ctx)).toBe(0);
    const text = readFileSync(out, 'utf8');
    const lines = text.split('\n').filter((x) => x && !x.startsWith('#'));
    expect(lines[0]).toBe('H,K,L,I_obs,sigma_I'); // the names in fernbrook-copper-source.json
    const back = readReflections(new Uint8Array(readFileSync(out)), { source: out, columns: ['h', 'k', 'l', 'i', 'sigi'] });
    if (!back.ok) throw back.error;
    const cif = join(dir, 'same.cif');
    expect(await runCli(['reindex', input, '--transform', 'a,b,a+c', '--out', cif], capture().ctx)).toBe(0);
    const ref = read(cif);
    expect(back.value.n).toBe(ref.n);
    expect(Array.from(back.value.l)).toEqual(Array.from(ref.l));
    expect(Array.from(back.value.i)).toEqual(Array.from(ref.i));
    expect(Array.from(back.value.sigma)).toEqual(Array.from(ref.sigma));
  });
});
