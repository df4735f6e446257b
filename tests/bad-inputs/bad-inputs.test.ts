import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { runCli } from '../../src/cli';
import { readReflections } from '../../src/io';
import { REPO_ROOT } from '../helpers/paths';

/**
 * The catalogue of bad inputs: one small file per case in tests/bad-inputs/files/,
 * each with the exact message a user gets from `lacuna inspect` (and `lacuna rank`
 * where the ranking has something to say). Messages say what is wrong, where
 * (file:line:column) and what to do. Expected texts are written out here by hand:
 * they are the product, so a change in wording must show up as a failing test.
 *
 * The files are invented (lab "qm", made-up cell) and written by hand.
 */

const FILES = join(REPO_ROOT, 'tests/bad-inputs/files');

async function lacuna(...argv: string[]) {
  let out = '';
  let err = '';
  const code = await runCli(argv, { out: (t) => { out += t; }, err: (t) => { err += t; }, interactive: false, cwd: FILES });
  return { code, out, err };
}

/** Files the reader refuses as a whole: the same exact `error:` line from inspect and rank, exit code 2, nothing on stdout. */
const REFUSED: { file: string; why: string; message: string }[] = [
  {
    file: 'empty.cif', why: 'empty file',
    message: 'error: empty.cif: the file is empty. A reflection file holds CIF or text rows; check that the export finished writing.',
  },
  {
    file: 'binary.cif', why: 'binary file (the start of a PNG image)',
    message: 'error: binary.cif:2:1: the file is not text: it holds the control byte 0x1a. Lacuna reads CIF, mmCIF or delimited text (gzip-compressed or not); check that this is the reflection file.',
  },
  {
    file: 'truncated-loop.cif', why: 'file cut off in the middle of a row',
    message: 'error: truncated-loop.cif:18:3: the last row of the reflection loop has 2 values for 5 tags: the file ends in the middle of a row and looks cut off; copy or export it again',
  },
  {
    file: 'wrong-count.cif', why: 'one row of the loop lacks a value (line 16)',
    message: 'error: wrong-count.cif:16:1: the values of the reflection loop do not fill whole rows of 5: the rows stop lining up here (a value is missing or extra on this line, or a value with spaces lacks its quotes); write ? for an unknown value',
  },
  {
    file: 'duplicate-tags.cif', why: 'a cell tag given twice in one block',
    message: "error: duplicate-tags.cif:5:1: tag '_cell_length_a' occurs twice in data block 'qm_bad' (first on line 2). CIF allows each tag once per data block; keep the right one.",
  },
  {
    file: 'duplicate-loop-tag.cif', why: 'a tag given twice in the reflection loop',
    message: "error: duplicate-loop-tag.cif:13:1: tag '_refln_index_k' appears twice in the reflection loop (lines 10 and 13). Each column of a loop needs its own tag; remove or rename one.",
  },
  {
    file: 'impossible-cell.cif', why: 'cell angle beyond 180 degrees',
    message: 'error: impossible-cell.cif:2: the cell in the file is impossible: cell angle beta = 191.25 must lie strictly between 0 and 180 degrees. Give the right one with --cell a,b,c,alpha,beta,gamma.',
  },
  {
    file: 'unknown-column.txt', why: 'text header with unknown names for the intensity and its sigma',
    message: 'error: unknown-column.txt:1:1: no column named I (or F) (columns: h k l intens esd). The first line must name the columns (e.g. "h k l I sigI"), or give --columns h,k,l,i,sigi.',
  },
  {
    file: 'unknown-column.cif', why: 'CIF loop whose value and sigma tags are not in the dictionary',
    message: 'error: unknown-column.cif:2:1: the reflection loop has indices but no measured values (looked for _refln_f_squared_meas, _refln_intensity_meas, _refln_f_meas_au, _refln_f_meas; the loop has _refln_index_h, _refln_index_k, _refln_index_l, _refln_intensity_obs, _refln_intensity_esd). Name the five columns to use with --columns h,k,l,value,sigma (tags of this loop).',
  },
  {
    file: 'truncated.cif.gz', why: 'gzip file cut off after 150 bytes',
    message: 'error: truncated.cif.gz: the file looks gzip-compressed but does not decompress (unexpected end of file). It is probably cut off or damaged; copy or download it again.',
  },
  {
    file: 'structure-model.cif', why: 'a structure model given where reflections are expected',
    message: 'error: structure-model.cif: no reflection loop found (data blocks: qm_model): this looks like a structure model (it has atom sites). Give a reflection file here; models go to lacuna sf, compare and simulate.',
  },
  {
    file: 'no-header.txt', why: 'text rows without a header naming the columns',
    message: 'error: no-header.txt:1:1: no header row naming the columns. Add a first line such as "h k l I sigI", or give --columns h,k,l,i,sigi.',
  },
];

