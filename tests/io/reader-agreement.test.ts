import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseCifDocument, readReflections } from '../../src/io';

// The byte-level reflection reader and the generic CIF 1.1 parser are separate
// implementations of the same syntax: on random reflection loops laid out in
// every legal way (values split across lines, comments, quotes, text fields,
// missing values, extra columns), both must see the same rows.

const enc = new TextEncoder();
const TAGS = ['_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_intensity_meas', '_refln_intensity_sigma'];

const value = fc.oneof(
  { weight: 8, arbitrary: fc.integer({ min: -60, max: 60 }).map(String) },
  { weight: 6, arbitrary: fc.double({ min: -1e4, max: 1e5, noNaN: true }).map((x) => x.toPrecision(6)) },
  { weight: 1, arbitrary: fc.constantFrom('?', '.', 'x1', '1.5', '0', '1e-3', '2.5(3)', 'nan') },
);
const layout = fc.constantFrom(' ', '  ', '\t', '\n', ' # note\n', '\r\n');
const wrap = fc.constantFrom('plain', 'plain', 'plain', 'plain', 'single', 'double', 'text');

function render(v: string, how: string): string {
  if (how === 'single') return `'${v}'`;
  if (how === 'double') return `"${v}"`;
  if (how === 'text') return `\n;${v}\n;\n`;
  return v;
}

describe('byte-level reader agrees with the generic CIF parser', () => {
  it('same accepted rows on random loops (property)', () => {
    const cell = fc.record({ v: value, how: wrap, sep: layout });
    fc.assert(fc.property(fc.array(fc.array(cell, { minLength: 6, maxLength: 6 }), { minLength: 0, maxLength: 25 }), (rows) => {
      const body = rows.map((r) => r.map((c) => render(c.v, c.how) + c.sep).join('')).join('\n');
      const text = ['data_p', 'loop_', ...TAGS, '_refln_extra', body, ''].join('\n');
      const doc = parseCifDocument(text, 'p');
      if (!doc.ok) throw new Error(doc.error.describe() + '\n' + text);
      const block = doc.value.blocks[0];
      const cols = TAGS.map((t) => block.findColumn(t)!);
      const want: number[][] = [];
      for (let j = 0; j < rows.length; j++) {
        const vals = cols.map((c) => c[j]);
        // the reader's rules, stated independently: numbers only from unquoted or quoted text,
        // ? and . (unquoted) missing, su ignored, integer indices within Int16, sigma > 0, not 0 0 0
        const nums = vals.map((v) => (v.kind === 'unknown' || v.kind === 'inapplicable' ? NaN : Number(v.text.replace(/\(\d+\)$/, ''))));
        if (nums.some((x) => !Number.isFinite(x))) continue;
        if (!nums.slice(0, 3).every(Number.isInteger)) continue;
        if (nums.slice(0, 3).some((x) => Math.abs(x) > 32767)) continue;
        if (nums[0] === 0 && nums[1] === 0 && nums[2] === 0) continue;
        if (!(Math.fround(nums[4]) > 0)) continue;
        want.push([nums[0], nums[1], nums[2], Math.fround(nums[3]), Math.fround(nums[4])]);
      }
      const r = readReflections(enc.encode(text), { source: 'p' });
      if (!r.ok) throw new Error(r.error.describe());
      const t = r.value;
      const got = Array.from({ length: t.n }, (_, j) => [t.h[j], t.k[j], t.l[j], t.i[j], t.sigma[j]]);
      expect(got).toEqual(want);
      expect(t.meta.rowsInFile).toBe(rows.length);
    }), { numRuns: 400 });
  });
});
