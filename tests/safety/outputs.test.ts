import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { inflateSync } from 'node:zlib';
import { runCli } from '../../src/cli';
import { readReflections, writeReflectionCif } from '../../src/io';
import { decodePng } from '../../shaders-free-render';
import type { ReflectionTable } from '../../src/core';
import { REPO_ROOT } from '../helpers/paths';
import { stripComments } from './code-scan';

/**
 * Nothing lost: every file the tool writes (simulated, reindexed to CIF or text,
 * layer pictures) reads back identically; the CLI never overwrites its input, and
 * writes outputs atomically (a temporary file beside the target, then a rename)
 * through the one shared helper, src/cli/write-output.ts.
 */

const COMMANDS = join(REPO_ROOT, 'src/cli/commands');

describe('every writing command goes through src/cli/write-output.ts', () => {
  const sources = readdirSync(COMMANDS).filter((f) => f.endsWith('.ts')).map((f) => ({ f, text: stripComments(readFileSync(join(COMMANDS, f), 'utf8')) }));

  it('commands with an --out option use checkOutputPath (with commandInputs, so --profile counts) and writeFileAtomically', () => {
    const writers = sources.filter((s) => /name:\s*'out'/.test(s.text));
    expect(writers.map((s) => s.f).sort()).toEqual(expect.arrayContaining(['layer.ts', 'reindex.ts', 'simulate.ts']));
    const missing = writers.filter((s) => !/checkOutputPath\s*\([^;]*commandInputs\s*\(/.test(s.text) || !/writeFileAtomically\s*\(/.test(s.text)).map((s) => s.f);
    expect(missing).toEqual([]);
  });

  it('no module under src/ writes files except write-output.ts', () => {
    const walk = (d: string): string[] => readdirSync(d, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? walk(join(d, e.name)) : [join(d, e.name)]));
    const offenders = walk(join(REPO_ROOT, 'src'))
      .filter((f) => /\.(ts|mjs)$/.test(f) && !f.endsWith('write-output.ts') && !f.endsWith('serve.mjs'))
      .filter((f) => /\b(writeFileSync|appendFileSync|createWriteStream|renameSync|writeSync|copyFileSync)\s*\(|\bwriteFile\s*\(/.test(stripComments(readFileSync(f, 'utf8'))));
    expect(offenders.map((f) => f.slice(REPO_ROOT.length + 1))).toEqual([]);
  });
});

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'lacuna-outputs-'));
  writeFileSync(join(dir, 'model.cif'), readFileSync(join(REPO_ROOT, 'public/demo/models/qm-104.cif')));
});
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

async function lacuna(...argv: string[]) {
  let out = '';
  let err = '';
  const code = await runCli(argv, { out: (t) => { out += t; }, err: (t) => { err += t; }, interactive: false, cwd: dir });
  return { code, out, err };
}

function read(name: string): ReflectionTable {
  const r = readReflections(new Uint8Array(readFileSync(join(dir, name))), { source: name });
  if (!r.ok) throw r.error;
  return r.value;
}

/** The columns and the cell, for exact comparison (Float32 values compared as stored). */
function content(t: ReflectionTable) {
  return { n: t.n, h: [...t.h], k: [...t.k], l: [...t.l], i: [...t.i], sigma: [...t.sigma], cell: t.meta.cell, rejected: t.meta.rejectedCount };
}

