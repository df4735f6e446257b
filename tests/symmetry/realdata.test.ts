import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readReflections } from '../../src/io';
import { absentFlags, allSettings, buildConditionCatalogue, classifyReflections, countAbsentPerSetting, getSetting } from '../../src/symmetry';
import { realdata } from '../helpers/paths';

// Real deposited data (shared/realdata/README.md): the depositors removed the reflections their
// published space group forbids, so that group's conditions must forbid none of the rows, while
// groups with conditions the data do not obey forbid some.
function load(name: string) {
  const path = realdata(name);
  const r = readReflections(readFileSync(path), { source: path });
  if (!r.ok) throw r.error;
  return r.value;
}

describe('absences on real data', () => {
  for (const [file, published, other] of [
    ['cod-1560875.cif', 'P 1 21/c 1', 'P 1 21/n 1'],
    ['cod-2014121.cif', 'P c a 21', 'P n a 21'],
  ]) {
    it(`${file}: ${published} forbids none of the deposited reflections, ${other} forbids some`, () => {
      const t = load(file);
      expect(t.n).toBeGreaterThan(1000);
      const count = (hm: string) => absentFlags(getSetting(hm), t.h, t.k, t.l, t.n).reduce((a, b) => a + b, 0);
      expect(count(published)).toBe(0);
      expect(count(other)).toBeGreaterThan(0);
      // the whole-table path agrees for every setting
      const settings = allSettings();
      const cat = buildConditionCatalogue(settings);
      const counts = countAbsentPerSetting(cat, classifyReflections(cat, t.h, t.k, t.l, t.n));
      for (const hm of [published, other, 'P 1', 'F m -3 m']) expect(counts[getSetting(hm).index], hm).toBe(count(hm));
    });
  }
});
