import fc from 'fast-check';

/**
 * Mutations of a valid seed file, the kinds of damage lab files suffer: lines
 * deleted or duplicated, tokens swapped or replaced by awkward values (huge
 * numbers, NaN, Inf, empty, CIF reserved words, stray quotes), random bytes,
 * CRLF line ends, a byte-order mark, truncation. Applied in order; positions are
 * taken modulo the current size so every mutation applies.
 */
export type Mutation =
  | { t: 'delLine'; i: number }
  | { t: 'dupLine'; i: number }
  | { t: 'swapLines'; i: number; j: number }
  | { t: 'swapTok'; i: number; j: number }
  | { t: 'setTok'; i: number; v: string }
  | { t: 'insBytes'; at: number; b: number[] }
  | { t: 'setByte'; at: number; v: number }
  | { t: 'cut'; at: number }
  | { t: 'crlf' }
  | { t: 'bom' };

/** Awkward replacement values for a token. */
export const SPECIAL_TOKENS = [
  '', '?', '.', 'NaN', 'nan', '-NaN', 'Inf', '-inf', 'Infinity', '1e400', '-1e400', '1e-400', '99999999999999999999',
  '32767', '32768', '-32768', '2147483648', '1e5', '0', '-0', '+0', '0.0', '1.5', '-1.5', '1,5', '1.2.3', '0x10', '12(3', '12(3)',
  '1e', 'e5', '+', '-', '--1', '1..2', "'", '"', "'x'", '"a b"', ';', 'data_', 'data_x', 'loop_', 'save_', 'global_', 'stop_',
  '_refln_index_h', '_refln_F_squared_meas', '_cell_length_a', '#', 'x', '\u00e9', '\u0000', '\t', '1'.repeat(400),
];

const nat = fc.nat({ max: 1_000_000 });

export const mutationArb: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ t: fc.constant('delLine' as const), i: nat }),
  fc.record({ t: fc.constant('dupLine' as const), i: nat }),
  fc.record({ t: fc.constant('swapLines' as const), i: nat, j: nat }),
  fc.record({ t: fc.constant('swapTok' as const), i: nat, j: nat }),
  fc.record({ t: fc.constant('setTok' as const), i: nat, v: fc.oneof(fc.constantFrom(...SPECIAL_TOKENS), fc.string({ maxLength: 8 })) }),
  fc.record({ t: fc.constant('insBytes' as const), at: nat, b: fc.array(fc.integer({ min: 0, max: 255 }), { minLength: 1, maxLength: 12 }) }),
  fc.record({ t: fc.constant('setByte' as const), at: nat, v: fc.integer({ min: 0, max: 255 }) }),
  fc.record({ t: fc.constant('cut' as const), at: nat }),
  fc.constant({ t: 'crlf' as const }),
  fc.constant({ t: 'bom' as const }),
);

const enc = new TextEncoder();
const dec = new TextDecoder('latin1');

/** Apply the mutations to the seed text; returns bytes (random bytes need not be UTF-8). */
export function applyMutations(seed: string, muts: readonly Mutation[]): Uint8Array {
  let bytes: Uint8Array = enc.encode(seed);
  for (const m of muts) {
    if (m.t === 'insBytes' || m.t === 'setByte' || m.t === 'cut' || m.t === 'bom') {
      const at = bytes.length ? ('at' in m ? m.at % (bytes.length + 1) : 0) : 0;
      if (m.t === 'insBytes') bytes = concat(bytes.subarray(0, at), Uint8Array.from(m.b), bytes.subarray(at));
      else if (m.t === 'setByte') { if (at < bytes.length) { bytes = bytes.slice(); bytes[at] = m.v; } }
      else if (m.t === 'cut') bytes = bytes.slice(0, at);
      else bytes = concat(Uint8Array.of(0xef, 0xbb, 0xbf), bytes);
      continue;
    }
    // line and token edits work on a latin1 view, so arbitrary bytes survive the round trip
    const text = dec.decode(bytes);
    let out: string;
    if (m.t === 'crlf') out = text.replace(/\r?\n/g, '\r\n');
    else if (m.t === 'delLine' || m.t === 'dupLine' || m.t === 'swapLines') {
      const lines = text.split('\n');
      const i = m.i % lines.length;
      if (m.t === 'delLine') lines.splice(i, 1);
      else if (m.t === 'dupLine') lines.splice(i, 0, lines[i]);
      else { const j = m.j % lines.length; [lines[i], lines[j]] = [lines[j], lines[i]]; }
      out = lines.join('\n');
    } else {
      // tokens: maximal runs of non-blank characters, with their offsets
      const toks: [number, number][] = [];
      for (const x of text.matchAll(/[^ \t\r\n]+/g)) toks.push([x.index!, x.index! + x[0].length]);
      if (toks.length === 0) continue;
      const a = toks[m.i % toks.length];
      if (m.t === 'setTok') out = text.slice(0, a[0]) + m.v + text.slice(a[1]);
      else {
        const b = toks[m.j % toks.length];
        const [p, q] = a[0] <= b[0] ? [a, b] : [b, a];
        if (p === q) continue;
        out = text.slice(0, p[0]) + text.slice(q[0], q[1]) + text.slice(p[1], q[0]) + text.slice(p[0], p[1]) + text.slice(q[1]);
      }
    }
    bytes = latin1Bytes(out);
  }
  return bytes;
}

function latin1Bytes(s: string): Uint8Array {
  const b = new Uint8Array(s.length);
  for (let j = 0; j < s.length; j++) {
    const c = s.charCodeAt(j);
    b[j] = c > 255 ? 63 : c;
  }
  return b;
}

function concat(...parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let o = 0;
  for (const p of parts) { out.set(p, o); o += p.length; }
  return out;
}

/** A seed name and a list of mutations of it. */
export function mutatedFileArb(seedNames: readonly string[], maxMutations = 6) {
  return fc.record({
    seed: fc.constantFrom(...seedNames),
    muts: fc.array(mutationArb, { minLength: 1, maxLength: maxMutations }),
  });
}
