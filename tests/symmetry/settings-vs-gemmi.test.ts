import { describe, expect, it } from 'vitest';
import { allSettings, DEN, type SymOp } from '../../src/symmetry';
import { gemmiFixture } from './reference-fixture';

// Reference: gemmi 0.5.7 (Debian python3-gemmi), fixture tests/reference/symmetry-gemmi.json
// written by tests/reference/symmetry-gemmi.py. gemmi builds each group from the same Hall
// symbol with its own interpreter; our groups come from src/symmetry/hall.ts.

function opRow(o: SymOp): string {
  return [...o.r, ...o.t].join(',');
}

describe('settings table against gemmi', () => {
  const fx = gemmiFixture();
  const settings = allSettings();

  it('has the 559 settings in the same order with the same symbols', () => {
    expect(settings.length).toBe(559);
    expect(fx.settings.length).toBe(559);
    const bad: string[] = [];
    settings.forEach((s, i) => {
      const g = fx.settings[i];
      if (s.number !== g.number || s.hm !== g.hm || s.hall !== g.hall) bad.push(`${i}: ${s.number} ${s.hm} ${s.hall} vs ${g.number} ${g.hm} ${g.hall}`);
    });
    expect(bad).toEqual([]);
  });

  it('builds, for every setting, exactly the operation set gemmi builds', () => {
    expect(DEN).toBe(24);
    const bad: string[] = [];
    settings.forEach((s, i) => {
      const ours = s.ops.map(opRow).sort();
      const theirs = fx.settings[i].ops.map((r) => r.join(',')).sort();
      if (ours.join(';') !== theirs.join(';')) bad.push(`${s.hm} (${s.hall}): ${ours.length} ops vs gemmi ${theirs.length}`);
    });
    expect(bad).toEqual([]);
  });

  it('derives point group, Laue class, crystal system, centrosymmetry, Sohncke and enantiomorph flags as gemmi', () => {
    const bad: string[] = [];
    settings.forEach((s, i) => {
      const g = fx.settings[i];
      const got = [s.pointGroup, s.laue, s.crystalSystem, s.centrosymmetric, s.sohncke, s.enantiomorph !== undefined, s.order].join(' ');
      // gemmi writes the class of P-6m2/P-62m as -62m; International Tables' class symbol is -6m2
      const want = [g.point_group === '-62m' ? '-6m2' : g.point_group, g.laue, g.crystal_system, g.centrosymmetric, g.sohncke, g.enantiomorphic, g.order].join(' ');
      if (got !== want) bad.push(`${s.hm}: ${got} vs gemmi ${want}`);
    });
    expect(bad).toEqual([]);
  });
});
