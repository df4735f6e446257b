import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { detectReflectionFormat, isGzip, readReflections, type ReadReflectionsOptions } from '../../src/io';
import type { ReflectionTable } from '../../src/core';
import { realdata } from '../helpers/paths';

const enc = new TextEncoder();
function read(text: string, opts: Partial<ReadReflectionsOptions> = {}): ReflectionTable {
  const r = readReflections(enc.encode(text), { source: 'test', ...opts });
  if (!r.ok) throw new Error('unexpected error: ' + r.error.describe());
  const t = r.value;
  // nothing lost silently: every row is accepted or rejected
  expect(t.n + t.meta.rejectedCount).toBe(t.meta.rowsInFile);
  return t;
}
function readError(text: string, opts: Partial<ReadReflectionsOptions> = {}) {
  const r = readReflections(enc.encode(text), { source: 'test', ...opts });
  if (r.ok) throw new Error('expected an error');
  return r.error;
}
const rows = (t: ReflectionTable) => Array.from({ length: t.n }, (_, j) => [t.h[j], t.k[j], t.l[j], t.i[j], t.sigma[j]]);

const CORE_HEAD = ['data_demo', '_cell_length_a 10.1', '_cell_length_b 11.2', '_cell_length_c 12.3', '_cell_angle_alpha 90',
  '_cell_angle_beta 101.5(2)', '_cell_angle_gamma 90', '_diffrn_radiation_wavelength 0.71073'];

describe('real data sets (counts and cells from shared/realdata/README.md and the file headers)', () => {
  it('cod-1560875: 2551 reflections, cell 8.72 8.93 12.94 90 90.32 90, wavelength 0.71073', () => {
    const text = readFileSync(realdata('cod-1560875.cif'));
    const t = read(text.toString('latin1'));
    expect(t.n).toBe(2551);
    expect(t.meta.rejectedCount).toBe(0);
    expect(t.meta.cell).toEqual({ a: 8.72, b: 8.93, c: 12.94, alpha: 90, beta: 90.32, gamma: 90 });
    expect(t.meta.wavelength).toBe(0.71073);
    expect(t.meta.block).toBe('cod1560875');
    // first and last data rows, read independently with a regular expression
    const dataRows = text.toString('latin1').split('\n').filter((s) => /^\s*-?\d+\s+-?\d+\s+-?\d+\s+\S+\s+\S+\s*$/.test(s));
    expect(dataRows.length).toBe(2551);
    for (const [j, s] of [[0, dataRows[0]], [2550, dataRows[2550]]] as const) {
      const f = s.trim().split(/\s+/).map(Number);
      expect([t.h[j], t.k[j], t.l[j]]).toEqual(f.slice(0, 3));
      expect(t.i[j]).toBe(Math.fround(f[3]));
      expect(t.sigma[j]).toBe(Math.fround(f[4]));
    }
  });
  it('cod-2014121: 3651 reflections, cell 19.479 5.61 33.586 90 90 90, no wavelength', () => {
    const t = read(readFileSync(realdata('cod-2014121.cif'), 'latin1'));
    expect(t.n).toBe(3651);
    expect(t.meta.cell).toEqual({ a: 19.479, b: 5.61, c: 33.586, alpha: 90, beta: 90, gamma: 90 });
    expect(t.meta.wavelength).toBeUndefined();
    expect(t.meta.origin).toBe('intensity');
    expect(t.meta.unmerged).toBe(false);
  });
});

