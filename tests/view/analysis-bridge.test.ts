import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { readReflections } from '../../src/io';
import { rankSpaceGroups } from '../../src/analysis';
import { getSetting, isSystematicallyAbsent } from '../../src/symmetry';
import { fromRank, wilsonPoints, anyRuleForbids } from '../../src/view';
import { REPO_ROOT } from '../helpers/paths';

describe('the evidence panels read the ranking engine faithfully', () => {
  const bytes = new Uint8Array(readFileSync(resolve(REPO_ROOT, 'public/demo/qm-101.cif')));
  const t = readReflections(bytes, { source: 'qm-101.cif' });
  if (!t.ok) throw t.error;
  const r = rankSpaceGroups(t.value);
  if (!r.ok) throw r.error;
  const view = fromRank(r.value, { wilson: [] });

  it('keeps order, probabilities and conditions', () => {
    expect(view.available).toBe(true);
    expect(view.candidates.map((c) => c.hm)).toEqual(r.value.candidates.map((c) => c.hm));
    expect(view.candidates.map((c) => c.probability)).toEqual(r.value.candidates.map((c) => c.probability));
    expect(view.conditions.map((c) => c.text)).toEqual(r.value.conditions.map((c) => c.text));
    // The demo QM-101 was built in P 1 21/c 1 (public/demo/README.md).
    expect(view.candidates[0].hm).toBe('P 1 21/c 1');
  });

  it('gives each candidate the rules that forbid exactly what its setting forbids (within the tested conditions)', () => {
    const best = view.candidates[0];
    const s = getSetting(best.hm);
    for (let h = -5; h <= 5; h++) for (let k = -5; k <= 5; k++) for (let l = -5; l <= 5; l++) {
      if (!h && !k && !l) continue;
      expect(anyRuleForbids(best.rules, h, k, l), `${h} ${k} ${l}`).toBe(isSystematicallyAbsent(s, h, k, l));
    }
    expect(best.explanation.length).toBeGreaterThan(1);
  });

  it('makes a falling Wilson plot with a positive B for ordinary data', () => {
    const w = wilsonPoints(t.value);
    expect(w.points.length).toBeGreaterThan(5);
    expect(w.B).toBeGreaterThan(0);
    expect(w.points[0].lnMeanI).toBeGreaterThan(w.points[w.points.length - 1].lnMeanI);
  });
});
