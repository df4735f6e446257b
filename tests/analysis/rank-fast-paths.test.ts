import { describe, expect, it } from 'vitest';
import { absenceEvidence, candidateSettings, DEFAULT_TOLERANCE, forbids, HklIndex, rotationAgreements, type ConditionLike } from '../../src/analysis';
import { makeCell } from '../../src/lattice';
import { allSettings, findSetting } from '../../src/symmetry';
import { simulateCase } from './rank-simulation';

/**
 * The shortcuts that keep `lacuna rank` fast on cubic cells (many settings, about 60 distinct
 * conditions) checked against the plain definitions: conventions.md section 2 for "forbidden"
 * (via `forbids`), one pattern per distinct set of forbidding conditions, and rotation
 * agreements that do not depend on whether the sampled pairs were cached.
 */
describe('rank fast paths on a cubic cell', () => {
  const setting = findSetting('P a -3')!;
  const c = simulateCase(setting, 4242, 3000);
  const t = c.table;
  const cell = makeCell(t.meta.cell!);
  if (!cell.ok) throw cell.error;
  const cands = candidateSettings(allSettings(), cell.value, DEFAULT_TOLERANCE);
  const byKey = new Map<string, ConditionLike>();
  for (const cd of cands) for (const x of cd.setting.conditions) byKey.set(JSON.stringify([x.zone, x.coeffs, x.modulus]), x);
  const conditions = [...byKey.values()];

  it('has more conditions than the 52 a numeric bit-set key holds (the hashed path is the one tested)', () => {
    expect(cands.length).toBeGreaterThan(50);
    expect(conditions.length).toBeGreaterThan(52);
  });

  it('absence patterns and counts equal a direct evaluation of every condition on every reflection', () => {
    const expected = new Float64Array(t.n).fill(1000);
    const model = { k: 1, violationFraction: 0.03 };
    const abs = absenceEvidence(t, expected, conditions, model);
    // reference: the set of forbidding conditions of each reflection, by the definition
    const ref = new Map<string, { count: number; logOdds: number }>();
    const nForb = new Array(conditions.length).fill(0);
    for (let j = 0; j < t.n; j++) {
      const ids: number[] = [];
      conditions.forEach((cd, q) => { if (forbids(cd, t.h[j], t.k[j], t.l[j])) ids.push(q); });
      if (!ids.length) { expect(abs.reflectionLogOdds[j]).toBeNaN(); continue; }
      for (const q of ids) nForb[q]++;
      const key = ids.join(',');
      const e = ref.get(key) ?? { count: 0, logOdds: 0 };
      e.count++;
      e.logOdds += abs.reflectionLogOdds[j];
      ref.set(key, e);
    }
    expect(abs.conditions.map((x) => x.n)).toEqual(nForb);
    const got = new Map(abs.patterns.map((p) => [p.ids.join(','), p]));
    expect([...got.keys()].sort()).toEqual([...ref.keys()].sort());
    for (const [key, e] of ref) {
      expect(got.get(key)!.count).toBe(e.count);
      expect(got.get(key)!.logOdds).toBeCloseTo(e.logOdds, 9);
    }

    // the same with the general reflections marked (fixed up to sign by no candidate rotation):
    // they lie in no zone, so skipping the zonal conditions for them changes nothing
    // proper parts (R or -R with det +1): R and -R fix the same h up to sign
    const det = (r: ArrayLike<number>) => r[0] * (r[4] * r[8] - r[5] * r[7]) - r[1] * (r[3] * r[8] - r[5] * r[6]) + r[2] * (r[3] * r[7] - r[4] * r[6]);
    const rots = cands.flatMap((cd) => cd.setting.rotations).map((r) => (det(r) > 0 ? Array.from(r) : Array.from(r, (v) => -v)));
    const general = new Uint8Array(t.n);
    for (let j = 0; j < t.n; j++) {
      const h = t.h[j], k = t.k[j], l = t.l[j];
      general[j] = rots.some((r) => {
        if (r.every((v, i) => v === (i % 4 === 0 ? 1 : 0))) return false;
        const h2 = h * r[0] + k * r[3] + l * r[6], k2 = h * r[1] + k * r[4] + l * r[7], l2 = h * r[2] + k * r[5] + l * r[8];
        return (h2 === h && k2 === k && l2 === l) || (h2 === -h && k2 === -k && l2 === -l);
      }) ? 0 : 1;
    }
    expect(general.reduce((a, b) => a + b, 0)).toBeGreaterThan(0.5 * t.n);
    const withGeneral = absenceEvidence(t, expected, conditions, model, 1, undefined, general);
    expect(withGeneral.conditions.map((x) => [x.n, x.nZone, x.logOddsIntensities])).toEqual(abs.conditions.map((x) => [x.n, x.nZone, x.logOddsIntensities]));
    expect(withGeneral.patterns).toEqual(abs.patterns);
  });

  it('rotation agreements are the same with the sampled pairs cached across calls', () => {
    const index = new HklIndex(t);
    const rotations = [[0, 0, 1, 1, 0, 0, 0, 1, 0], [-1, 0, 0, 0, -1, 0, 0, 0, 1], [0, 1, 0, -1, 0, 0, 0, 0, 1]];
    const e2 = Float64Array.from(t.i, (x) => x / 1000), sE = Float64Array.from(t.sigma, (x) => x / 1000);
    const expected = new Float64Array(t.n).fill(1000);
    const cache = {};
    const first = rotationAgreements(t, e2, sE, rotations, index, expected, 1, undefined, cache);
    expect(first).toEqual(rotationAgreements(t, e2, sE, rotations, index, expected, 1));
    // a second call with another sigma scale and normalisation reuses the pairs
    const e2b = e2.map((x) => 0.9 * x), sEb = sE.map((x) => 1.3 * x);
    expect(rotationAgreements(t, e2b, sEb, rotations, index, expected, 1.7, undefined, cache))
      .toEqual(rotationAgreements(t, e2b, sEb, rotations, index, expected, 1.7));
    // the 3-fold along [111] is symmetry of P a -3: its pairs agree
    expect(first[0].pairs).toBeGreaterThan(100);
    expect(first[0].logOdds).toBeGreaterThan(3);
  });
});
