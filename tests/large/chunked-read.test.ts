import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { readReflections } from '../../src/io';
import { readReflectionsInChunks } from '../../src/cli/stream-reflections';
import type { ReflectionTable, Result } from '../../src/core';
import { REPO_ROOT, REALDATA_DIR } from '../helpers/paths';
import { SEEDS } from '../fuzz/seeds';
import { applyMutations, mutatedFileArb } from '../fuzz/mutate';
import { FUZZ_RUNS, FUZZ_SEED } from '../fuzz/fuzz-config';
import { writeUnmergedCif } from './make-unmerged';

/**
 * The chunked reader (src/cli/stream-reflections.ts, used for files from 64 MB on)
 * must give exactly what the whole-file reader gives: same rows, same values, same
 * counts, rejected lines and warnings; or decline (undefined) so the caller reads
 * the file whole. Checked with tiny chunks on every seed, the demo and real data,
 * damaged files, and a generated unmerged file.
 */

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'lacuna-chunked-')); });
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

function plain(r: Result<ReflectionTable>) {
  if (!r.ok) return { error: r.error.describe() };
  const t = r.value;
  return { n: t.n, h: Array.from(t.h), k: Array.from(t.k), l: Array.from(t.l), i: Array.from(t.i), sigma: Array.from(t.sigma), meta: t.meta };
}

/** Chunked and whole-file reads of `bytes`; chunked is undefined when it declined. */
function both(name: string, bytes: Uint8Array, chunkBytes: number) {
  const path = join(dir, name);
  writeFileSync(path, bytes);
  const whole = readReflections(new Uint8Array(readFileSync(path)), { source: name });
  const chunked = readReflectionsInChunks(path, bytes.length, { source: name }, { chunkBytes });
  return { whole: plain(whole), chunked: chunked === undefined ? undefined : plain(chunked) };
}

const enc = (s: string) => new TextEncoder().encode(s);

describe('chunked reading equals whole-file reading', () => {
  it('every seed file, with chunks from 1 KB down to a few lines (and it does stream them)', () => {
    for (const [name, text] of Object.entries(SEEDS)) {
      // repeat the rows so there are many chunks
      const lines = text.split('\n');
      const firstRow = lines.findIndex((l) => /^-?\d/.test(l.trim()) || /^1 1 /.test(l));
      const body = lines.slice(firstRow).filter((l) => /\S/.test(l) && !l.startsWith('#'));
      const big = [...lines.slice(0, firstRow), ...Array.from({ length: 40 }, () => body).flat(), ''].join('\n');
      for (const chunk of [1024, 300, 97]) {
        const { whole, chunked } = both(name, enc(big), chunk);
        expect(chunked, `${name} (${chunk} B chunks) was not streamed`).toBeDefined();
        expect(chunked, `${name} (${chunk} B chunks)`).toEqual(whole);
      }
    }
  });

  it('the demo data sets and the real data', () => {
    const files = ['qm-101.cif', 'qm-102.cif', 'qm-103.cif', 'qm-104.cif'].map((f) => join(REPO_ROOT, 'public/demo', f));
    files.push(join(REALDATA_DIR, 'cod-1560875.cif'), join(REALDATA_DIR, 'cod-2014121.cif'));
    for (const f of files) {
      const bytes = new Uint8Array(readFileSync(f));
      const { whole, chunked } = both('data.cif', bytes, 4096);
      if (chunked !== undefined) expect(chunked, f).toEqual(whole);
    }
  });

  it('a generated unmerged file with rejected rows spread over the chunks', () => {
    const path = join(dir, 'u.cif');
    writeUnmergedCif(path, 20_000);
    const text = readFileSync(path, 'latin1').split('\n');
    for (let j = 40; j < text.length - 1; j += 997) text[j] = text[j].replace(/ \S+$/, j % 2 ? ' 0' : ' ?'); // sigma 0 or missing
    const { whole, chunked } = both('u2.cif', enc(text.join('\n')), 8192);
    expect(chunked).toBeDefined();
    expect(chunked).toEqual(whole);
    expect((whole as { meta: { rejectedCount: number } }).meta.rejectedCount).toBeGreaterThan(15);
  });

  it('a lone CR (old line end) among the rows, before a rejected row: declined or equal', () => {
    // beyond the first 8 MB, which are checked as a whole before chunking starts
    const path = join(dir, 'u.cif');
    writeUnmergedCif(path, 450_000);
    const text = readFileSync(path, 'latin1').split('\n');
    text[440_000] = text[440_000] + '\r '; // a line end to the CIF reader, not to a line count by LF
    text[445_000] = text[445_000].replace(/ \S+$/, ' 0'); // rejected, in a later chunk
    const { whole, chunked } = both('cr.cif', enc(text.join('\n')), 1 << 16);
    if (chunked !== undefined) expect(chunked).toEqual(whole);
  });

  it('rows shifted in the last chunk (a value missing on one line, one extra on a later one): the warning names the file line', () => {
    const path = join(dir, 'u.cif');
    writeUnmergedCif(path, 3000);
    const text = readFileSync(path, 'latin1').split('\n');
    text[2900] = text[2900].replace(/ \S+$/, '');
    text[2950] = text[2950] + ' 7.5';
    const { whole, chunked } = both('shift.cif', enc(text.join('\n')), 4096);
    expect((whole as { meta: { warnings: string[] } }).meta.warnings.join(' ')).toMatch(/line 2901\b/);
    if (chunked !== undefined) expect(chunked).toEqual(whole);
  });

  it('damaged files: equal, or declined', () => {
    fc.assert(
      fc.property(mutatedFileArb(Object.keys(SEEDS), 6), fc.integer({ min: 20, max: 600 }), ({ seed, muts }, chunk) => {
        const text = SEEDS[seed];
        const big = text + text.split('\n').filter((l) => /^-?\d/.test(l.trim())).join('\n').repeat(1) + '\n';
        const { whole, chunked } = both('m.dat', applyMutations(big, muts), chunk);
        if (chunked !== undefined) expect(chunked).toEqual(whole);
      }),
      { seed: FUZZ_SEED + 20, numRuns: Math.ceil(FUZZ_RUNS / 2), endOnFailure: true },
    );
  });
});