describe('files refused as a whole: exact message, exit code 2', () => {
  for (const c of REFUSED) {
    it(`${c.file} (${c.why})`, async () => {
      for (const cmd of ['inspect', 'rank']) {
        const r = await lacuna(cmd, c.file);
        expect({ cmd, code: r.code, out: r.out, err: r.err }).toEqual({ cmd, code: 2, out: '', err: c.message + '\n' });
      }
    });
  }
  it('an impossible --cell is named as the option', async () => {
    const r = await lacuna('inspect', 'crlf.cif', '--cell', '5,5,5,90,90,200');
    expect(r).toEqual({ code: 2, out: '', err: 'error: --cell: cell angle gamma = 200 must lie strictly between 0 and 180 degrees\n' });
  });
});

/**
 * Files read with some rows rejected: inspect names each reason with its lines, the
 * counts add up to the rows in the file, and rank says why it cannot go on.
 */
const PARTLY: { file: string; why: string; rows: number; accepted: number; lines: string[]; reasons: Record<string, number>; rank: string }[] = [
  {
    file: 'non-numeric-index.cif', why: "index 'x' and index 1.5", rows: 4, accepted: 2,
    lines: ['1 non-numeric value (line 15)', '1 non-integer index (line 17)'],
    reasons: { 'non-numeric value': 1, 'non-integer index': 1 },
    rank: 'error: non-numeric-index.cif: only 2 reflections (2 of the 4 rows in the file were rejected: 1 non-numeric value, 1 non-integer index): too few to test reflection conditions or intensity statistics (at least 20 needed). Use the full data set (merged or unmerged) from the integration.',
  },
  {
    file: 'missing-values.cif', why: '? for an intensity, . for a sigma', rows: 4, accepted: 2,
    lines: ['2 missing value (? or . or empty) (lines 15, 16)'],
    reasons: { 'missing value (? or . or empty)': 2 },
    rank: 'error: missing-values.cif: only 2 reflections (2 of the 4 rows in the file were rejected: 2 missing value (? or . or empty)): too few to test reflection conditions or intensity statistics (at least 20 needed). Use the full data set (merged or unmerged) from the integration.',
  },
  {
    file: 'nan-inf.cif', why: 'NaN, inf and 1e400 (overflows)', rows: 5, accepted: 2,
    lines: ['3 NaN or infinite value (lines 15, 16, 17)'],
    reasons: { 'NaN or infinite value': 3 },
    rank: 'error: nan-inf.cif: only 2 reflections (3 of the 5 rows in the file were rejected: 3 NaN or infinite value): too few to test reflection conditions or intensity statistics (at least 20 needed). Use the full data set (merged or unmerged) from the integration.',
  },
  {
    file: 'index-out-of-range.cif', why: 'indices 40000 and -99999999999', rows: 4, accepted: 2,
    lines: ['2 index out of range (|h|, |k| or |l| > 32767) (lines 15, 16)'],
    reasons: { 'index out of range (|h|, |k| or |l| > 32767)': 2 },
    rank: 'error: index-out-of-range.cif: only 2 reflections (2 of the 4 rows in the file were rejected: 2 index out of range (|h|, |k| or |l| > 32767)): too few to test reflection conditions or intensity statistics (at least 20 needed). Use the full data set (merged or unmerged) from the integration.',
  },
  {
    file: 'sigma-not-positive.cif', why: 'sigma 0 and sigma -2.2', rows: 4, accepted: 2,
    lines: ['2 sigma <= 0 (lines 15, 16)'],
    reasons: { 'sigma <= 0': 2 },
    rank: 'error: sigma-not-positive.cif: only 2 reflections (2 of the 4 rows in the file were rejected: 2 sigma <= 0): too few to test reflection conditions or intensity statistics (at least 20 needed). Use the full data set (merged or unmerged) from the integration.',
  },
];

describe('files read with rows rejected: every rejected row named, counts add up', () => {
  for (const c of PARTLY) {
    it(`${c.file} (${c.why})`, async () => {
      const text = await lacuna('inspect', c.file);
      expect(text.code).toBe(0);
      expect(text.err).toBe('');
      expect(text.out).toMatch(new RegExp(`^rows in file +${c.rows}$`, 'm'));
      expect(text.out).toMatch(new RegExp(`^accepted +${c.accepted}$`, 'm'));
      expect(text.out).toMatch(new RegExp(`^rejected +${c.rows - c.accepted}$`, 'm'));
      const shown = text.out.split('\n').filter((l) => /^ {4,}\d/.test(l)).map((l) => l.trim());
      expect(shown.sort()).toEqual([...c.lines].sort());

      const json = await lacuna('inspect', c.file, '--json');
      const j = JSON.parse(json.out);
      expect(j.reflections + j.rejected).toBe(j.rows_in_file);
      expect(j.rows_in_file).toBe(c.rows);
      expect(j.rejected_reasons).toEqual(c.reasons);

      const rank = await lacuna('rank', c.file);
      expect(rank).toEqual({ code: 2, out: '', err: c.rank + '\n' });
    });
  }
});

