import { describe, expect, it } from 'vitest';
import { getSetting, isSystematicallyAbsent } from '../../src/symmetry';
import { anyRuleForbids, inZone, layerForRule, ruleForbids, type Rule } from '../../src/view';

describe('reflection-condition marks in the views', () => {
  // Reference: the symmetry layer's absence test, which works from the operations themselves
  // (h R = h and h.t not integral), not from the condition list the views read.
  const settings = ['P 1 21/c 1', 'C 1 2/c 1', 'P 21 21 21', 'P c a 21', 'I 41/a m d:2', 'F d -3 m:2', 'P 61 2 2', 'R -3 c:H', 'P -1'];
  for (const name of settings) {
    it(`marks exactly the reflections ${name} forbids`, () => {
      const s = getSetting(name);
      const failures: string[] = [];
      for (let h = -6; h <= 6; h++) for (let k = -6; k <= 6; k++) for (let l = -6; l <= 6; l++) {
        if (h === 0 && k === 0 && l === 0) continue;
        const ours = anyRuleForbids(s.conditions, h, k, l);
        const ref = isSystematicallyAbsent(s, h, k, l);
        if (ours !== ref) failures.push(`${h} ${k} ${l}: view ${ours}, symmetry ${ref}`);
      }
      expect(failures.slice(0, 10)).toEqual([]);
    });
  }

  it('follows the contract examples of conventions section 2', () => {
    const c: Rule = { text: 'hkl: h+k = 2n', zone: [], coeffs: [1, 1, 0], modulus: 2 };
    const glide: Rule = { text: 'h0l: l = 2n', zone: [[0, 1, 0]], coeffs: [0, 0, 1], modulus: 2 };
    const screw: Rule = { text: '00l: l = 4n', zone: [[1, 0, 0], [0, 1, 0]], coeffs: [0, 0, 1], modulus: 4 };
    expect(ruleForbids(c, 1, 0, 0)).toBe(true);
    expect(ruleForbids(c, 1, 1, 5)).toBe(false);
    expect(ruleForbids(glide, 2, 0, 1)).toBe(true);
    expect(ruleForbids(glide, 2, 1, 1)).toBe(false); // outside the zone
    expect(inZone(glide, 2, 1, 1)).toBe(false);
    expect(ruleForbids(screw, 0, 0, 2)).toBe(true);
    expect(ruleForbids(screw, 0, 0, 8)).toBe(false);
    expect(ruleForbids(screw, 1, 0, 2)).toBe(false);
  });

  it('picks a layer that shows the zone of a rule', () => {
    expect(layerForRule({ text: 'h0l: l = 2n', zone: [[0, 1, 0]], coeffs: [0, 0, 1], modulus: 2 })).toBe('h0l');
    expect(layerForRule({ text: 'hk0: h = 2n', zone: [[0, 0, 1]], coeffs: [1, 0, 0], modulus: 2 })).toBe('hk0');
    expect(layerForRule({ text: '0kl: k = 2n', zone: [[1, 0, 0]], coeffs: [0, 1, 0], modulus: 2 })).toBe('0kl');
    expect(layerForRule({ text: 'hhl: l = 2n', zone: [[1, -1, 0]], coeffs: [0, 0, 1], modulus: 2 })).toBe('hhl');
    // Axes: 00l and h00 lie in h0l; 0k0 does not, but lies in 0kl.
    expect(layerForRule({ text: '00l: l = 2n', zone: [[1, 0, 0], [0, 1, 0]], coeffs: [0, 0, 1], modulus: 2 })).toBe('h0l');
    expect(layerForRule({ text: 'h00: h = 2n', zone: [[0, 1, 0], [0, 0, 1]], coeffs: [1, 0, 0], modulus: 2 })).toBe('h0l');
    expect(layerForRule({ text: '0k0: k = 2n', zone: [[1, 0, 0], [0, 0, 1]], coeffs: [0, 1, 0], modulus: 2 })).toBe('0kl');
    expect(layerForRule({ text: 'hkl: h+k = 2n', zone: [], coeffs: [1, 1, 0], modulus: 2 })).toBeUndefined();
  });
});
