import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { gzipSync } from 'node:zlib';
import { SEEDS, SEED_MODEL } from './seeds';
import { applyMutations, mutatedFileArb, mutationArb } from './mutate';
import { FuzzRunner, showBytes } from './worker-runner';
import { FUZZ_RUNS, FUZZ_SEED, enc } from './fuzz-config';
import type { FuzzRequest } from './fuzz-worker';

/**
 * Property-based tests of every reader: CIF 1.1, mmCIF, delimited text (readReflections),
 * the generic CIF parser and the model reader (parseCifDocument, parseModelCif), and the
 * gzip path (through `lacuna inspect`). Whatever the input, the answer is a table whose
 * counts add up (accepted + rejected = rows; for text counted independently from the lines)
 * or an InputError naming the file; never an exception, never a hang (each input runs in a
 * worker thread with a time limit). Fixed seed: the same inputs in every CI run.
 */

let runner: FuzzRunner;
beforeAll(async () => { runner = await FuzzRunner.start(); }, 180_000);
afterAll(async () => { await runner?.stop(); });

async function expectFine(req: FuzzRequest, shown: Uint8Array, timeoutMs?: number): Promise<void> {
  const a = await runner.run(req, timeoutMs);
  if (a.problems.length) throw new Error(`${a.problems.join('\n')}\n(${a.outcome})\ninput: ${showBytes(shown)}`);
}

const READER_SEEDS = Object.keys(SEEDS);

describe('reflection readers', () => {
  it('the seeds themselves read cleanly (so mutations start from good files)', async () => {
    for (const [name, text] of Object.entries(SEEDS)) {
      const a = await runner.run({ kind: 'read', bytes: enc(text) });
      expect(a.problems, name).toEqual([]);
      expect(a.outcome, name).toMatch(/^read (24|32) rows, 0 rejected$/);
    }
  });

  it('truncation at every byte of every seed file', async () => {
    for (const [name, text] of Object.entries(SEEDS)) {
      const a = await runner.run({ kind: 'prefixes', bytes: enc(text) }, 60_000);
      expect(a.problems, name).toEqual([]);
    }
  });

  it('mutated files (lines deleted, duplicated, swapped; tokens swapped or replaced; random bytes; CRLF; BOM; cuts)', async () => {
    await fc.assert(
      fc.asyncProperty(mutatedFileArb(READER_SEEDS), async ({ seed, muts }) => {
        const bytes = applyMutations(SEEDS[seed], muts);
        await expectFine({ kind: 'read', bytes }, bytes);
      }),
      { seed: FUZZ_SEED, numRuns: FUZZ_RUNS, endOnFailure: true },
    );
  });

  it('random bytes, alone and after a valid CIF or text header', async () => {
    const heads = ['', SEEDS['core.cif'].slice(0, SEEDS['core.cif'].indexOf('1 ')), 'h k l I sigI\n', 'data_x\nloop_\n'];
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...heads), fc.uint8Array({ maxLength: 3000 }), async (head, tail) => {
        const bytes = new Uint8Array([...enc(head), ...tail]);
        await expectFine({ kind: 'read', bytes }, bytes);
      }),
      { seed: FUZZ_SEED + 1, numRuns: FUZZ_RUNS, endOnFailure: true },
    );
  });

  it('text with --columns naming the columns in any order, with skipped ones', async () => {
    const names = ['h', 'k', 'l', 'i', 'sigi', 'f', 'sigf', 'skip', 'batch', 'h'];
    const bare = SEEDS['table.txt'].split('\n').slice(2).join('\n');
    await fc.assert(
      fc.asyncProperty(fc.array(fc.constantFrom(...names), { minLength: 0, maxLength: 7 }), fc.array(fc.nat(), { maxLength: 3 }), async (columns, cuts) => {
        const bytes = applyMutations(bare, cuts.map((i) => ({ t: 'delLine' as const, i })));
        await expectFine({ kind: 'read', bytes, columns }, bytes);
      }),
      { seed: FUZZ_SEED + 2, numRuns: Math.ceil(FUZZ_RUNS / 3), endOnFailure: true },
    );
  });
});

describe('generic CIF parser and trial-model reader', () => {
  it('truncation at every 7th byte of the model and mutated models', async () => {
    const model = enc(SEED_MODEL);
    for (let cut = 0; cut <= model.length; cut += 7) await expectFine({ kind: 'cif', bytes: model.subarray(0, cut) }, model.subarray(0, cut));
    await fc.assert(
      fc.asyncProperty(fc.array(mutationArb, { minLength: 1, maxLength: 6 }), async (muts) => {
        const bytes = applyMutations(SEED_MODEL, muts);
        await expectFine({ kind: 'cif', bytes }, bytes);
      }),
      { seed: FUZZ_SEED + 3, numRuns: FUZZ_RUNS, endOnFailure: true },
    );
  });
});

describe('gzip input (decompressed at the command-line edge)', () => {
  it('mutated files compressed, and compressed files damaged, give a result or exit 2', async () => {
    await fc.assert(
      fc.asyncProperty(mutatedFileArb(READER_SEEDS, 3), fc.nat(), fc.boolean(), async ({ seed, muts }, at, damage) => {
        let gz: Uint8Array = gzipSync(applyMutations(SEEDS[seed], muts));
        if (damage) gz = at % 2 ? gz.subarray(0, at % gz.length) : Uint8Array.from(gz, (b, j) => (j === 10 + (at % (gz.length - 10)) ? b ^ 0x5a : b));
        await expectFine({ kind: 'cli', argv: ['inspect', 'data.cif.gz', '--json'], files: { 'data.cif.gz': gz } }, gz);
      }),
      { seed: FUZZ_SEED + 4, numRuns: Math.ceil(FUZZ_RUNS / 3), endOnFailure: true },
    );
  });
});
