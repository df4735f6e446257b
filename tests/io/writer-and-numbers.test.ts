import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatFloat32, parseByteNumber, readReflections, writeReflectionCif, parseCifDocument } from '../../src/io';
import { tableFromArrays, type ReflectionTable } from '../../src/core';

const enc = new TextEncoder();

function reread(t: ReflectionTable): ReflectionTable {
  const r = readReflections(enc.encode(writeReflectionCif(t)), { source: 'roundtrip' });
  if (!r.ok) throw new Error(r.error.describe());
  return r.value;
}

describe('formatFloat32', () => {
  it('prints the shortest decimal that reads back as the same Float32 (property, 2000 random values)', () => {
    fc.assert(fc.property(fc.float({ noNaN: true, noDefaultInfinity: true }), (x) => {
      const s = formatFloat32(x);
      expect(Math.fround(Number(s))).toBe(Math.fround(x) === 0 ? 0 : Math.fround(x));
      // and no shorter precision would do: fewer significant digits fail (or the value is exact)
      const digits = s.replace(/^-/, '').replace(/e.*$/, '').replace('.', '').replace(/^0+/, '').replace(/0+$/, '').length;
      if (digits > 1) expect(Math.fround(Number(Math.fround(x).toPrecision(digits - 1)))).not.toBe(Math.fround(x));
    }), { numRuns: 2000 });
  });
  it('keeps typical measured values short', () => {
    expect(formatFloat32(Math.fround(1234.56))).toBe('1234.56');
    expect(formatFloat32(Math.fround(0.1))).toBe('0.1');
    expect(formatFloat32(100)).toBe('100');
    expect(formatFloat32(-3.5)).toBe('-3.5');
    expect(formatFloat32(NaN)).toBe('?');
  });
});

describe('writeReflectionCif', () => {
  it('writes CIF 1.1 that parses, with header comment, cell and wavelength', () => {
    const t = tableFromArrays({ h: [1, -2], k: [0, 3], l: [4, -5], i: [10.5, -2.25], sigma: [1, 0.5] },
      { source: 'made up', block: 'my block', cell: { a: 5.1, b: 6.2, c: 7.3, alpha: 90, beta: 97.25, gamma: 90 }, wavelength: 1.54184 });
    const text = writeReflectionCif(t);
    expect(text.startsWith('#\\#CIF_1.1\n# reflection data written by Lacuna\n')).toBe(true);
    const doc = parseCifDocument(text, 'w');
    if (!doc.ok) throw new Error(doc.error.describe());
    const b = doc.value.blocks[0];
    expect(b.name).toBe('my_block');
    expect(b.findNumber('_cell_angle_beta')!.value).toBe(97.25);
    expect(b.findNumber('_diffrn_radiation_wavelength')!.value).toBe(1.54184);
    expect(b.findColumn('_refln_F_squared_meas')!.map((v) => v.text)).toEqual(['10.5', '-2.25']);
  });

  it('reads back identically: every Float32 value, indices, cell, wavelength (random tables)', () => {
    const row = fc.record({
      h: fc.integer({ min: -300, max: 300 }), k: fc.integer({ min: -300, max: 300 }), l: fc.integer({ min: 1, max: 300 }),
      i: fc.float({ noNaN: true, noDefaultInfinity: true, min: Math.fround(-1e30), max: Math.fround(1e30) }),
      sigma: fc.float({ noNaN: true, noDefaultInfinity: true, min: Math.fround(1e-30), max: Math.fround(1e30) }),
    });
    fc.assert(fc.property(fc.array(row, { minLength: 1, maxLength: 60 }), fc.boolean(), (rs, unmerged) => {
      const t = tableFromArrays({ h: rs.map((r) => r.h), k: rs.map((r) => r.k), l: rs.map((r) => r.l), i: rs.map((r) => r.i), sigma: rs.map((r) => r.sigma) },
        { source: 'random', cell: { a: 10.123456789, b: 11, c: 12.5, alpha: 88.8, beta: 91.25, gamma: 119.99 }, wavelength: 0.71073, unmerged });
      const u = reread(t);
      expect(u.n).toBe(t.n);
      expect(Array.from(u.h)).toEqual(Array.from(t.h));
      expect(Array.from(u.k)).toEqual(Array.from(t.k));
      expect(Array.from(u.l)).toEqual(Array.from(t.l));
      expect(Array.from(u.i)).toEqual(Array.from(t.i).map((x) => (x === 0 ? 0 : x)));
      expect(Array.from(u.sigma)).toEqual(Array.from(t.sigma));
      expect(u.meta.cell).toEqual(t.meta.cell);
      expect(u.meta.wavelength).toBe(0.71073);
      expect(u.meta.unmerged).toBe(unmerged);
    }), { numRuns: 200 });
  });
});

describe('parseByteNumber agrees with Number() on CIF numbers', () => {
  const b = (s: string) => enc.encode(s);
  it('plain, signed, fractional, exponent, su, long mantissas (property)', () => {
    fc.assert(fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 1, max: 17 }), (x, p) => {
      const s = x.toPrecision(p);
      const bytes = b(s);
      expect(parseByteNumber(bytes, 0, bytes.length)).toBe(Number(s));
    }), { numRuns: 3000 });
    for (const s of ['0', '-0.5', '+2', '.5', '5.', '1e3', '1.5E-3', '-2.5e+2', '12345678901234567890', '0.1234(5)', '00012']) {
      const bytes = b(s);
      expect(parseByteNumber(bytes, 0, bytes.length)).toBe(Number(s.replace(/\(\d+\)$/, '')));
    }
  });
  it('refuses words and broken numbers', () => {
    for (const s of ['-', '.', 'e5', '1e', '1.2.3', '12a', '1(2', '1()', 'abc', '--1']) {
      const bytes = b(s);
      expect(parseByteNumber(bytes, 0, bytes.length)).toBeNaN();
    }
  });
});
