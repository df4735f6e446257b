import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { REPO_ROOT } from '../helpers/paths';
import { runCli } from '../../src/cli';
import { readReflections } from '../../src/io';
import { findSetting, isSystematicallyAbsent, equivalentIndices, distinctRotations } from '../../src/symmetry';
import { captureCli } from '../helpers/capture-cli';
import {
  calculatedIntensities, compareModelWithData, parseModelCif, prepareModel, simulateData, type CrystalModel,
} from '../../src/model';

const MODEL_PATH = resolve(REPO_ROOT, 'public/demo/models/qm-101.cif');
function loadModel(path = MODEL_PATH): CrystalModel {
  const r = parseModelCif(readFileSync(path, 'utf8'), path);
  if (!r.ok) throw r.error;
  return r.value;
}
const model = loadModel();
const setting = findSetting('P 1 21/c 1')!;
const tmp = mkdtempSync(join(tmpdir(), 'lacuna-sim-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

const capture = () => captureCli(tmp);

describe('simulated data', () => {
  it('is deterministic for a seed and differs between seeds', () => {
    const a = simulateData(model, { dmin: 1.2, seed: 5 }), b = simulateData(model, { dmin: 1.2, seed: 5 }), c = simulateData(model, { dmin: 1.2, seed: 6 });
    if (!a.ok || !b.ok || !c.ok) throw new Error('simulation failed');
    expect(Array.from(a.value.table.i)).toEqual(Array.from(b.value.table.i));
    expect(Array.from(a.value.table.i)).not.toEqual(Array.from(c.value.table.i));
  });

  it('follows sigma^2 = I + background + (p I)^2, puts I = 0 at absences, and violates only absent positions', () => {
    const r = simulateData(model, { dmin: 1.0, seed: 11, background: 30, p: 0.03, meanIntensity: 500, violations: 4 });
    if (!r.ok) throw r.error;
    const { table, scale, violations } = r.value;
    const ic = calculatedIntensities(prepareModel(model), table)!;
    const isViolation = new Set(violations.map((v) => `${v.h},${v.k},${v.l}`));
    expect(violations.length).toBe(4);
    // absences decided independently by the symmetry layer
    for (const v of violations) expect(isSystematicallyAbsent(setting, v.h, v.k, v.l)).toBe(true);
    let absentZ = 0, nAbsent = 0, maxSigmaError = 0;
    for (let j = 0; j < table.n; j++) {
      const key = `${table.h[j]},${table.k[j]},${table.l[j]}`;
      const absent = isSystematicallyAbsent(setting, table.h[j], table.k[j], table.l[j]);
      const truth = absent ? (isViolation.has(key) ? violations.find((v) => `${v.h},${v.k},${v.l}` === key)!.intensity : 0) : scale * ic[j];
      const sigma = Math.sqrt(truth + 30 + (0.03 * truth) ** 2);
      maxSigmaError = Math.max(maxSigmaError, Math.abs(table.sigma[j] - sigma));
      if (absent && !isViolation.has(key)) { absentZ += table.i[j] / table.sigma[j]; nAbsent++; }
    }
    expect(maxSigmaError).toBeLessThan(0.006); // stored at 0.01
    expect(nAbsent).toBeGreaterThan(20);
    expect(Math.abs(absentZ / nAbsent)).toBeLessThan(0.5); // pure noise around zero
    expect(Array.from(table.i).some((x) => x < 0)).toBe(true); // negative intensities kept
  });

  it('leaves out about the requested fraction when incomplete', () => {
    const full = simulateData(model, { dmin: 1.0, seed: 3 }), part = simulateData(model, { dmin: 1.0, seed: 3, incompleteness: 0.2 });
    if (!full.ok || !part.ok) throw new Error('simulation failed');
    expect(part.value.table.n / full.value.table.n).toBeGreaterThan(0.75);
    expect(part.value.table.n / full.value.table.n).toBeLessThan(0.85);
  });

  it('unmerged: observations are symmetry equivalents of the unique set, about the requested multiplicity', () => {
    const merged = simulateData(model, { dmin: 1.2, seed: 9 });
    const r = simulateData(model, { dmin: 1.2, seed: 9, unmerged: true, multiplicity: 4 });
    if (!r.ok || !merged.ok) throw new Error('simulation failed');
    const t = r.value.table;
    expect(t.meta.unmerged).toBe(true);
    const rots = distinctRotations(setting.ops);
    const key = (h: number, k: number, l: number) => {
      // orbit under the Laue group (rotations and Friedel), computed by the symmetry layer
      const eq = equivalentIndices(rots, h, k, l).flatMap(([a, b, c]) => [[a, b, c], [-a, -b, -c]]);
      return eq.map((x) => x.join(',')).sort()[0];
    };
    const groups = new Map<string, number>();
    for (let j = 0; j < t.n; j++) { const kk = key(t.h[j], t.k[j], t.l[j]); groups.set(kk, (groups.get(kk) ?? 0) + 1); }
    // the merged hemisphere holds each Laue orbit twice in 2/m (h k l and h -k l), so unique = hemisphere / 2 roughly
    const uniqueMerged = new Set(Array.from({ length: merged.value.table.n }, (_, j) => key(merged.value.table.h[j], merged.value.table.k[j], merged.value.table.l[j])));
    expect(groups.size).toBe(uniqueMerged.size);
    expect(t.n / groups.size).toBeGreaterThan(3.5);
    expect(t.n / groups.size).toBeLessThan(4.5);
  });

  it('rejects impossible options', () => {
    expect(simulateData(model, { dmin: 0, seed: 1 }).ok).toBe(false);
    expect(simulateData(model, { dmin: 50, seed: 1 }).ok).toBe(false);
    expect(simulateData(model, { dmin: 1, seed: 1, incompleteness: 1 }).ok).toBe(false);
    expect(simulateData(model, { dmin: 0.01, seed: 1 }).ok).toBe(false);
  });
});

describe('simulate -> file -> read back -> compare (round trip)', () => {
  for (const unmerged of [false, true]) {
    it(`${unmerged ? 'unmerged' : 'merged'}: the file reads back identically and R1 matches the noise level`, async () => {
      const out = unmerged ? 'sim-unmerged.cif' : 'sim.cif';
      const c = capture();
      const args = ['simulate', MODEL_PATH, '--dmin', '0.9', '--seed', '42', '--out', out, '--noise', 'mean=800,background=25,p=0.02'];
      if (unmerged) args.push('--unmerged');
      expect(await runCli(args, c.ctx)).toBe(0);
      expect(readdirSync(tmp).filter((f) => f.includes('.tmp'))).toEqual([]); // atomic write leaves no temp file
      const back = readReflections(new Uint8Array(readFileSync(join(tmp, out))), { source: out });
      if (!back.ok) throw back.error;
      const mem = simulateData(model, { dmin: 0.9, seed: 42, meanIntensity: 800, background: 25, p: 0.02, unmerged });
      if (!mem.ok) throw mem.error;
      const t = back.value, m = mem.value.table;
      expect(t.n).toBe(m.n);
      expect(t.meta.unmerged).toBe(unmerged);
      expect(Array.from(t.h)).toEqual(Array.from(m.h));
      expect(Array.from(t.l)).toEqual(Array.from(m.l));
      expect(Array.from(t.i)).toEqual(Array.from(m.i));
      expect(Array.from(t.sigma)).toEqual(Array.from(m.sigma));
      expect(t.meta.cell?.b).toBeCloseTo(model.cell.b, 10);

      const cmp = compareModelWithData(prepareModel(model), t);
      if (!cmp.ok) throw cmp.error;
      // R1 expected from the noise alone: E|Fo - Fc| = sqrt(2/pi) sigma_F with sigma_F = sigma_I / (2 sqrt(I)) (common practice)
      let sumDF = 0, sumF = 0;
      for (let j = 0; j < t.n; j++) {
        if (!(t.i[j] > 2 * t.sigma[j])) continue;
        sumDF += Math.sqrt(2 / Math.PI) * t.sigma[j] / (2 * Math.sqrt(t.i[j]));
        sumF += Math.sqrt(t.i[j]);
      }
      const expectedR1 = sumDF / sumF;
      expect(cmp.value.r1).toBeGreaterThan(0.7 * expectedR1);
      expect(cmp.value.r1).toBeLessThan(1.3 * expectedR1);
      expect(cmp.value.goof).toBeGreaterThan(0.9);
      expect(cmp.value.goof).toBeLessThan(1.1);
      expect(cmp.value.scale).toBeCloseTo(mem.value.scale, 1);
    });
  }

  it('a wrong model fits clearly worse than the right one', () => {
    const other = loadModel(resolve(REPO_ROOT, 'public/demo/models/qm-104.cif'));
    const sim = simulateData(model, { dmin: 1.0, seed: 2 });
    if (!sim.ok) throw sim.error;
    const wrong = { ...other, cell: model.cell, ops: model.ops };
    const good = compareModelWithData(prepareModel(model), sim.value.table), bad = compareModelWithData(prepareModel(wrong), sim.value.table);
    if (!good.ok || !bad.ok) throw new Error('compare failed');
    expect(bad.value.r1).toBeGreaterThan(0.3);
    expect(good.value.r1).toBeLessThan(0.05);
  });
});
