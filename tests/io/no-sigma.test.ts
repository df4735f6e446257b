import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../../src/cli';
import { readReflections, writeReflectionCif } from '../../src/io';
import { findSetting } from '../../src/symmetry';
import { atomSitesFromList, SeededRandom, simulateData } from '../../src/model';
import { randomCellFor } from '../analysis/rank-simulation';
import { captureCli } from '../helpers/capture-cli';

/**
 * Files with intensities (or amplitudes) but no sigma column: every row is kept, sigmas are
 * estimated (5 % of |I| plus 2 % of the mean |I|, common practice), meta and the warnings of
 * inspect and rank say so, and the row counts still add up.
 */

const enc = (s: string) => new TextEncoder().encode(s);

function simulated() {
  const s = findSetting('P 1 21/c 1')!;
  const rng = new SeededRandom(5);
  const cell = randomCellFor(s, rng, 1600);
  const atoms = Array.from({ length: 6 }, (_, j) => ({ label: `C${j}`, element: 'C', x: rng.uniform(), y: rng.uniform(), z: rng.uniform(), uiso: 0.03 }));
  const r = simulateData({ source: 'sim', cell, ops: s.ops, atoms: atomSitesFromList(atoms), warnings: [] }, { dmin: 0.9, seed: 7, incompleteness: 0.05 });
  if (!r.ok) throw r.error;
  return { table: r.value.table, cell };
}

