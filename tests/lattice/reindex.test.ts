import { describe, expect, it } from 'vitest';
import { tableFromArrays, type ReflectionTable } from '../../src/core';
import {
  parseChangeOfBasis, formatChangeOfBasis, findInverseBasis, composeBasis, basisDeterminant, isUnimodularBasis,
  reindexTable, transformCell, basisRows, type ChangeOfBasis,
} from '../../src/lattice';
import { getSetting, isSystematicallyAbsent } from '../../src/symmetry';

function cob(text: string): ChangeOfBasis {
  const r = parseChangeOfBasis(text);
  if (!r.ok) throw r.error;
  return r.value;
}

function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

function randomTable(n: number, seed: number): ReflectionTable {
  const r = rng(seed);
  const h: number[] = [], k: number[] = [], l: number[] = [], i: number[] = [], s: number[] = [];
  for (let j = 0; j < n; j++) {
    h.push(Math.floor(r() * 31) - 15); k.push(Math.floor(r() * 21) - 10); l.push(Math.floor(r() * 41) - 20);
    i.push((r() - 0.1) * 1000); s.push(r() * 30 + 0.5);
  }
  return tableFromArrays({ h, k, l, i, sigma: s }, { source: 'random.cif', cell: { a: 7.1, b: 9.3, c: 11.2, alpha: 90, beta: 104.2, gamma: 90 } });
}

describe('change of basis notation (International Tables Vol. A, Part 5)', () => {
  it('reads a,b,-a-c as the columns of P', () => {
    expect(basisRows(cob('a,b,-a-c'))).toEqual([[1, 0, -1], [0, 1, 0], [0, 0, -1]]);
    expect(formatChangeOfBasis(cob(' a , b , -a - c '))).toBe('a,b,-a-c');
  });
  it('reads fractions, products, divisions, origin shifts and the matrix form', () => {
    expect(formatChangeOfBasis(cob('1/2a+1/2b,-a/2+b/2,c'))).toBe('1/2a+1/2b,-1/2a+1/2b,c');
    expect(formatChangeOfBasis(cob('2*a,b,c'))).toBe('2a,b,c');
    expect(formatChangeOfBasis(cob('a,b,c;1/2,0,-1/4'))).toBe('a,b,c;1/2,0,-1/4');
    expect(formatChangeOfBasis(cob('[[1,0,-1],[0,1,0],[0,0,-1]]'))).toBe('a,b,-a-c');
    expect(formatChangeOfBasis(cob('1 0 -1 0 1 0 0 0 -1'))).toBe('a,b,-a-c');
    expect(basisDeterminant(cob('1/2a+1/2b,-1/2a+1/2b,c'))).toEqual({ num: 1, den: 2 });
  });
  it('explains bad input with a column', () => {
    const cases: [string, RegExp][] = [
      ['a,b', /2 parts/],
      ['a,b,a+b', /singular/],
      ['a,b,c+x', /cannot read '\+x'/],
      ['a,b,c+1', /constant term/],
      ['1,2,3', /neither/],
      ['a,b,c;1/2,0', /three numbers/],
      ['', /empty/],
    ];
    for (const [text, re] of cases) {
      const r = parseChangeOfBasis(text, '--transform');
      expect(r.ok, text).toBe(false);
      if (!r.ok) expect(r.error.describe(), text).toMatch(re);
    }
    const r = parseChangeOfBasis('a,b,c+x', '--transform');
    if (!r.ok) expect(r.error.location.column).toBe(6);
  });
  it('inverts exactly', () => {
    for (const t of ['a,b,-a-c', 'a-b,a+b,c', '1/2a+1/2b,-1/2a+1/2b,c', '-b,a+c,c', 'a,b,c;1/2,1/2,0']) {
      const p = cob(t);
      const inv = findInverseBasis(p)!;
      expect(formatChangeOfBasis(composeBasis(p, inv)).split(';')[0], t).toBe('a,b,c');
    }
    expect(isUnimodularBasis(cob('a,b,-a-c'))).toBe(true);
    expect(isUnimodularBasis(cob('a-b,a+b,c'))).toBe(false);
  });
});

