import { describe, expect, it } from 'vitest';
import { tableFromArrays } from '../../src/core';
import { compareIntensities } from '../../src/model';

// Hand-computed expectations from the usual definitions (common practice), see src/model/compare-data.ts.
describe('model against data statistics', () => {
  it('recovers an exact scale, R1 = wR2 = 0 for perfect data', () => {
    const ic = [100, 400, 900, 25];
    const t = tableFromArrays({ h: [1, 2, 3, 4], k: [0, 0, 0, 0], l: [0, 0, 0, 0], i: ic.map((x) => 3 * x), sigma: [10, 20, 30, 5] }, { source: 't' });
    const r = compareIntensities(ic, t);
    if (!r.ok) throw r.error;
    expect(r.value.scale).toBeCloseTo(3, 12);
    expect(r.value.r1).toBeCloseTo(0, 12);
    expect(r.value.wr2).toBeCloseTo(0, 12);
    expect(r.value.goof).toBeCloseTo(0, 12);
    expect(Array.from(r.value.calculated)).toEqual([300, 1200, 2700, 75]);
  });

  it('matches a small hand calculation', () => {
    // Io = 110, 380; Ic = 100, 400; sigma = 10, 20 -> w = 0.01, 0.0025
    // k = (0.01*110*100 + 0.0025*380*400) / (0.01*100^2 + 0.0025*400^2) = (110 + 380) / (100 + 400) = 0.98
    const t = tableFromArrays({ h: [1, 2], k: [0, 0], l: [0, 0], i: [110, 380], sigma: [10, 20] }, { source: 't' });
    const r = compareIntensities([100, 400], t);
    if (!r.ok) throw r.error;
    const k = 0.98;
    expect(r.value.scale).toBeCloseTo(k, 12);
    const d1 = 110 - k * 100, d2 = 380 - k * 400;
    const swd2 = 0.01 * d1 * d1 + 0.0025 * d2 * d2;
    expect(r.value.wr2).toBeCloseTo(Math.sqrt(swd2 / (0.01 * 110 * 110 + 0.0025 * 380 * 380)), 10);
    expect(r.value.goof).toBeCloseTo(Math.sqrt(swd2 / 1), 10);
    const r1 = (Math.abs(Math.sqrt(110) - Math.sqrt(k * 100)) + Math.abs(Math.sqrt(380) - Math.sqrt(k * 400))) / (Math.sqrt(110) + Math.sqrt(380));
    expect(r.value.r1).toBeCloseTo(r1, 10);
    expect(r.value.worst.map((w) => w.h)).toEqual([1, 2]); // |110 - 98|/10 = 1.2 before |380 - 392|/20 = 0.6
  });

  it('leaves out zero sigma and NaN rows, and fails clearly when nothing is usable', () => {
    const t = tableFromArrays({ h: [1, 2, 3], k: [0, 0, 0], l: [0, 0, 0], i: [100, Number.NaN, 50], sigma: [10, 5, 0] }, { source: 'x.cif' });
    const r = compareIntensities([100, 100, 100], t);
    if (!r.ok) throw r.error;
    expect(r.value.n).toBe(1);
    expect(r.value.excluded).toBe(2);
    expect(Number.isNaN(r.value.calculated[2])).toBe(true);
    expect(Number.isNaN(r.value.goof)).toBe(true); // one reflection, one parameter
    const none = compareIntensities([1, 1, 1], tableFromArrays({ h: [1, 2, 3], k: [0, 0, 0], l: [0, 0, 0], i: [1, 2, 3], sigma: [0, 0, 0] }, { source: 'x.cif' }));
    expect(!none.ok && none.error.describe()).toMatch(/^x\.cif: no reflection with a positive sigma/);
    const empty = compareIntensities([], tableFromArrays({ h: [], k: [], l: [], i: [], sigma: [] }, { source: 'e.cif' }));
    expect(empty.ok).toBe(false);
    const zeroModel = compareIntensities([0, 0], tableFromArrays({ h: [1, 2], k: [0, 0], l: [0, 0], i: [5, 6], sigma: [1, 1] }, { source: 'z' }));
    expect(!zeroModel.ok && zeroModel.error.message).toMatch(/zero intensity/);
  });
});
