import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ADVERSARIAL_NAMES } from './adversarial-inputs';
import { FuzzRunner } from './worker-runner';

/**
 * About 10 MB adversarial inputs (one enormous line, a 10-million-digit number,
 * endless quotes, a loop of millions of empty values, a million data blocks or
 * loop tags, a zero-filled tail): each is read or refused with a proper result,
 * through the reader and through `lacuna inspect`. No timing here: the time limit
 * below only turns a hang into a failure; the 2 s target is checked in
 * tests/bench/hardening.bench.ts.
 */

let runner: FuzzRunner;
beforeAll(async () => { runner = await FuzzRunner.start(); }, 180_000);
afterAll(async () => { await runner?.stop(); });

/** What each input must give: a table with this many rows, or a refusal matching the pattern. */
const EXPECTED: Record<(typeof ADVERSARIAL_NAMES)[number], RegExp> = {
  'one-line-digits': /^refused: fuzz-input:1:1: no column named h, k, l, I \(or F\) \(columns: 1{60}\.\.\.\(10000001 characters\)/,
  'one-line-header': /^refused: fuzz-input:1:1: more than 256 columns/,
  'one-line-cif-rows': /^read 666651 rows, 0 rejected$/,
  'huge-number': /^read 0 rows, 1 rejected$/,
  'repeated-quotes': /^refused: fuzz-input: no reflection loop found \(data blocks: adv\)/, // the quotes close at the end: one long value
  'quote-pairs': /^refused: fuzz-input:2:28: unterminated quoted string/,
  'quoted-loop': /^read 399991 rows, 0 rejected$/,
  'empty-values-cif': /^read 0 rows, 999977 rejected$/,
  'dots-cif': /^read 0 rows, 999977 rejected$/,
  'empty-values-csv': /^read 0 rows, 1999997 rejected$/,
  'unclosed-text-field': /^refused: fuzz-input:3:1: unterminated text field/,
  'many-blocks': /^refused: fuzz-input: no reflection loop found \(data blocks: b, b, b, b, b, b, b, b, b, b, \.\.\. \(1428571 blocks\)\)/,
  'many-loop-tags': /^refused: fuzz-input:7:1: tag '_refln_x' appears twice in the reflection loop \(lines 6 and 7\)/,
  'comment-line': /^read 2 rows, 0 rejected$/,
  'many-columns-text': /^refused: fuzz-input:1:1: more than 256 columns/,
  'nul-tail': /^refused: fuzz-input:200014:1: the reflection loop holds the control byte 0x00/,
};

describe('10 MB adversarial inputs are read or refused (never a hang)', () => {
  for (const name of ADVERSARIAL_NAMES) {
    it(name, async () => {
      const a = await runner.run({ kind: 'adversarial', name }, 60_000);
      expect(a.problems).toEqual([]);
      expect(a.outcome).toMatch(EXPECTED[name]);
      const c = await runner.run({ kind: 'adversarial', name, command: 'inspect' }, 60_000);
      expect(c.problems).toEqual([]);
      expect(c.outcome).toMatch(/^exit [02]: /);
    });
  }
});