describe('reflection files without sigmas', () => {
  const { table, cell } = simulated();
  const dir = mkdtempSync(join(tmpdir(), 'lacuna-nosigma-'));
  const cellText = [cell.a, cell.b, cell.c, cell.alpha, cell.beta, cell.gamma].join(',');
  // text 'h k l I' with two bad rows: counts must still add up (n + rejected = rows)
  const textRows = ['h k l I'];
  for (let j = 0; j < table.n; j++) textRows.push(`${table.h[j]} ${table.k[j]} ${table.l[j]} ${table.i[j]}`);
  textRows.push('1 2 ? 5', '0 0 0 7');
  const textPath = join(dir, 'no-sigma.txt');
  writeFileSync(textPath, textRows.join('\n') + '\n');
  // CIF with only _refln_F_squared_meas
  const cifRows = ['data_nosigma', `_cell_length_a ${cell.a}`, `_cell_length_b ${cell.b}`, `_cell_length_c ${cell.c}`,
    `_cell_angle_alpha ${cell.alpha}`, `_cell_angle_beta ${cell.beta}`, `_cell_angle_gamma ${cell.gamma}`,
    'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_squared_meas'];
  for (let j = 0; j < table.n; j++) cifRows.push(`${table.h[j]} ${table.k[j]} ${table.l[j]} ${table.i[j]}`);
  cifRows.push('2 2 2 .');
  const cifPath = join(dir, 'no-sigma.cif');
  writeFileSync(cifPath, cifRows.join('\n') + '\n');

  it('the readers keep every row, fill positive sigmas and flag them as estimated', () => {
    const r = readReflections(enc(textRows.join('\n')), { source: 't' });
    if (!r.ok) throw r.error;
    const t = r.value;
    expect(t.n).toBe(table.n);
    expect(t.meta.rejectedCount).toBe(2);
    expect(t.n + t.meta.rejectedCount).toBe(t.meta.rowsInFile);
    expect(t.meta.sigmaEstimated).toBe(true);
    expect(t.meta.warnings.join(' ')).toMatch(/no sigma column: every row was kept and sigmas were estimated/);
    // the stated rule, recomputed here: 5 % of |I| plus 2 % of the mean |I|
    let mean = 0;
    for (let j = 0; j < t.n; j++) mean += Math.abs(t.i[j]);
    mean /= t.n;
    for (const j of [0, 1, t.n >> 1, t.n - 1]) expect(t.sigma[j]).toBeCloseTo(0.05 * Math.abs(t.i[j]) + 0.02 * mean, 3);
    for (let j = 0; j < t.n; j++) if (!(t.sigma[j] > 0)) throw new Error(`sigma ${t.sigma[j]} at row ${j}`);

    const c = readReflections(enc(cifRows.join('\n')), { source: 'c' });
    if (!c.ok) throw c.error;
    expect(c.value.n).toBe(table.n);
    expect(c.value.meta.rejectedCount).toBe(1);
    expect(c.value.meta.sigmaEstimated).toBe(true);
    expect(Array.from(c.value.sigma)).toEqual(Array.from(t.sigma));
  });

  it('amplitudes without sigmas are squared and given estimated sigmas; files with sigmas are unchanged', () => {
    const r = readReflections(enc('h k l F\n1 0 0 3\n0 1 0 4\n0 0 1 0\n'), { source: 't' });
    if (!r.ok) throw r.error;
    expect(Array.from(r.value.i)).toEqual([9, 16, 0]);
    expect(r.value.meta.origin).toBe('amplitude');
    expect(r.value.meta.sigmaEstimated).toBe(true);
    // mean |I| = 25/3: sigma = 0.05 I + 0.02 * 25/3
    expect(r.value.sigma[2]).toBeCloseTo(0.02 * 25 / 3, 5);
    const w = readReflections(enc('h k l I sigI\n1 0 0 3 1\n'), { source: 't' });
    if (!w.ok) throw w.error;
    expect(w.value.meta.sigmaEstimated).toBeUndefined();
    expect(w.value.meta.warnings).toEqual([]);
  });

  it('--columns may name four CIF tags (no sigma)', () => {
    const r = readReflections(enc(cifRows.join('\n')), { source: 'c', columns: ['_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_squared_meas'] });
    if (!r.ok) throw r.error;
    expect(r.value.meta.sigmaEstimated).toBe(true);
    expect(r.value.n).toBe(table.n);
  });

  it('writing estimated sigmas leaves the sigma column out, and reading that back gives the same table', () => {
    const r = readReflections(enc(textRows.join('\n')), { source: 't', cell });
    if (!r.ok) throw r.error;
    const cif = writeReflectionCif(r.value);
    expect(cif).not.toMatch(/_refln_F_squared_sigma/);
    const back = readReflections(enc(cif), { source: 'w' });
    if (!back.ok) throw back.error;
    expect(back.value.meta.sigmaEstimated).toBe(true);
    expect(Array.from(back.value.i)).toEqual(Array.from(r.value.i));
    expect(Array.from(back.value.sigma)).toEqual(Array.from(r.value.sigma));
  });

  for (const [label, path, rejected, extra] of [['text h k l I', textPath, 2, ['--cell', cellText]], ['CIF with only _refln_F_squared_meas', cifPath, 1, []]] as const) {
    it(`inspect (${label}): counts add up, JSON and text say the sigmas were estimated`, async () => {
      const c = captureCli();
      expect(await runCli(['inspect', path, '--json', ...extra], c.ctx)).toBe(0);
      const j = JSON.parse(c.out);
      expect(j.reflections).toBe(table.n);
      expect(j.rejected).toBe(rejected);
      expect(j.reflections + j.rejected).toBe(j.rows_in_file);
      expect(j.sigma_estimated).toBe(true);
      expect(j.warnings.join(' ')).toMatch(/sigmas were estimated/);
      const t = captureCli();
      expect(await runCli(['inspect', path, ...extra], t.ctx)).toBe(0);
      expect(t.out).toMatch(/sigmas\s+not in the file: estimated/);
      expect(t.out).toMatch(/mean I\/sigma .*\(from estimated sigmas\)/);
      expect(t.out).toMatch(/no sigma column: every row was kept and sigmas were estimated/);
    });

    it(`rank (${label}): runs, warns that absence probabilities are less reliable, human and JSON`, async () => {
      const c = captureCli();
      expect(await runCli(['rank', path, '--json', ...extra], c.ctx)).toBe(0);
      const j = JSON.parse(c.out);
      expect(j.input.sigmas_estimated).toBe(true);
      expect(j.input.reflections).toBe(table.n);
      expect(j.warnings.join(' ')).toMatch(/estimated .*absence probabilities .*less reliable/);
      expect(j.candidates.length).toBeGreaterThan(1);
      // the data are from P 1 21/c 1 with plain errors: it should still be among the first candidates
      expect(j.candidates.slice(0, 5).map((x: { hm: string }) => x.hm)).toContain('P 1 21/c 1');
      const t = captureCli();
      expect(await runCli(['rank', path, ...extra], t.ctx)).toBe(0);
      expect(t.out).toMatch(/absence probabilities .*less reliable/);
      expect(t.out).toMatch(/Caution: .*hypothesis/);
    });
  }
});
