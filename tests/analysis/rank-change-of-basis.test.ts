import { describe, expect, it } from 'vitest';
import { parseChangeOfBasis, reindexTable } from '../../src/lattice';
import { rankSpaceGroups } from '../../src/analysis';
import { allSettings } from '../../src/symmetry';
import { simulateCase } from './rank-simulation';

// Independent check of the reported change of basis: reindex the data with it (src/lattice,
// International Tables Vol. A Part 5 convention) and rank again; the standard setting of the
// same type must then come first.
describe('change of basis to the standard setting', () => {
  for (const name of ['P 1 21/n 1', 'P b n m', 'I 1 2/a 1', 'P n 21 a']) {
    it(`${name}: reindexed data rank the standard setting first`, () => {
      const s = allSettings().find((x) => x.hm === name)!;
      const std = allSettings().find((x) => x.number === s.number)!;
      const c = simulateCase(s, 77);
      const r = rankSpaceGroups(c.table);
      if (!r.ok) throw r.error;
      const top = r.value.candidates[0];
      expect(top.number).toBe(s.number);
      expect(top.standard).toBe(false);
      expect(top.change_of_basis).not.toBeNull();
      const cob = parseChangeOfBasis(top.change_of_basis!);
      if (!cob.ok) throw cob.error;
      const t2 = reindexTable(c.table, cob.value);
      if (!t2.ok) throw t2.error;
      const r2 = rankSpaceGroups(t2.value);
      if (!r2.ok) throw r2.error;
      expect(r2.value.classes[0].members).toContain(std.hm);
    });
  }
});
