import { describe, expect, it } from 'vitest';
import {
  absenceBits,
  absentFlags,
  allSettings,
  centricColumn,
  epsilonColumn,
  breaksCondition,
  buildConditionCatalogue,
  classifyReflections,
  countAbsentPerSetting,
  epsilonFactor,
  evaluateConditions,
  isCentric,
  isSystematicallyAbsent,
  testBit,
} from '../../src/symmetry';
import { decodeBits, gemmiFixture, indexGrid } from './reference-fixture';

// Reference: gemmi 0.5.7 (Debian python3-gemmi) GroupOps.systematic_absences,
// epsilon_factor_without_centering_array and centric_flag_array, fixture
// tests/reference/symmetry-gemmi.json written by tests/reference/symmetry-gemmi.py.
// Failures are collected over the whole table and reported together.

describe('systematic absences of every setting against gemmi (|h|,|k|,|l| <= 8)', () => {
  const fx = gemmiFixture();
  const settings = allSettings();
  const grid = indexGrid(fx.absent_grid);
  const expected = fx.settings.map((g) => decodeBits(fx.absent_patterns[g.absent], grid.n));

  it('the fixture is what it claims (counts match the stored totals)', () => {
    fx.settings.forEach((g, s) => expect(expected[s].filter(Boolean).length).toBe(g.n_absent));
    // P 1 has no absences; F d -3 m has many
    expect(fx.settings[0].n_absent).toBe(0);
    expect(Math.max(...fx.settings.map((g) => g.n_absent))).toBeGreaterThan(3000);
  });

  it('per-reflection predicate isSystematicallyAbsent', () => {
    const bad: string[] = [];
    settings.forEach((s, si) => {
      let wrong = 0;
      let first = '';
      for (let i = 0; i < grid.n; i++) {
        const got = isSystematicallyAbsent(s, grid.h[i], grid.k[i], grid.l[i]);
        if (got !== expected[si][i]) {
          if (!wrong) first = `${grid.h[i]},${grid.k[i]},${grid.l[i]} ours ${got}`;
          wrong++;
        }
      }
      if (wrong) bad.push(`${s.hm}: ${wrong} differ, e.g. ${first}`);
    });
    expect(bad).toEqual([]);
  });

  it('column version absentFlags over a whole grid', () => {
    const bad: string[] = [];
    const out = new Uint8Array(grid.n);
    settings.forEach((s, si) => {
      absentFlags(s, grid.h, grid.k, grid.l, grid.n, out);
      let wrong = 0;
      for (let i = 0; i < grid.n; i++) if ((out[i] === 1) !== expected[si][i]) wrong++;
      if (wrong) bad.push(`${s.hm}: ${wrong} differ`);
    });
    expect(bad).toEqual([]);
  });

  it('the derived conditions list (conventions.md section 2 semantics)', () => {
    const bad: string[] = [];
    settings.forEach((s, si) => {
      let wrong = 0;
      let first = '';
      for (let i = 0; i < grid.n; i++) {
        const got = s.conditions.some((c) => breaksCondition(c, grid.h[i], grid.k[i], grid.l[i]));
        if (got !== expected[si][i]) {
          if (!wrong) first = `${grid.h[i]},${grid.k[i]},${grid.l[i]} ours ${got}`;
          wrong++;
        }
      }
      if (wrong) bad.push(`${s.hm}: ${wrong} differ, e.g. ${first}`);
    });
    expect(bad).toEqual([]);
  });

  it('the fast whole-table path (absenceBits and evaluateConditions)', () => {
    const cat = buildConditionCatalogue(settings);
    const bits = absenceBits(cat, grid.h, grid.k, grid.l, grid.n);
    const viol = evaluateConditions(cat, grid.h, grid.k, grid.l, grid.n);
    const bad: string[] = [];
    settings.forEach((s, si) => {
      let wrong = 0;
      let wrongViaConditions = 0;
      for (let i = 0; i < grid.n; i++) {
        if (testBit(bits, cat.settingWords, i, si) !== expected[si][i]) wrong++;
        const viaConditions = Array.from(cat.conditionsOfSetting[si]).some((j) => testBit(viol, cat.conditionWords, i, j));
        if (viaConditions !== expected[si][i]) wrongViaConditions++;
      }
      if (wrong || wrongViaConditions) bad.push(`${s.hm}: ${wrong} differ in absenceBits, ${wrongViaConditions} via evaluateConditions`);
    });
    expect(bad).toEqual([]);
    // per-setting counts from the absence classes equal gemmi's totals
    const counts = countAbsentPerSetting(cat, classifyReflections(cat, grid.h, grid.k, grid.l, grid.n));
    expect(Array.from(counts)).toEqual(fx.settings.map((g) => g.n_absent));
    // the point of the catalogue: far fewer distinct conditions than settings
    expect(cat.conditions.length).toBeLessThan(settings.length);
  });
});

describe('epsilon factors and centric flags of every setting against gemmi (|h|,|k|,|l| <= 3)', () => {
  const fx = gemmiFixture();
  const settings = allSettings();
  const grid = indexGrid(fx.eps_grid, true);

  it('epsilonFactor equals gemmi epsilon_factor_without_centering', () => {
    const bad: string[] = [];
    settings.forEach((s, si) => {
      const want = fx.eps_patterns[fx.settings[si].eps];
      for (let i = 0; i < grid.n; i++) {
        const e = epsilonFactor(s, grid.h[i], grid.k[i], grid.l[i]);
        if (e !== parseInt(want[i], 36)) {
          bad.push(`${s.hm} ${grid.h[i]},${grid.k[i]},${grid.l[i]}: ${e} vs gemmi ${want[i]}`);
          break;
        }
      }
    });
    expect(bad).toEqual([]);
  });

  it('column versions equal the per-reflection ones', () => {
    const bad: string[] = [];
    settings.forEach((s, si) => {
      const eps = epsilonColumn(s, grid.h, grid.k, grid.l, grid.n);
      const cen = centricColumn(s, grid.h, grid.k, grid.l, grid.n);
      const wantE = fx.eps_patterns[fx.settings[si].eps];
      const wantC = fx.centric_patterns[fx.settings[si].centric];
      for (let i = 0; i < grid.n; i++)
        if (eps[i] !== parseInt(wantE[i], 36) || cen[i] !== Number(wantC[i])) { bad.push(s.hm); break; }
    });
    expect(bad).toEqual([]);
  });

  it('isCentric equals gemmi centric_flag_array', () => {
    const bad: string[] = [];
    settings.forEach((s, si) => {
      const want = fx.centric_patterns[fx.settings[si].centric];
      for (let i = 0; i < grid.n; i++) {
        const c = isCentric(s, grid.h[i], grid.k[i], grid.l[i]);
        if (c !== (want[i] === '1')) {
          bad.push(`${s.hm} ${grid.h[i]},${grid.k[i]},${grid.l[i]}: ${c} vs gemmi ${want[i]}`);
          break;
        }
      }
    });
    expect(bad).toEqual([]);
  });
});
