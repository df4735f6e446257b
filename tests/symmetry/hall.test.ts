import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { adjugate3, allSettings, changeBasisOp, closeGroup, DEN, formatTriplet, makeOp, opKey, parseHall } from '../../src/symmetry';

describe('Hall symbols', () => {
  it('P 2ac 2ab is P 21 21 21 (Hall 1981, worked by hand from the symbol)', () => {
    const g = parseHall('P 2ac 2ab');
    expect(g.ok).toBe(true);
    if (!g.ok) return;
    const ops = closeGroup(g.value.generators)!.map(formatTriplet).sort();
    // 2ac: two-fold along c with translation (1/2,0,1/2); 2ab: along a with (1/2,1/2,0); their product
    expect(ops).toEqual(['-x+1/2,-y,z+1/2', '-x,y+1/2,-z+1/2', 'x+1/2,-y+1/2,-z', 'x,y,z'].sort());
  });

  it('a change of origin in twelfths moves the operations (P 61 2 (0 0 5))', () => {
    const plain = parseHall('P 61 2');
    const shifted = parseHall('P 61 2 (0 0 5)');
    expect(plain.ok && shifted.ok).toBe(true);
    if (!plain.ok || !shifted.ok) return;
    // the 2 after a 6 runs along a-b by default: (-y,-x,-z); V S V^-1 with V = (0,0,5/12)
    // adds (I - R) V = (0,0,10/12) = 5/6 to its translation
    const two = shifted.value.generators[1];
    expect(formatTriplet(two)).toBe('-y,-x,-z+5/6');
    expect(formatTriplet(plain.value.generators[1])).toBe('-y,-x,-z');
    // the same written as an operator
    const asOp = parseHall('P 61 2 (x,y,z+5/12)');
    expect(asOp.ok && formatTriplet(asOp.value.generators[1])).toBe('-y,-x,-z+5/6');
  });

  it('rejects malformed symbols with the column of the problem', () => {
    const cases: [string, RegExp][] = [
      ['', /empty/],
      ['Q 2', /unknown lattice symbol 'Q'/],
      ['P', /no matrix symbol/],
      ['P 5', /rotation order/],
      ['P 2q', /unknown symbol 'q'/],
      ['P 2xy', /two axis symbols/],
      ['P 3 2 (0 0 1', /unclosed/],
      ['P 2 (0 0)', /three integers/],
      ['P 3\' ', /needs a two-fold/],
      ['P 2 2 2 2 2', /more than four/],
      ['P 2 3', /needs an axis symbol/],
      ['P 23', /not smaller than the rotation order/],
    ];
    for (const [text, re] of cases) {
      const r = parseHall(text);
      expect(r.ok, text).toBe(false);
      if (!r.ok) expect(r.error.message, text).toMatch(re);
    }
    const r = parseHall('-P 2ybc 2q');
    expect(!r.ok && r.error.location.column).toBe(9); // '2q' starts at column 9
  });
});

describe('change of basis there and back (property-based)', () => {
  // unimodular P from products of elementary shears and axis permutations
  const elementary = [
    [1, 1, 0, 0, 1, 0, 0, 0, 1], [1, 0, 0, 1, 1, 0, 0, 0, 1], [1, 0, 1, 0, 1, 0, 0, 0, 1],
    [1, 0, 0, 0, 1, -1, 0, 0, 1], [0, 1, 0, 0, 0, 1, 1, 0, 0], [-1, 0, 0, 0, 1, 0, 0, 0, -1],
  ];
  const mul = (a: number[], b: number[]) => {
    const c = new Array<number>(9).fill(0);
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) c[i * 3 + j] += a[i * 3 + k] * b[k * 3 + j];
    return c;
  };
  it('(P, p) followed by (P^-1, -P^-1 p) gives the operation back', () => {
    const settings = allSettings();
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: settings.length - 1 }), fc.nat(),
        fc.array(fc.integer({ min: 0, max: elementary.length - 1 }), { maxLength: 4 }),
        fc.tuple(fc.integer({ min: 0, max: DEN - 1 }), fc.integer({ min: 0, max: DEN - 1 }), fc.integer({ min: 0, max: DEN - 1 })),
        (si, oi, path, p) => {
          const s = settings[si];
          const o = s.ops[oi % s.order];
          const P = path.reduce((m, e) => mul(m, elementary[e]), [1, 0, 0, 0, 1, 0, 0, 0, 1]);
          const det = P[0] * (P[4] * P[8] - P[5] * P[7]) - P[1] * (P[3] * P[8] - P[5] * P[6]) + P[2] * (P[3] * P[7] - P[4] * P[6]);
          const Q = adjugate3(P).map((v) => v * det); // P^-1 for det = +-1
          const q = [0, 1, 2].map((i) => -(Q[i * 3] * p[0] + Q[i * 3 + 1] * p[1] + Q[i * 3 + 2] * p[2]));
          const there = changeBasisOp(o, P, p);
          if (!there.ok) return false;
          const back = changeBasisOp(there.value, Q, q);
          return back.ok && opKey(back.value) === opKey(makeOp(o.r, o.t));
        },
      ),
      { numRuns: 2000 },
    );
  });
});