function noTemporaryFiles(): void {
  expect(readdirSync(dir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
}

describe('written files read back identically', () => {
  for (const unmerged of [false, true]) {
    it(`simulate${unmerged ? ' --unmerged' : ''}: the file holds what the command reports, and writing it again reads back the same`, async () => {
      const name = unmerged ? 'sim-u.cif' : 'sim.cif';
      const r = await lacuna('simulate', 'model.cif', '--dmin', '1.2', '--seed', '11', '--out', name, '--json', ...(unmerged ? ['--unmerged'] : []));
      expect(r.code).toBe(0);
      const t = read(name);
      expect(t.n).toBe(JSON.parse(r.out).reflections);
      expect(t.meta.rejectedCount).toBe(0);
      expect(t.meta.unmerged).toBe(unmerged);
      writeFileSync(join(dir, 'again.cif'), writeReflectionCif(t));
      expect(content(read('again.cif'))).toEqual(content(t));
      noTemporaryFiles();
    });
  }

  it('reindex with the identity, and there and back (a,b,-a-c is its own inverse), keeps every reflection and value', async () => {
    await lacuna('simulate', 'model.cif', '--dmin', '1.2', '--seed', '12', '--out', 'orig.cif');
    const orig = content(read('orig.cif'));
    expect((await lacuna('reindex', 'orig.cif', '--transform', 'a,b,c', '--out', 'same.cif')).code).toBe(0);
    expect(content(read('same.cif'))).toEqual(orig);
    expect((await lacuna('reindex', 'orig.cif', '--transform', 'a,b,-a-c', '--out', 'there.cif')).code).toBe(0);
    expect((await lacuna('reindex', 'there.cif', '--transform', 'a,b,-a-c', '--out', 'back.cif')).code).toBe(0);
    const back = content(read('back.cif'));
    // the cell goes through two metric transforms: equal to rounding
    for (const p of ['a', 'b', 'c', 'alpha', 'beta', 'gamma'] as const) expect(back.cell![p]).toBeCloseTo(orig.cell![p], 6);
    expect({ ...back, cell: undefined }).toEqual({ ...orig, cell: undefined });
    noTemporaryFiles();
  });

  it('reindex to delimited text (.txt, .csv, .tsv) reads back with the same rows', async () => {
    const orig = content(read('orig.cif'));
    for (const ext of ['txt', 'csv', 'tsv']) {
      const r = await lacuna('reindex', 'orig.cif', '--transform', 'a,b,c', '--out', `same.${ext}`);
      expect(r.code, r.err).toBe(0);
      const t = content(read(`same.${ext}`));
      expect({ ...t, cell: undefined }).toEqual({ ...orig, cell: undefined });
    }
  });

  it('layer writes a PNG of the requested size that decodes', async () => {
    const r = await lacuna('layer', 'orig.cif', '--plane', 'h0l', '--out', 'h0l.png', '--size', '320');
    expect(r.code, r.err).toBe(0);
    const img = decodePng(new Uint8Array(readFileSync(join(dir, 'h0l.png'))), (b) => new Uint8Array(inflateSync(b)));
    expect([img.width, img.height]).toEqual([320, 320]);
    noTemporaryFiles();
  });
});

describe('the input is never overwritten, outputs are whole or absent', () => {
  const refusal = (shown: string) =>
    `error: ${shown}: the output file is an input file; Lacuna never overwrites its input. Choose another --out name.\n`;

  it('simulate, reindex and layer refuse to write over their input (same name, other spelling, symlink)', async () => {
    const before = readFileSync(join(dir, 'orig.cif'));
    const model = readFileSync(join(dir, 'model.cif'));
    symlinkSync(join(dir, 'orig.cif'), join(dir, 'link.cif'));
    const cases: [string[], string][] = [
      [['reindex', 'orig.cif', '--transform', 'a,b,c', '--out', 'orig.cif'], 'orig.cif'],
      [['reindex', 'orig.cif', '--transform', 'a,b,c', '--out', './sub/../orig.cif'], './sub/../orig.cif'],
      [['reindex', 'orig.cif', '--transform', 'a,b,c', '--out', 'link.cif'], 'link.cif'],
      [['layer', 'orig.cif', '--plane', 'hk0', '--out', 'orig.cif'], 'orig.cif'],
      [['simulate', 'model.cif', '--dmin', '2', '--seed', '1', '--out', 'model.cif'], 'model.cif'],
    ];
    for (const [argv, shown] of cases) {
      const r = await lacuna(...argv);
      expect({ argv, code: r.code, err: r.err }).toEqual({ argv, code: 2, err: refusal(shown) });
    }
    expect(readFileSync(join(dir, 'orig.cif'))).toEqual(before);
    expect(readFileSync(join(dir, 'model.cif'))).toEqual(model);
    noTemporaryFiles();
  });

  it('the lab profile given with --profile is an input too', async () => {
    const profile = readFileSync(join(REPO_ROOT, 'public/profiles/fernbrook-small-molecule.json'));
    writeFileSync(join(dir, 'lab.json'), profile);
    for (const argv of [
      ['reindex', 'orig.cif', '--transform', 'a,b,c', '--out', 'lab.json', '--profile', 'lab.json'],
      ['simulate', 'model.cif', '--dmin', '2', '--seed', '1', '--out', 'lab.json', '--profile', 'lab.json'],
      ['layer', 'orig.cif', '--plane', 'hk0', '--out', 'lab.json', '--profile', 'lab.json'],
    ]) {
      const r = await lacuna(...argv);
      expect({ argv, code: r.code, err: r.err.split('\n').filter((l) => l.startsWith('error:')) }).toEqual({ argv, code: 2, err: [refusal('lab.json').trim()] });
    }
    expect(readFileSync(join(dir, 'lab.json'))).toEqual(profile);
  });

  it('an existing output is replaced whole (no tail of the old file), a missing folder writes nothing', async () => {
    writeFileSync(join(dir, 'old.cif'), 'x'.repeat(5_000_000));
    expect((await lacuna('reindex', 'orig.cif', '--transform', 'a,b,c', '--out', 'old.cif')).code).toBe(0);
    expect(content(read('old.cif'))).toEqual(content(read('orig.cif')));
    const r = await lacuna('reindex', 'orig.cif', '--transform', 'a,b,c', '--out', 'no-such-folder/new.cif');
    expect(r).toEqual({ code: 2, out: '', err: 'error: no-such-folder/new.cif: the folder no-such-folder does not exist\n' });
    expect(existsSync(join(dir, 'no-such-folder'))).toBe(false);
    noTemporaryFiles();
  });
});
