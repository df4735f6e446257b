import { describe, expect, it } from 'vitest';
import { writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../../src/cli';
import { rankSpaceGroups } from '../../src/analysis';
import { findSetting } from '../../src/symmetry';
import { atomSitesFromList, simulateData } from '../../src/model';
import { realdata } from '../helpers/paths';
import { parseChangeOfBasis, reindexTable } from '../../src/lattice';
import { randomCellFor } from './rank-simulation';
import { SeededRandom } from '../../src/model';
import { captureCli } from '../helpers/capture-cli';

const capture = () => captureCli();

describe('lacuna rank (command contract, conventions.md section 1)', () => {
  it('--json prints one document with the contract keys, candidates highest first', async () => {
    const c = capture();
    expect(await runCli(['rank', realdata('cod-1560875.cif'), '--json'], c.ctx)).toBe(0);
    const j = JSON.parse(c.out);
    for (const k of ['input', 'cell', 'laue', 'statistics', 'conditions', 'candidates']) expect(j).toHaveProperty(k);
    for (const cond of j.conditions)
      for (const k of ['text', 'zone', 'coeffs', 'modulus', 'n', 'mean_i_over_sigma', 'n_strong', 'probability_absent']) expect(cond).toHaveProperty(k);
    // sorted by probability (that of the candidate's indistinguishable class), then by the
    // setting's own share within a class
    const p = j.candidates.map((x: { probability: number }) => x.probability);
    for (let q = 1; q < p.length; q++) expect(p[q]).toBeLessThanOrEqual(p[q - 1]);
    const sp = j.candidates.map((x: { setting_probability: number }) => x.setting_probability);
    for (let q = 1; q < sp.length; q++) if (j.candidates[q].class_id === j.candidates[q - 1].class_id) expect(sp[q]).toBeLessThanOrEqual(sp[q - 1]);
    for (const k of ['number', 'hm', 'hall', 'probability']) expect(j.candidates[0]).toHaveProperty(k);
    // the settings' own shares add up to one; members of one class share the class probability
    expect(Math.abs(sp.reduce((a: number, b: number) => a + b, 0) - 1)).toBeLessThan(0.01);
    for (const cl of j.classes) {
      const members = j.candidates.filter((x: { class_id: number }) => x.class_id === cl.id);
      for (const m of members) expect(m.probability).toBeCloseTo(cl.probability, 4);
    }
  });
  it('text output shows N candidates, the condition table and the caution', async () => {
    const c = capture();
    expect(await runCli(['rank', realdata('cod-1560875.cif'), '--top', '3'], c.ctx)).toBe(0);
    expect(c.out).toMatch(/^\s+3\s+P /m);
    expect(c.out).not.toMatch(/^\s+4\s+P /m);
    expect(c.out).toMatch(/Reflection conditions/);
    expect(c.out).toMatch(/Caution: .*hypothesis/);
  });
  it('--chiral keeps Sohncke groups only', async () => {
    const c = capture();
    expect(await runCli(['rank', realdata('cod-2014121.cif'), '--json', '--chiral'], c.ctx)).toBe(0);
    const j = JSON.parse(c.out);
    expect(j.candidates.length).toBeGreaterThan(0);
    for (const x of j.candidates) expect(x.sohncke).toBe(true);
  });
  it('bad usage and bad input exit 2 with an error: line', async () => {
    const c = capture();
    expect(await runCli(['rank', realdata('cod-1560875.cif'), '--top', '0'], c.ctx)).toBe(2);
    expect(c.err).toMatch(/^error: /);
    const dir = mkdtempSync(join(tmpdir(), 'lacuna-rank-'));
    const f = join(dir, 'nocell.txt');
    const rows = ['h k l i sigi'];
    for (let h = 1; h <= 5; h++) for (let k = 0; k < 6; k++) rows.push(`${h} ${k} 1 ${100 + h * k} 5`);
    writeFileSync(f, rows.join('\n') + '\n');
    const d = capture();
    expect(await runCli(['rank', f], d.ctx)).toBe(2);
    expect(d.err).toMatch(/^error: .*no unit cell.*--cell/s);
  });
});

describe('rankSpaceGroups on harder input', () => {
  function simulated(name: string, opts: { unmerged?: boolean }) {
    const s = findSetting(name)!;
    const rng = new SeededRandom(11);
    const cell = randomCellFor(s, rng, 1600);
    const atoms = Array.from({ length: 6 }, (_, j) => ({ label: `C${j}`, element: 'C', x: rng.uniform(), y: rng.uniform(), z: rng.uniform(), uiso: 0.03 }));
    const r = simulateData({ source: 'test', cell, ops: s.ops, atoms: atomSitesFromList(atoms), warnings: [] },
      { dmin: 0.9, seed: 3, unmerged: opts.unmerged, multiplicity: 3, incompleteness: 0.05 });
    if (!r.ok) throw r.error;
    return r.value.table;
  }
  it('unmerged data are merged first, with R_int reported, and still ranked right (P 1 21/c 1)', () => {
    const r = rankSpaceGroups(simulated('P 1 21/c 1', { unmerged: true }));
    if (!r.ok) throw r.error;
    expect(r.value.input.merged_from_unmerged).toBe(true);
    expect(r.value.input.r_int).not.toBeNull();
    expect(r.value.warnings.join(' ')).toMatch(/unmerged input/);
    expect(r.value.classes[0].members).toContain('P 1 21/c 1');
  });
  it('weak violations (a few absent reflections at 4 sigma) are reported and do not overturn the ranking', () => {
    const t = simulated('P 1 21/c 1', {});
    const I = Float32Array.from(t.i);
    let put = 0;
    for (let j = 0; j < t.n && put < 4; j++)
      if (t.k[j] === 0 && t.l[j] % 2 !== 0) { I[j] = 4 * t.sigma[j]; put++; }
    expect(put).toBe(4);
    const r = rankSpaceGroups({ ...t, i: I });
    if (!r.ok) throw r.error;
    expect(r.value.classes[0].members).toContain('P 1 21/c 1');
    expect(r.value.warnings.join(' ')).toMatch(/h0l: l = 2n show 3-6 sigma: weak violations/);
  });
  it('a file with the absent reflections filtered out is recognised as such and still ranked right', () => {
    const t = simulated('P 1 21/c 1', {});
    const keep: number[] = [];
    for (let j = 0; j < t.n; j++) if (!((t.k[j] === 0 && t.l[j] % 2 !== 0) || (t.h[j] === 0 && t.l[j] === 0 && t.k[j] % 2 !== 0))) keep.push(j);
    const pick = <T extends Int16Array | Float32Array>(a: T) => a.constructor === Int16Array ? Int16Array.from(keep, (j) => a[j]) : Float32Array.from(keep, (j) => a[j]);
    const r = rankSpaceGroups({ ...t, n: keep.length, h: pick(t.h) as Int16Array, k: pick(t.k) as Int16Array, l: pick(t.l) as Int16Array, i: pick(t.i) as Float32Array, sigma: pick(t.sigma) as Float32Array });
    if (!r.ok) throw r.error;
    expect(r.value.absences_removed).toBe(true);
    expect(r.value.warnings.join(' ')).toMatch(/absences appear to have been removed/);
    expect(r.value.classes[0].members).toContain('P 1 21/c 1');
  });
  it('a C-centred monoclinic lattice indexed on a primitive cell gets told how to reindex', () => {
    const t = simulated('C 1 2/c 1', {});
    const keep: number[] = [];
    for (let j = 0; j < t.n; j++) if ((t.h[j] + t.k[j]) % 2 === 0) keep.push(j);
    const c = { ...t, n: keep.length, h: Int16Array.from(keep, (j) => t.h[j]), k: Int16Array.from(keep, (j) => t.k[j]), l: Int16Array.from(keep, (j) => t.l[j]), i: Float32Array.from(keep, (j) => t.i[j]), sigma: Float32Array.from(keep, (j) => t.sigma[j]) };
    const cob = parseChangeOfBasis('1/2a-1/2b,1/2a+1/2b,c'); // a primitive cell of the C lattice
    if (!cob.ok) throw cob.error;
    const p = reindexTable(c, cob.value);
    if (!p.ok) throw p.error;
    const r = rankSpaceGroups(p.value);
    if (!r.ok) throw r.error;
    expect(r.value.warnings.join(' ')).toMatch(/in another basis the lattice metric fits mC/);
  });
  it('missing sigmas are estimated with a warning, and the ranking still runs', () => {
    const t = simulated('P 21 21 21', {});
    const r = rankSpaceGroups({ ...t, sigma: new Float32Array(t.n) });
    if (!r.ok) throw r.error;
    expect(r.value.input.sigmas_estimated).toBe(true);
    expect(r.value.warnings.join(' ')).toMatch(/no standard uncertainties/);
    expect(r.value.candidates.length).toBeGreaterThan(1);
  });
  it('all-zero intensities and too few reflections are errors, not empty lists', () => {
    const t = simulated('P 21 21 21', {});
    const z = rankSpaceGroups({ ...t, i: new Float32Array(t.n) });
    expect(z.ok).toBe(false);
    if (!z.ok) expect(z.error.message).toMatch(/every intensity is zero/);
    const few = rankSpaceGroups({ ...t, n: 5 });
    expect(few.ok).toBe(false);
  });
  it('progress is reported and can cancel', () => {
    const t = simulated('P 21 21 21', {});
    const seen: number[] = [];
    const r = rankSpaceGroups(t, {}, (f) => { seen.push(f); return f < 0.5; });
    expect(r.ok).toBe(false);
    expect(seen.length).toBeGreaterThan(1);
  });
});