describe('reindexing a reflection table', () => {
  it('round trips exactly: P then P^-1 gives the original rows, intensities and sigmas', () => {
    const t = randomTable(2000, 7);
    for (const text of ['a,b,-a-c', '-a-c,b,a', 'c,a,b', 'a+b,-a,c']) {
      const p = cob(text);
      const fwd = reindexTable(t, p);
      if (!fwd.ok) throw fwd.error;
      const back = reindexTable(fwd.value, findInverseBasis(p)!);
      if (!back.ok) throw back.error;
      expect(back.value.n).toBe(t.n);
      expect(Array.from(back.value.h)).toEqual(Array.from(t.h));
      expect(Array.from(back.value.k)).toEqual(Array.from(t.k));
      expect(Array.from(back.value.l)).toEqual(Array.from(t.l));
      expect(Array.from(back.value.i)).toEqual(Array.from(t.i));
      expect(Array.from(back.value.sigma)).toEqual(Array.from(t.sigma));
      const c0 = t.meta.cell!, c2 = back.value.meta.cell!;
      for (const key of ['a', 'b', 'c', 'alpha', 'beta', 'gamma'] as const) expect(c2[key]).toBeCloseTo(c0[key], 9);
    }
  });

  it('transforms the cell as G\' = P^T G P (a,b,-a-c of a monoclinic cell, computed by hand)', () => {
    // |-a-c|^2 = a^2 + c^2 + 2ac cos(beta) for a = 7.1, c = 11.2, beta = 104.2
    const r = (104.2 * Math.PI) / 180;
    const c2 = Math.sqrt(7.1 ** 2 + 11.2 ** 2 + 2 * 7.1 * 11.2 * Math.cos(r));
    const out = transformCell({ a: 7.1, b: 9.3, c: 11.2, alpha: 90, beta: 104.2, gamma: 90 }, cob('a,b,-a-c'));
    expect(out.c).toBeCloseTo(c2, 10);
    expect(out.a).toBeCloseTo(7.1, 12);
    expect(out.alpha).toBeCloseTo(90, 10);
  });

  it('moves P 1 21/n 1 data onto the absences of P 1 21/c 1 with a,b,a+c (symmetry engine)', () => {
    const n = getSetting('P 1 21/n 1');
    const c = getSetting('P 1 21/c 1');
    const t = randomTable(5000, 11);
    // make the data obey P 1 21/n 1: absent reflections get zero intensity
    const i = Float32Array.from(t.i, (x, j) => (isSystematicallyAbsent(n, t.h[j], t.k[j], t.l[j]) ? 0 : Math.abs(x) + 1));
    const data = { ...t, i };
    let absentBefore = 0;
    for (let j = 0; j < t.n; j++) if (i[j] === 0) absentBefore++;
    expect(absentBefore).toBeGreaterThan(50);
    const r = reindexTable(data, cob('a,b,a+c'));
    if (!r.ok) throw r.error;
    const failures: string[] = [];
    let absentAfter = 0;
    for (let j = 0; j < r.value.n; j++) {
      const absent = isSystematicallyAbsent(c, r.value.h[j], r.value.k[j], r.value.l[j]);
      if (absent) absentAfter++;
      if (absent !== (r.value.i[j] === 0)) failures.push(`${r.value.h[j]} ${r.value.k[j]} ${r.value.l[j]} I=${r.value.i[j]}`);
    }
    expect(failures.slice(0, 10)).toEqual([]);
    expect(absentAfter).toBe(absentBefore);
  });

  it('refuses non-integral results unless told to drop them, and then counts them', () => {
    const t = tableFromArrays({ h: [1, 2, 1, 0], k: [1, 0, 0, 0], l: [0, 0, 0, 2], i: [5, 6, 7, 8], sigma: [1, 1, 1, 1] }, { source: 'x.cif' });
    const p = cob('1/2a+1/2b,-1/2a+1/2b,c'); // C cell -> primitive: h' = (h+k)/2 ...
    const strict = reindexTable(t, p);
    expect(strict.ok).toBe(false);
    if (!strict.ok) expect(strict.error.describe()).toMatch(/^x\.cif: 1 of 4 reflections get non-integer indices .*first: 1 0 0/);
    const loose = reindexTable(t, p, { dropNonIntegral: true });
    if (!loose.ok) throw loose.error;
    expect(loose.value.n).toBe(3);
    expect(loose.value.meta.rejectedCount).toBe(1);
    expect(loose.value.meta.warnings.join()).toMatch(/1 reflections left out/);
  });

  it('warns about a change of hand (and names the right-handed alternative) and handles an empty table', () => {
    const t = randomTable(0, 1);
    const r = reindexTable(t, cob('a,b,-a-c'));
    if (!r.ok) throw r.error;
    expect(r.value.meta.warnings.join()).toMatch(/determinant -1: the new axes are left-handed.*-a,-b,a\+c describes the same cell right-handed/);
    expect(reindexTable(t, cob('-a-c,b,a')).ok && reindexTable(t, cob('-a-c,b,a')).ok).toBe(true);
    const big = reindexTable(randomTable(10, 3), cob('a,b,2c'));
    expect(big.ok && big.value.meta.warnings.join()).toMatch(/2 times the volume/);
    const e = reindexTable(t, cob('b,c,a'));
    expect(e.ok && e.value.n).toBe(0);
  });
});