describe('CIF reflection loops', () => {
  it('reads core tags, cell with su, wavelength', () => {
    const t = read([...CORE_HEAD, 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_squared_meas', '_refln_F_squared_sigma',
      '1 0 0 100.5 2.5', '-1 2 -3 -4.25 1.5', '0 0 4 12 3'].join('\n'));
    expect(rows(t)).toEqual([[1, 0, 0, 100.5, 2.5], [-1, 2, -3, -4.25, 1.5], [0, 0, 4, 12, 3]]);
    expect(t.meta.cell!.beta).toBe(101.5);
    expect(t.meta.wavelength).toBe(0.71073);
    expect(t.meta.warnings).toEqual([]);
  });

  it('reads mmCIF tags, extra columns, comments, quoted values and rows across lines', () => {
    const t = read(['data_mm', '_cell.length_a 50', '_cell.length_b 60', '_cell.length_c 70', '_cell.angle_alpha 90', '_cell.angle_beta 90', '_cell.angle_gamma 90',
      'loop_', '_diffrn_radiation_wavelength.id', '_diffrn_radiation_wavelength.wavelength', '1 0.9795',
      'loop_', '_refln.crystal_id', '_refln.wavelength_id', '_refln.index_h', '_refln.index_k', '_refln.index_l', '_refln.status', '_refln.intensity_meas', '_refln.intensity_sigma',
      '1 1 1 2 3 o 55.5 5.5 # a comment', "1 1 2 2 3 'f' 60", '6', '1 1 -3 0 1 o', '"7.25" 1.0'].join('\n'));
    expect(rows(t)).toEqual([[1, 2, 3, 55.5, 5.5], [2, 2, 3, 60, 6], [-3, 0, 1, 7.25, 1]]);
    expect(t.meta.wavelength).toBe(0.9795);
    expect(t.meta.cell!.c).toBe(70);
  });

  it('prefers intensities to amplitudes, and converts amplitudes with a warning (I = F^2, sigma = 2 F sigmaF)', () => {
    const both = read(['data_x', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_meas', '_refln_F_sigma', '_refln_F_squared_meas', '_refln_F_squared_sigma',
      '1 1 1 3 0.5 9.5 3.1'].join('\n'));
    expect(rows(both)[0]).toEqual([1, 1, 1, 9.5, Math.fround(3.1)]);
    expect(both.meta.origin).toBe('intensity');
    const f = read(['data_x', 'loop_', '_refln.index_h', '_refln.index_k', '_refln.index_l', '_refln.F_meas_au', '_refln.F_meas_sigma_au',
      '1 1 1 3 0.5', '2 0 0 0 0.5', '3 0 0 -1 0.5'].join('\n'));
    expect(f.meta.origin).toBe('amplitude');
    expect(rows(f)).toEqual([[1, 1, 1, 9, 3], [2, 0, 0, 0, 0.25]]);
    expect(f.meta.rejectedByReason).toEqual({ 'negative amplitude F': 1 });
    expect(f.meta.warnings.join(' ')).toMatch(/amplitudes F: converted to intensities with I = F\^2, sigma\(I\) = 2\|F\| sigma\(F\)/);
  });

  it('flags unmerged _diffrn_refln data, with _intensity_u or _intensity_sigma', () => {
    for (const sig of ['_diffrn_refln_intensity_u', '_diffrn_refln_intensity_sigma']) {
      const t = read(['data_u', 'loop_', '_diffrn_refln_index_h', '_diffrn_refln_index_k', '_diffrn_refln_index_l', '_diffrn_refln_intensity_net', sig,
        '1 2 3 10 1', '1 2 3 11 1', '-1 -2 -3 9 1'].join('\n'));
      expect(t.n).toBe(3);
      expect(t.meta.unmerged).toBe(true);
      expect(t.meta.warnings.join(' ')).toMatch(/unmerged/);
    }
  });

  it('rejects bad rows with a reason and line, and the counts add up', () => {
    const t = read(['data_r', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma',
      '1 2 3 40.5 2', // line 8 ok
      '1 2 x 40.5 2', // 9 non-numeric
      '0 0 0 1 1', // 10
      '1 1 1 5 0', // 11 sigma 0
      '1 1 1 5 -2', // 12 sigma < 0
      '1.5 1 1 5 1', // 13
      '2 2 2 ? 1', // 14
      '2 2 2 5 .', // 15
      '3 3 3 nan 1', // 16
      '3 3 3 1e999 1', // 17
      '40000 1 1 1 1', // 18
      "4 4 4 '?' 1", // 19 quoted ? is text
      '2.0 -1 3 7 1e-1', // 20 ok: 2.0 is an integer
    ].join('\n'));
    expect(t.n).toBe(2);
    expect(rows(t)[1]).toEqual([2, -1, 3, 7, Math.fround(0.1)]);
    expect(t.meta.rowsInFile).toBe(13);
    expect(t.meta.rejectedByReason).toEqual({
      'non-numeric value': 2,
      'index 0 0 0': 1,
      'sigma <= 0': 2,
      'non-integer index': 1,
      'missing value (? or . or empty)': 2,
      'NaN or infinite value': 2,
      'index out of range (|h|, |k| or |l| > 32767)': 1,
    });
    expect(t.meta.rejectedExamples.map((e) => e.line)).toEqual([9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19]);
  });

  it('picks the first block with reflections, warns about others, and --block chooses', () => {
    const text = ['data_model', '_cell_length_a 5', 'loop_', '_atom_site_label', '_atom_site_fract_x', 'C1 0.1',
      'data_first', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma', '1 1 1 10 1',
      'data_Second', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma', '2 2 2 20 2', '3 3 3 30 3'].join('\n');
    const t = read(text);
    expect(t.meta.block).toBe('first');
    expect(t.n).toBe(1);
    expect(t.meta.warnings.join(' ')).toMatch(/1 more data block\(s\) with reflections \(Second\).*--block/);
    const s = read(text, { block: 'second' });
    expect(s.meta.block).toBe('Second');
    expect(s.n).toBe(2);
    expect(readError(text, { block: 'third' }).message).toMatch(/no data block named 'third' \(blocks in the file: model, first, Second\)/);
    const e = readError(text, { block: 'model' });
    expect(e.message).toMatch(/data block 'model' has no reflection loop/);
    expect(e.location.line).toBe(1);
  });

  it('--columns names the five tags for a CIF loop', () => {
    const text = ['data_c', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma', '_refln_my_scaled', '_refln_my_scaled_sigma',
      '1 2 3 10 1 20 2'].join('\n');
    const t = read(text, { columns: ['_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_my_scaled', '_refln_my_scaled_sigma'] });
    expect(rows(t)).toEqual([[1, 2, 3, 20, 2]]);
    expect(readError(text, { columns: ['_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_nope', '_refln_my_scaled_sigma'] }).message)
      .toMatch(/no loop holds all the tags given with --columns/);
  });

  it('errors name file, line and column', () => {
    let e = readError(['data_e', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma', '1 2 3 4 5', '1 2 3 4'].join('\n'));
    expect(e.message).toMatch(/last row of the reflection loop has 4 values for 5 tags/);
    expect(e.location).toMatchObject({ file: 'test', line: 9, column: 7 });
    e = readError(['data_e', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma', "1 2 3 'x 5"].join('\n'));
    expect(e.message).toMatch(/unterminated quoted string/);
    expect(e.location).toMatchObject({ line: 8, column: 7 });
    e = readError(['data_e', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_obs', '1 2 3 4'].join('\n'));
    expect(e.message).toMatch(/has indices but no measured values/);
    expect(e.location.line).toBe(2);
    e = readError('data_e\n_cell_length_a 5\n');
    expect(e.message).toMatch(/no reflection loop found \(data blocks: e\)/);
    e = readError(['data_e', '_cell_length_a 5', '_cell_length_b 5', '_cell_length_c 5', '_cell_angle_alpha 90', '_cell_angle_beta 190', '_cell_angle_gamma 90',
      'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma', '1 2 3 4 5'].join('\n'));
    expect(e.message).toMatch(/cell in the file is impossible: cell angle beta = 190/);
    expect(e.location.line).toBe(2);
    e = readError('data_e\nloop_\n_atom_site_label\n_atom_site_x\nC1 0.5\nO2\n\nloop_\n_refln_index_h\n');
    expect(e.message).toMatch(/loop has 3 values for 2 tags/);
    expect(e.location).toMatchObject({ line: 6, column: 1 });
    e = readError('data_e\n_a 1\n_b\n');
    expect(e.message).toMatch(/'_b' has no value/);
    expect(e.location.line).toBe(3);
    expect(readError('').message).toMatch(/empty/);
  });

  it('--cell replaces the file cell with a warning; a partial cell is reported', () => {
    const text = [...CORE_HEAD, 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma', '1 2 3 4 5'].join('\n');
    const t = read(text, { cell: { a: 10, b: 11, c: 12, alpha: 90, beta: 100, gamma: 90 } });
    expect(t.meta.cell!.beta).toBe(100);
    expect(t.meta.warnings.join(' ')).toMatch(/--cell replaces the cell in the file \(10.1, 11.2, 12.3, 90, 101.5, 90\)/);
    const p = read(['data_p', '_cell_length_a 10', '_cell_length_b ?', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma', '1 2 3 4 5'].join('\n'));
    expect(p.meta.cell).toBeUndefined();
    expect(p.meta.warnings.join(' ')).toMatch(/only 1 of the 6 cell parameters/);
  });

  it('accepts CRLF line ends, a byte-order mark, text fields and an empty loop', () => {
    const t = read('\ufeff' + ['data_w', '_title', ';', 'some text', ';', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma',
      '1 2 3 4 5', '2 3 4 5 6'].join('\r\n') + '\r\n');
    expect(t.n).toBe(2);
    const empty = read(['data_w', 'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma', 'data_next', '_x 1'].join('\n'));
    expect(empty.n).toBe(0);
    expect(empty.meta.rowsInFile).toBe(0);
  });
});

describe('delimited text', () => {
  it('whitespace, comma, tab and semicolon separated, with header aliases', () => {
    const expected = [[1, 2, 3, 45.5, 2.5], [-1, 0, 4, -3, 1]];
    expect(rows(read('# comment\nh k l I sigI\n1 2 3 45.5 2.5\n\n-1  0   4 -3 1\n'))).toEqual(expected);
    expect(rows(read('H,K,L,Int,Sigma\n1,2,3,45.5,2.5\n-1, 0, 4, -3, 1\n'))).toEqual(expected);
    expect(rows(read('h\tk\tl\tintensity\tsig\r\n1\t2\t3\t45.5\t2.5\r\n-1\t0\t4\t-3\t1\r\n'))).toEqual(expected);
    expect(rows(read('h;k;l;I;sigI\n1;2;3;45.5;2.5\n-1;0;4;-3;1\n'))).toEqual(expected);
    expect(rows(read('h k l Iobs sig(Iobs)\n1 2 3 45.5 2.5\n'))).toEqual([expected[0]]);
    expect(rows(read('h k l F^2 sigma(F^2)\n1 2 3 45.5 2.5\n'))).toEqual([expected[0]]);
    const t = read('batch h k l I sigI\n7 1 2 3 45.5 2.5\n');
    expect(rows(t)).toEqual([expected[0]]);
  });
  it('amplitude columns F, sigF are squared with a warning', () => {
    const t = read('h k l F sigF\n1 2 3 4 0.5\n');
    expect(rows(t)).toEqual([[1, 2, 3, 16, 4]]);
    expect(t.meta.origin).toBe('amplitude');
    expect(t.meta.warnings.join(' ')).toMatch(/I = F\^2/);
  });
  it('--columns names the columns of a file without header, or overrides a header', () => {
    expect(rows(read('1 2 3 9 1\n', { columns: ['h', 'k', 'l', 'i', 'sigi'] }))).toEqual([[1, 2, 3, 9, 1]]);
    expect(rows(read('a b c d e\n1 2 3 9 1\n', { columns: ['h', 'k', 'l', 'skip', 'i', 'sigi'] }))).toEqual([]);
    expect(rows(read('1 2 3 0 9 1\n', { columns: ['h', 'k', 'l', 'batch', 'i', 'sigi'] }))).toEqual([[1, 2, 3, 9, 1]]);
  });
  it('rejects short, long and empty-field rows with line numbers', () => {
    const t = read('h,k,l,i,sigi\n1,2,3,4,5\n1,2,3,4\n1,2,3,,5\n1,2,3,4,5,6\n');
    expect(t.n).toBe(1);
    expect(t.meta.rejectedByReason).toEqual({ 'too few columns': 1, 'missing value (? or . or empty)': 1, 'more columns than the header names': 1 });
    expect(t.meta.rejectedExamples.map((e) => e.line)).toEqual([3, 4, 5]);
  });
  it('takes the column names from a commented header line when the data has no header', () => {
    const t = read('# written by a made-up program\n# h k l I sigI\n1 2 3 45.5 2.5\n');
    expect(rows(t)).toEqual([[1, 2, 3, 45.5, 2.5]]);
    expect(t.meta.warnings.join(' ')).toMatch(/column names taken from the comment on line 2: h k l I sigI/);
    // a comment that does not name the columns is not used
    expect(readError('# h k l\n1 2 3 4 5\n').message).toMatch(/no header row/);
  });
  it('errors: no header, unknown or mixed columns', () => {
    let e = readError('1 2 3 4 5\n');
    expect(e.message).toMatch(/no header row/);
    expect(e.location).toMatchObject({ file: 'test', line: 1 });
    e = readError('x y z\n1 2 3\n');
    expect(e.message).toMatch(/no column named h, k, l, I \(or F\) \(columns: x y z\)/);
    e = readError('h k l I sigI F\n');
    expect(e.message).toMatch(/mix intensities/);
    e = readError('h k l I I\n');
    expect(e.message).toMatch(/name the same quantity/);
  });
});

describe('format detection and gzip', () => {
  it('detects CIF by data_, loop_ or a tag first; text otherwise', () => {
    expect(detectReflectionFormat(enc.encode('# c\n\nDATA_x\n'))).toBe('cif');
    expect(detectReflectionFormat(enc.encode('_refln_index_h 1\n'))).toBe('cif');
    expect(detectReflectionFormat(enc.encode('h k l i sigi\n'))).toBe('text');
    expect(detectReflectionFormat(enc.encode('data value\n'))).toBe('text');
  });
  it('isGzip looks at the magic bytes (RFC 1952), and compressed bytes are refused by the reader', () => {
    const gz = gzipSync(Buffer.from('data_x\n'));
    expect(isGzip(new Uint8Array(gz))).toBe(true);
    expect(isGzip(enc.encode('data_x'))).toBe(false);
    expect(isGzip(new Uint8Array([0x1f]))).toBe(false);
    const r = readReflections(new Uint8Array(gz), { source: 'x.gz' });
    expect(!r.ok && r.error.message).toMatch(/gzip-compressed/);
  });
});