describe('files that are fine though unusual', () => {
  /** The three rows every small file here shares (line 14 on), as read from the LF file by hand. */
  const THREE = { h: [1, 0, 1], k: [0, 1, 1], l: [0, 1, 0], i: [120.5, 88.2, 45.0], sigma: [3.1, 2.9, 2.2] };
  const read = (name: string) => {
    const r = readReflections(new Uint8Array(readFileSync(join(FILES, name))), { source: name });
    if (!r.ok) throw r.error;
    const t = r.value;
    return { h: [...t.h], k: [...t.k], l: [...t.l], i: [...t.i], sigma: [...t.sigma], rejected: t.meta.rejectedCount, cell: t.meta.cell };
  };
  const f32 = (xs: number[]) => xs.map((x) => Math.fround(x));

  for (const [file, why] of [['crlf.cif', 'CRLF line ends'], ['bom.cif', 'UTF-8 byte-order mark'], ['windows-export.csv', 'comma-separated with BOM and CRLF']] as const) {
    it(`${file} (${why}) reads the same rows as plain text`, async () => {
      const t = read(file);
      expect(t).toMatchObject({ h: THREE.h, k: THREE.k, l: THREE.l, i: f32(THREE.i), sigma: f32(THREE.sigma), rejected: 0 });
      const r = await lacuna('inspect', file, '--json');
      expect(r.code).toBe(0);
      const j = JSON.parse(r.out);
      expect([j.reflections, j.rejected]).toEqual([3, 0]);
      if (file.endsWith('.cif')) {
        expect(j.warnings).toEqual([]);
        expect(j.cell).toEqual({ a: 7.512, b: 9.034, c: 11.27, alpha: 90, beta: 101.25, gamma: 90 });
      } else expect(j.warnings).toEqual(['no unit cell: resolution unknown. Give the cell with --cell a,b,c,alpha,beta,gamma']);
    });
  }

  it('all-intensities-zero.cif: inspect reports it; rank refuses with the reason and what to check', async () => {
    const r = await lacuna('inspect', 'all-intensities-zero.cif');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^accepted +24$/m);
    expect(r.out).toMatch(/^mean I\/sigma +0\.00$/m);
    const k = await lacuna('rank', 'all-intensities-zero.cif');
    expect(k).toEqual({
      code: 2, out: '',
      err: 'error: all-intensities-zero.cif: every intensity is zero: neither absences nor the Laue class can be judged from these data. Check that the measured intensity column was exported (placeholder or calculated columns hold zeros).\n',
    });
  });

  it('no-cell.cif: inspect reads it without a resolution; rank asks for the cell', async () => {
    const r = await lacuna('inspect', 'no-cell.cif');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^cell +not given$/m);
    expect(r.out).toMatch(/^resolution +unknown \(no cell\)$/m);
    const k = await lacuna('rank', 'no-cell.cif');
    expect(k).toEqual({
      code: 2, out: '',
      err: 'error: no-cell.cif: the file gives no unit cell, and ranking needs one (candidate settings must fit the metric). Give it with --cell a,b,c,alpha,beta,gamma.\n',
    });
    expect((await lacuna('rank', 'no-cell.cif', '--cell', '7.512,9.034,11.27,90,101.25,90', '--json')).code).toBe(0);
  });

  it('single-reflection.cif: inspect reads the one row; rank says it is too few', async () => {
    const r = await lacuna('inspect', 'single-reflection.cif', '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out);
    expect([j.reflections, j.rejected, j.unique, j.multiplicity]).toEqual([1, 0, 1, 1]);
    expect(j.d_min).toBe(j.d_max);
    const k = await lacuna('rank', 'single-reflection.cif');
    expect(k).toEqual({
      code: 2, out: '',
      err: 'error: single-reflection.cif: only 1 reflection: too few to test reflection conditions or intensity statistics (at least 20 needed). Use the full data set (merged or unmerged) from the integration.\n',
    });
  });
});

describe('the catalogue is complete', () => {
  it('every file in tests/bad-inputs/files has a case above', async () => {
    const { readdirSync } = await import('node:fs');
    const covered = new Set([
      ...REFUSED.map((c) => c.file), ...PARTLY.map((c) => c.file),
      'crlf.cif', 'bom.cif', 'windows-export.csv', 'all-intensities-zero.cif', 'single-reflection.cif', 'no-cell.cif',
    ]);
    expect(readdirSync(FILES).filter((f) => !covered.has(f))).toEqual([]);
  });
});
