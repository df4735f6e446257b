import { describe, expect, it } from 'vitest';
import {
  changeBasisOp,
  composeOps,
  DEN,
  formatTriplet,
  getSetting,
  identityOp,
  invertOp,
  opKey,
  opsEqual,
  parseTriplet,
  settingFromOps,
  tripletOp,
  type SymOp,
} from '../../src/symmetry';

const parsed = (t: string) => {
  const r = parseTriplet(t);
  if (!r.ok) throw new Error(r.error.describe());
  return r.value;
};

describe('parseTriplet / formatTriplet', () => {
  it('reads the usual spellings', () => {
    // expected matrices written by hand from x' = R x + t
    const a = parsed('-x+1/2,y,-z');
    expect(Array.from(a.r)).toEqual([-1, 0, 0, 0, 1, 0, 0, 0, -1]);
    expect(Array.from(a.t)).toEqual([12, 0, 0]);
    const b = parsed('x-y,x,z+1/6');
    expect(Array.from(b.r)).toEqual([1, -1, 0, 1, 0, 0, 0, 0, 1]);
    expect(Array.from(b.t)).toEqual([0, 0, 4]);
    expect(opsEqual(parsed('1/2+x, Y ,  -Z'), parsed('x+1/2,y,-z'))).toBe(true);
    expect(opsEqual(parsed('X-1/2,y+0.25,z-3/4'), parsed('x+1/2,y+1/4,z+1/4'))).toBe(true);
    expect(opsEqual(parsed('-x+y,-x,z'), parsed('y-x,-x,+z'))).toBe(true);
    // a change-of-basis matrix is no symmetry operation
    expect(parseTriplet('-y+z,x+z,-x+y+z').ok).toBe(false);
    expect(Array.from(parsed('x,y,z+5/12').t)).toEqual([0, 0, 10]);
  });

  it('prints International Tables style and reads its own output back', () => {
    for (const t of ['x,y,z', '-x+1/2,y,-z', 'x-y,x,z+1/6', '-y+2/3,x-y+1/3,z+1/3', 'z,x,y', '-x+1/4,-y+3/4,z+1/2']) {
      expect(formatTriplet(parsed(t))).toBe(t);
    }
    expect(formatTriplet(parsed('1/2+x,-1/2-y,Z'))).toBe('x+1/2,-y+1/2,z');
  });

  it('rejects bad text with a message and a column, never evaluates it', () => {
    const cases: [string, RegExp][] = [
      ['x,y', /3 components|only 2 of 3/],
      ['x,y,z,x', /after the third component/],
      ['x,y,w', /unexpected 'w'/],
      ['x,y,z+1/5', /not a multiple of 1\/24/],
      ['x,x,z', /determinant/],
      ['x,y,', /unexpected end|empty/],
      ['alert(1),y,z', /unexpected 'a'/],
      ['x,y,z+1/0', /division by zero/],
      ['x/2,y,z', /unexpected '\/'|fractional/],
    ];
    for (const [text, re] of cases) {
      const r = parseTriplet(text);
      expect(r.ok, text).toBe(false);
      if (!r.ok) {
        expect(r.error.message, text).toMatch(re);
        expect(r.error.location.column, text).toBeGreaterThanOrEqual(1);
      }
    }
  });
});

describe('compose, invert', () => {
  it('composes as x -> a(b(x)) with translations modulo 1', () => {
    const a = tripletOp('-y,x-y,z+1/3'); // 3_1 along c, by hand
    const a2 = composeOps(a, a);
    expect(formatTriplet(a2)).toBe('-x+y,-x,z+2/3');
    expect(opsEqual(composeOps(a2, a), identityOp())).toBe(true);
    expect(opsEqual(invertOp(a), a2)).toBe(true);
    const g = tripletOp('-x+1/2,y+1/2,-z+1/4');
    expect(opsEqual(composeOps(g, invertOp(g)), identityOp())).toBe(true);
    expect(opKey(composeOps(invertOp(g), g))).toBe(opKey(identityOp()));
  });
});

describe('changeBasisOp (International Tables Vol. A, Part 5 convention)', () => {
  function transformAll(ops: readonly SymOp[], P: number[], p: number[], pDen: number): SymOp[] {
    const seen = new Map<number, SymOp>();
    for (const o of ops) {
      const r = changeBasisOp(o, P, p, pDen);
      if (!r.ok) throw r.error;
      seen.set(opKey(r.value), r.value);
    }
    return [...seen.values()];
  }

  it('takes R 3:H to R 3:R and R -3 c:H to R -3 c:R (obverse rhombohedral axes)', () => {
    // ITA Vol. A Table 5.1.3.1: a_R = (2a+b+c)/3, b_R = (-a+b+c)/3, c_R = (-a-2b+c)/3 in hexagonal a,b,c;
    // the columns of P are the new axes.
    const P = [2, -1, -1, 1, 1, -2, 1, 1, 1];
    for (const [h, r] of [['R 3:H', 'R 3:R'], ['R -3 c:H', 'R -3 c:R'], ['R 3 2:H', 'R 3 2:R']]) {
      const ops = transformAll(getSetting(h).ops, P, [0, 0, 0], 3);
      expect(settingFromOps(ops)?.hm).toBe(r);
    }
  });

  it('permutes orthorhombic axes: P 21 21 2 becomes another setting of No. 18', () => {
    const P = [0, 0, 1, 1, 0, 0, 0, 1, 0]; // a' = b, b' = c, c' = a (columns of P)
    const s = settingFromOps(transformAll(getSetting('P 21 21 2').ops, P, [0, 0, 0], 1));
    expect(s?.number).toBe(18);
    // the plain two-fold axis along old c now runs along b'
    expect(s?.hm).toBe('P 21 2 21');
  });

  it('shifts the origin: x + p', () => {
    // (W, w) -> (W, w + W p - p): inversion at 0 seen from origin 1/4,1/4,1/4 sits at -1/4 -> translation 1/2
    const inv = tripletOp('-x,-y,-z');
    const r = changeBasisOp(inv, [1, 0, 0, 0, 1, 0, 0, 0, 1], [DEN / 4, DEN / 4, DEN / 4]);
    expect(r.ok && formatTriplet(r.value)).toBe('-x+1/2,-y+1/2,-z+1/2');
  });

  it('fails cleanly when the new basis does not fit the operations', () => {
    const r = changeBasisOp(tripletOp('-y,x-y,z'), [2, 0, 0, 0, 1, 0, 0, 0, 1]);
    expect(r.ok).toBe(false);
    expect(changeBasisOp(identityOp(), [1, 0, 0, 1, 0, 0, 0, 0, 1]).ok).toBe(false);
  });
});
