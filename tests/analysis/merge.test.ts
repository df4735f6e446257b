import { describe, expect, it } from 'vitest';
import { tableFromArrays } from '../../src/core';
import { mergeIdentical } from '../../src/analysis';

describe('merging repeated observations of the same indices', () => {
  it('weights by 1/sigma^2, keeps equivalent but different indices apart, and reports R_int', () => {
    // hand-computed: (1,2,3) seen as 10 (s 1) and 14 (s 2): mean (10 + 14/4)/(1 + 1/4) = 10.8, sigma 1/sqrt(1.25)
    // R_int = (|10 - 10.8| + |14 - 10.8|) / (10 + 14) = 4/24
    const t = tableFromArrays({ h: [1, 1, -1, 0], k: [2, 2, -2, 0], l: [3, 3, -3, 1], i: [10, 14, 7, 5], sigma: [1, 2, 1, 1] }, { source: 'hand' });
    const m = mergeIdentical(t);
    expect(m.unique).toBe(3);
    expect(m.repeated).toBe(1);
    const j = Array.from({ length: m.table.n }, (_, q) => q).find((q) => m.table.h[q] === 1)!;
    expect(m.table.i[j]).toBeCloseTo(10.8, 4);
    expect(m.table.sigma[j]).toBeCloseTo(1 / Math.sqrt(1.25), 5);
    expect(m.rInt).toBeCloseTo(4 / 24, 6);
    expect(Number.isNaN(m.sigmaScale)).toBe(true); // fewer than 20 deviations
    expect(m.table.meta.unmerged).toBe(false);
  });
  it('handles a table without repeats and an empty table', () => {
    const t = tableFromArrays({ h: [1, 2], k: [0, 0], l: [0, 0], i: [1, 2], sigma: [1, 1] }, { source: 'x' });
    expect(mergeIdentical(t).unique).toBe(2);
    expect(Number.isNaN(mergeIdentical(t).rInt)).toBe(true);
    const e = tableFromArrays({ h: [], k: [], l: [], i: [], sigma: [] }, { source: 'e' });
    expect(mergeIdentical(e).unique).toBe(0);
  });
});
