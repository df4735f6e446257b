import { describe, expect, it } from 'vitest';
import {
  breaksCondition,
  combinedConditionText,
  getSetting,
  isSystematicallyAbsent,
  parseConditionText,
  type Condition,
} from '../../src/symmetry';

// Reflection conditions of International Tables for Crystallography Vol. A (space-group tables,
// "Reflection conditions", general position). The expected lines below are WRITTEN FROM MEMORY
// of those tables, in three-index form (hexagonal hkil zones written with h, k, l: hh-2hl -> hhl,
// hh-0l -> h-hl, 000l -> 00l). International Tables list one representative of symmetry-equivalent
// zones and also list conditions implied by others; so each group is checked in two ways:
//  1. the reflections the ITA lines forbid, closed under the Laue group (absences are invariant
//     under it), are exactly the reflections our derived conditions forbid (|h|,|k|,|l| <= 8);
//  2. the lines in `same` appear verbatim among our condition texts (or combined texts).
interface Case { hm: string; ita: string[]; same: string[] }
const CASES: Case[] = [
  { hm: 'P 1 21/c 1', ita: ['h0l: l = 2n', '0k0: k = 2n', '00l: l = 2n'], same: ['h0l: l = 2n', '0k0: k = 2n'] },
  { hm: 'P 1 21/n 1', ita: ['h0l: h+l = 2n', '0k0: k = 2n', 'h00: h = 2n', '00l: l = 2n'], same: ['h0l: h+l = 2n', '0k0: k = 2n'] },
  { hm: 'C 1 2/c 1', ita: ['hkl: h+k = 2n', 'h0l: h, l = 2n', '0kl: k = 2n', 'hk0: h+k = 2n', '0k0: k = 2n', 'h00: h = 2n', '00l: l = 2n'], same: ['hkl: h+k = 2n', '0k0: k = 2n'] },
  { hm: 'P 21 21 21', ita: ['h00: h = 2n', '0k0: k = 2n', '00l: l = 2n'], same: ['h00: h = 2n', '0k0: k = 2n', '00l: l = 2n'] },
  { hm: 'P b c a', ita: ['0kl: k = 2n', 'h0l: l = 2n', 'hk0: h = 2n', 'h00: h = 2n', '0k0: k = 2n', '00l: l = 2n'], same: ['0kl: k = 2n', 'h0l: l = 2n', 'hk0: h = 2n', 'h00: h = 2n', '0k0: k = 2n', '00l: l = 2n'] },
  { hm: 'P n a 21', ita: ['0kl: k+l = 2n', 'h0l: h = 2n', 'h00: h = 2n', '0k0: k = 2n', '00l: l = 2n'], same: ['0kl: k+l = 2n', 'h0l: h = 2n', '00l: l = 2n'] },
  { hm: 'C m c a', ita: ['hkl: h+k = 2n', '0kl: k = 2n', 'h0l: h, l = 2n', 'hk0: h, k = 2n', 'h00: h = 2n', '0k0: k = 2n', '00l: l = 2n'], same: ['hkl: h+k = 2n', '0kl: k = 2n', 'hk0: h, k = 2n'] },
  { hm: 'F d d 2', ita: ['hkl: h+k, h+l, k+l = 2n', '0kl: k+l = 4n', '0kl: k, l = 2n', 'h0l: h+l = 4n', 'h0l: h, l = 2n', 'hk0: h, k = 2n', 'h00: h = 4n', '0k0: k = 4n', '00l: l = 2n'], same: ['hkl: h+k, h+l, k+l = 2n', '0kl: k+l = 4n', 'h0l: h+l = 4n'] },
  { hm: 'P 4/n b m:1', ita: ['hk0: h+k = 2n', '0kl: k = 2n', 'h00: h = 2n'], same: ['hk0: h+k = 2n', '0kl: k = 2n'] },
  { hm: 'I 41 2 2', ita: ['hkl: h+k+l = 2n', 'hk0: h+k = 2n', '0kl: k+l = 2n', 'hhl: l = 2n', '00l: l = 4n', 'h00: h = 2n'], same: ['hkl: h+k+l = 2n', '00l: l = 4n'] },
  { hm: 'P 42/n b c:2', ita: ['hk0: h+k = 2n', '0kl: k = 2n', 'hhl: l = 2n', '00l: l = 2n', 'h00: h = 2n'], same: ['hk0: h+k = 2n', '0kl: k = 2n', 'hhl: l = 2n', '00l: l = 2n'] },
  { hm: 'I 41/a m d:2', ita: ['hkl: h+k+l = 2n', 'hk0: h, k = 2n', '0kl: k+l = 2n', 'hhl: 2h+l = 4n', '00l: l = 4n', 'h00: h = 2n', 'h-h0: h = 2n'], same: ['hkl: h+k+l = 2n', 'hk0: h, k = 2n', '0kl: k+l = 2n', 'hhl: 2h+l = 4n', '00l: l = 4n', 'h00: h = 2n'] },
  { hm: 'P 31 2 1', ita: ['00l: l = 3n'], same: ['00l: l = 3n'] },
  { hm: 'P -3 1 c', ita: ['hhl: l = 2n', '00l: l = 2n'], same: ['hhl: l = 2n'] },
  { hm: 'P -3 c 1', ita: ['h-hl: l = 2n', '00l: l = 2n'], same: ['h-hl: l = 2n'] },
  { hm: 'R -3 c:H', ita: ['hkl: -h+k+l = 3n', 'h-hl: h+l = 3n', 'h-hl: l = 2n', 'hhl: l = 3n', '00l: l = 6n'], same: ['hkl: -h+k+l = 3n'] },
  { hm: 'P 61 2 2', ita: ['00l: l = 6n'], same: ['00l: l = 6n'] },
  { hm: 'P 63/m m c', ita: ['hhl: l = 2n', '00l: l = 2n'], same: ['hhl: l = 2n', '00l: l = 2n'] },
  { hm: 'P 43 3 2', ita: ['h00: h = 4n'], same: ['h00: h = 4n'] },
  { hm: 'F d -3 m:2', ita: ['hkl: h+k, h+l, k+l = 2n', '0kl: k+l = 4n', '0kl: k, l = 2n', 'hhl: h+l = 2n', 'h00: h = 4n'], same: ['hkl: h+k, h+l, k+l = 2n', 'hhl: h+l = 2n', 'h00: h = 4n'] },
  { hm: 'I a -3 d', ita: ['hkl: h+k+l = 2n', '0kl: k, l = 2n', 'hhl: 2h+l = 4n', 'h00: h = 4n'], same: ['hkl: h+k+l = 2n', 'hhl: 2h+l = 4n', 'h00: h = 4n'] },
];

