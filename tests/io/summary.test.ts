import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { countUniqueHkl, summarizeReflections } from '../../src/io';
import { tableFromArrays } from '../../src/core';

function table(rows: number[][], extra: Record<string, unknown> = {}) {
  return tableFromArrays({ h: rows.map((r) => r[0]), k: rows.map((r) => r[1]), l: rows.map((r) => r[2]), i: rows.map((r) => r[3] ?? 1), sigma: rows.map((r) => r[4] ?? 1) }, { source: 't', ...extra });
}

describe('countUniqueHkl', () => {
  // expected: a Set of "h,k,l" strings, computed independently
  const check = (rows: number[][]): void => void expect(countUniqueHkl(table(rows))).toBe(new Set(rows.map((r) => `${r[0]},${r[1]},${r[2]}`)).size);
  it('small index ranges (bit-set path), random (property)', () => {
    const idx = fc.integer({ min: -40, max: 40 });
    fc.assert(fc.property(fc.array(fc.tuple(idx, idx, idx), { maxLength: 300 }), (rows) => { check(rows); }), { numRuns: 300 });
  });
  it('extreme index ranges (hash path), random (property)', () => {
    const idx = fc.oneof(fc.integer({ min: -32767, max: 32767 }), fc.constantFrom(-32767, 32767, 0, 1));
    fc.assert(fc.property(fc.array(fc.tuple(idx, idx, idx), { minLength: 2, maxLength: 300 }), (rows) => {
      check([[-32767, -32767, -32767], [32767, 32767, 32767], ...rows]);
    }), { numRuns: 300 });
  });
  it('degenerate tables: empty, one row', () => {
    expect(countUniqueHkl(table([]))).toBe(0);
    expect(countUniqueHkl(table([[1, 2, 3]]))).toBe(1);
  });
});

describe('summarizeReflections', () => {
  it('counts, multiplicity, I/sigma, negatives and d range (10 A cubic cell, by hand)', () => {
    const s = summarizeReflections(table([[1, 0, 0, 10, 2], [0, 0, 2, -4, 2], [1, 0, 0, 6, 2]], { cell: { a: 10, b: 10, c: 10, alpha: 90, beta: 90, gamma: 90 } }));
    expect(s.reflections).toBe(3);
    expect(s.unique).toBe(2);
    expect(s.multiplicity).toBe(1.5);
    expect(s.meanIOverSigma).toBeCloseTo((5 - 2 + 3) / 3, 12);
    expect(s.fractionNegative).toBeCloseTo(1 / 3, 12);
    expect(s.dMax).toBeCloseTo(10, 12);
    expect(s.dMin).toBeCloseTo(5, 12);
    expect(s.indexRange).toEqual({ h: [0, 1], k: [0, 0], l: [0, 2] });
    expect(s.warnings.join(' ')).toMatch(/1 rows repeat an h,k,l/);
  });
  it('an empty table says so and has no statistics', () => {
    const s = summarizeReflections(table([]));
    expect(s.reflections).toBe(0);
    expect(s.meanIOverSigma).toBeUndefined();
    expect(s.dMin).toBeUndefined();
    expect(s.warnings).toContain('no reflection was accepted');
  });
});
