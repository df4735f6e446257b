import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core';
import { allSettings, findSetting, getSetting, laueClassesForLattice, opSetKey, settingFromOps, shortSymbol } from '../../src/symmetry';

describe('name lookup', () => {
  it('accepts numbers, H-M symbols in many spellings and Hall symbols', () => {
    const cases: [string | number, string][] = [
      [14, 'P 1 21/c 1'],
      ['14', 'P 1 21/c 1'],
      ['P21/c', 'P 1 21/c 1'],
      ['P 1 21/c 1', 'P 1 21/c 1'],
      ['P121/c1', 'P 1 21/c 1'],
      ['P2_1/c', 'P 1 21/c 1'],
      ['p21/c', 'P 1 21/c 1'],
      ['-P 2ybc', 'P 1 21/c 1'],
      ['Hall: -P 2ybc', 'P 1 21/c 1'],
      ['P21/n', 'P 1 21/n 1'],
      ['P 1 1 21/b', 'P 1 1 21/b'],
      ['R-3:H', 'R -3:H'],
      ['R-3:R', 'R -3:R'],
      ['R3', 'R 3:H'],
      ['H3', 'R 3:H'],
      ['Fd-3m:1', 'F d -3 m:1'],
      ['Fd-3m:2', 'F d -3 m:2'],
      ['F d -3 m', 'F d -3 m:1'], // table order: origin choice 1 first
      ['227', 'F d -3 m:1'],
      ['P212121', 'P 21 21 21'],
      ['P 21/b 21/c 21/a', 'P b c a'], // full symbol
      ['Cmce', 'C m c a'], // e-glide symbol of the 2002 edition
      ['C c c e:2', 'C c c a:2'],
      ['I41/amd:2', 'I 41/a m d:2'],
      ['P6_122', 'P 61 2 2'],
      ['  P 63/m m c ', 'P 63/m m c'],
    ];
    const bad: string[] = [];
    for (const [q, want] of cases) {
      const got = findSetting(q)?.hm;
      if (got !== want) bad.push(`${JSON.stringify(q)} -> ${got} (want ${want})`);
    }
    expect(bad).toEqual([]);
  });

  it('finds every setting by its own H-M and Hall symbols', () => {
    const bad: string[] = [];
    for (const s of allSettings()) {
      if (findSetting(s.hm) !== s) bad.push(`hm ${s.hm}`);
      // a Hall symbol can read like an H-M symbol ('P 2'); the prefix makes it unambiguous
      const byHall = findSetting('Hall: ' + s.hall);
      if (!byHall || opSetKey(byHall.ops) !== opSetKey(s.ops)) bad.push(`hall ${s.hall}`);
      const byShort = findSetting(shortSymbol(s.hm));
      if (byShort?.number !== s.number) bad.push(`short ${shortSymbol(s.hm)} -> ${byShort?.hm}`);
      if (settingFromOps(s.ops) === undefined) bad.push(`ops of ${s.hm}`);
    }
    expect(bad).toEqual([]);
  });

  it('returns undefined for unknown names and getSetting explains', () => {
    for (const q of ['', 'P 5', 'Q21/c', '0', '231', 'x,y,z']) expect(findSetting(q), q).toBeUndefined();
    expect(() => getSetting('P 5')).toThrow(InputError);
    try {
      getSetting('Pmna2');
    } catch (e) {
      expect((e as InputError).describe()).toMatch(/unknown space-group symbol 'Pmna2'.*P21\/c/);
    }
    expect(() => getSetting(231)).toThrow(InputError);
    try {
      getSetting(231);
    } catch (e) {
      expect((e as InputError).describe()).toMatch(/no space group number 231.*1 to 230/);
    }
  });
});

describe('Laue classes', () => {
  it('per Bravais lattice', () => {
    expect(laueClassesForLattice('mP')).toEqual(['2/m']);
    expect(laueClassesForLattice('hR')).toEqual(['-3', '-3m']);
    expect(laueClassesForLattice('hP')).toEqual(['-3', '-3m', '6/m', '6/mmm']);
    expect(laueClassesForLattice('cF')).toEqual(['m-3', 'm-3m']);
  });
  it('every setting lists its point-group rotations and the Laue group (point group plus inversion)', () => {
    for (const s of allSettings()) {
      expect(s.rotations.length * (1 + s.centringVectors.length)).toBe(s.order);
      expect(s.laueRotations.length).toBe(s.centrosymmetric ? s.rotations.length : 2 * s.rotations.length);
    }
  });
});