function parseAll(lines: string[]): Condition[] {
  return lines.flatMap((t) => {
    const r = parseConditionText(t);
    if (!r.ok) throw r.error;
    return r.value;
  });
}

describe('derived reflection conditions against International Tables Vol. A', () => {
  it(`covers at least 15 groups (${CASES.length})`, () => expect(CASES.length).toBeGreaterThanOrEqual(15));

  it('forbid exactly the reflections the ITA conditions forbid (closed under the Laue group)', () => {
    const bad: string[] = [];
    for (const c of CASES) {
      const s = getSetting(c.hm);
      const ita = parseAll(c.ita);
      const rots = s.laueRotations;
      let wrong = '';
      for (let h = -8; h <= 8 && !wrong; h++)
        for (let k = -8; k <= 8 && !wrong; k++)
          for (let l = -8; l <= 8 && !wrong; l++) {
            const viaIta = rots.some((r) => {
              const h2 = h * r[0] + k * r[3] + l * r[6], k2 = h * r[1] + k * r[4] + l * r[7], l2 = h * r[2] + k * r[5] + l * r[8];
              return ita.some((x) => breaksCondition(x, h2, k2, l2));
            });
            const ours = s.conditions.some((x) => breaksCondition(x, h, k, l));
            if (viaIta !== ours) wrong = `${h},${k},${l}: ITA ${viaIta}, ours ${ours}`;
            // and our list agrees with the operations themselves
            if (ours !== isSystematicallyAbsent(s, h, k, l)) wrong = `${h},${k},${l}: list and operations disagree`;
          }
      if (wrong) bad.push(`${c.hm}: ${wrong}`);
    }
    expect(bad).toEqual([]);
  });

  it('are written as International Tables write them', () => {
    const bad: string[] = [];
    for (const c of CASES) {
      const s = getSetting(c.hm);
      const texts = new Set([...s.conditions.map((x) => x.text), ...combinedConditionText(s.conditions)]);
      for (const line of c.same) if (!texts.has(line)) bad.push(`${c.hm}: '${line}' not among ${[...texts].join('; ')}`);
    }
    expect(bad).toEqual([]);
  });
});

describe('condition objects (conventions.md section 2 examples)', () => {
  it('C-centring, c glide perpendicular to b, 4_1 along c', () => {
    // The three examples of /work/shared/conventions.md, section 2, verbatim.
    expect(getSetting('C 1 2/m 1').conditions).toContainEqual({ text: 'hkl: h+k = 2n', zone: [], coeffs: [1, 1, 0], modulus: 2 });
    expect(getSetting('P 1 c 1').conditions).toContainEqual({ text: 'h0l: l = 2n', zone: [[0, 1, 0]], coeffs: [0, 0, 1], modulus: 2 });
    expect(getSetting('P 41').conditions).toContainEqual({ text: '00l: l = 4n', zone: [[1, 0, 0], [0, 1, 0]], coeffs: [0, 0, 1], modulus: 4 });
  });

  it('are canonical: a parsed ITA line equals the derived object', () => {
    const derived = getSetting('I 41/a m d:2').conditions.find((c) => c.text === 'hhl: 2h+l = 4n');
    const parsed = parseConditionText('hhl: 2h+l = 4n');
    expect(parsed.ok && parsed.value).toEqual([derived]);
    // kernel-equivalent forms land on the same object (3(2h+l) = 4n is the same set)
    const p2 = parseConditionText('hhl: 6h+3l = 4n');
    expect(p2.ok && p2.value).toEqual([derived]);
  });

  it('combine one zone in ITA style without losing exactness', () => {
    const f = getSetting('F m -3 m').conditions;
    expect(f.filter((c) => c.zone.length === 0).length).toBe(3);
    const combined = combinedConditionText(f);
    expect(combined[0]).toBe('hkl: h+k, h+l, k+l = 2n');
    // glides formed by mirrors and centring give the zonal lines ITA also prints: 0kl: k, l = 2n
    expect(combined).toContain('0kl: k, l = 2n');
  });

  it('report malformed text with a column', () => {
    for (const bad of ['h0l l = 2n', 'hxl: l = 2n', 'h0l: l = 2', 'h0l: k = 2n', 'h0l: l = 1n']) {
      const r = parseConditionText(bad);
      expect(r.ok, bad).toBe(false);
      if (!r.ok) expect(r.error.location.column).toBeGreaterThanOrEqual(1);
    }
  });
});
