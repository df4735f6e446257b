import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { readReflections, summarizeReflections } from '../../src/io';
import { inspectJson } from '../../src/cli/commands/inspect';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../../src/cli';
import { PROGRESS_MIN_BYTES } from '../../src/cli/load-data';
import { MAX_PAGE_FILE_BYTES, fileTooLargeMessage } from '../../src/view';
import { writeUnmergedCif } from './make-unmerged';

/**
 * Very large input: an unmerged file above the size where the command line reads
 * in chunks (src/cli/stream-reflections.ts) and shows progress (3.5 million
 * observations, about 70 MB, written to the temp folder), read and analysed by
 * `lacuna inspect` and `lacuna rank` with every observation accounted for, and the
 * same answer as the whole-file reader. The 10-million-observation run, its time and
 * its memory (<= 1 GB resident) are measured in tests/bench/hardening.bench.ts.
 */

const ROWS = 3_500_000;
let dir = '';
let file = '';

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'lacuna-large-'));
  file = join(dir, 'long-collection.cif');
  writeUnmergedCif(file, ROWS);
}, 120_000);
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

async function lacuna(interactive: boolean, ...argv: string[]) {
  let out = '';
  let err = '';
  const code = await runCli(argv, { out: (t) => { out += t; }, err: (t) => { err += t; }, interactive, cwd: dir });
  return { code, out, err };
}

describe('a file larger than the progress threshold', () => {
  it('is larger than the threshold (so the chunked path runs)', () => {
    expect(statSync(file).size).toBeGreaterThan(PROGRESS_MIN_BYTES);
  });

  it('lacuna inspect reads every observation, with progress on stderr only when interactive', async () => {
    const r = await lacuna(true, 'inspect', 'long-collection.cif', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.rows_in_file).toBe(ROWS);
    expect(j.reflections + j.rejected).toBe(ROWS);
    expect(j.rejected).toBe(0);
    expect(j.unmerged).toBe(true);
    expect(r.err).toMatch(/reading long-collection\.cif: 100 % of \d+ MB/);
    expect(r.err).not.toContain('parsing'); // read in chunks, not whole (the whole-file path parses after reading)
    expect(r.err.endsWith('\r\x1b[K')).toBe(true); // the progress line is cleared at the end

    const quiet = await lacuna(false, 'inspect', 'long-collection.cif', '--json');
    expect(quiet.err).toBe('');
    expect(JSON.parse(quiet.out)).toEqual(j);

    // the same summary as from the whole-file reader
    const whole = readReflections(new Uint8Array(readFileSync(file)), { source: 'long-collection.cif' });
    if (!whole.ok) throw whole.error;
    expect(j).toEqual(JSON.parse(JSON.stringify(inspectJson(summarizeReflections(whole.value)))));
  }, 120_000);

  it('lacuna rank merges and ranks all observations, with progress when interactive', async () => {
    const r = await lacuna(true, 'rank', 'long-collection.cif', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect(j.input.observations).toBe(ROWS);
    expect(j.input.merged_from_unmerged).toBe(true);
    expect(j.candidates.length).toBeGreaterThan(0);
    expect(r.err).toMatch(/ranking: \S+ \d+ %/);
  }, 180_000);
});

describe('the page refuses files it cannot hold', () => {
  it('with the size, the limit and what to do instead', () => {
    expect(fileTooLargeMessage('big.cif', 100 * 2 ** 20)).toBeUndefined();
    expect(fileTooLargeMessage('big.cif', MAX_PAGE_FILE_BYTES)).toBeUndefined();
    expect(fileTooLargeMessage('big.cif', 600 * 2 ** 20)).toBe(
      'big.cif is 600 MB: the page opens reflection files up to 512 MB. Use the command line for it (npx lacuna inspect FILE, npx lacuna rank FILE), or merge the observations first.',
    );
    expect(fileTooLargeMessage('big.cif.gz', MAX_PAGE_FILE_BYTES + 1, true)).toBe(
      'big.cif.gz is more than 512 MB when unpacked: the page opens reflection files up to 512 MB. Use the command line for it (npx lacuna inspect FILE, npx lacuna rank FILE), or merge the observations first.',
    );
  });
});
