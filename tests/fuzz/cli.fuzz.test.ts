import { afterAll, beforeAll, describe, it } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { REPO_ROOT } from '../helpers/paths';
import { SEEDS, SEED_MODEL } from './seeds';
import { applyMutations, mutatedFileArb, mutationArb } from './mutate';
import { FuzzRunner, showBytes } from './worker-runner';
import { FUZZ_RUNS, FUZZ_SEED, enc } from './fuzz-config';

/**
 * Property-based tests of the command-line entries, run in-process (runCli) in a
 * time-limited worker with temp files: every command on mutated files, and random
 * argument lists. Exit 0 with a proper result or exit 2 with an `error:` line that
 * names the file; never exit 1 (internal fault), never a hang; the input file is
 * never changed and no temporary file is left behind.
 */

let runner: FuzzRunner;
beforeAll(async () => { runner = await FuzzRunner.start(); }, 180_000);
afterAll(async () => { await runner?.stop(); });

const RUNS = Math.max(10, Math.ceil(FUZZ_RUNS / 5));

async function expectFine(argv: string[], files: Record<string, Uint8Array>): Promise<void> {
  const a = await runner.run({ kind: 'cli', argv, files }, 30_000);
  if (a.problems.length) throw new Error(`${a.problems.join('\n')}\n(${a.outcome})\nargv: ${argv.join(' ')}\ninput: ${showBytes(Object.values(files)[0] ?? new Uint8Array())}`);
}

/** Every data-reading command with typical options; DATA is the mutated file. */
const DATA_COMMANDS: string[][] = [
  ['inspect', 'DATA', '--json'],
  ['inspect', 'DATA'],
  ['rank', 'DATA', '--json'],
  ['rank', 'DATA', '--top', '3', '--cell', '7.5,9.0,11.3,90,101.2,90'],
  ['lattice', 'DATA', '--json'],
  ['layer', 'DATA', '--plane', 'hk0', '--out', 'layer.png', '--size', '96'],
  ['layer', 'DATA', '--plane', 'h1l', '--out', 'layer.png', '--size', '64'],
  ['reindex', 'DATA', '--transform', 'a,b,-a-c', '--out', 'new.cif', '--json'],
  ['reindex', 'DATA', '--transform', '1/2a+1/2b,-1/2a+1/2b,c', '--out', 'new.cif', '--drop-nonintegral'],
  ['compare', 'model.cif', 'DATA', '--json'],
];

describe('commands on mutated data files', () => {
  it('inspect, rank, lattice, layer, reindex and compare: exit 0 or 2, never a fault', async () => {
    await fc.assert(
      fc.asyncProperty(mutatedFileArb(Object.keys(SEEDS), 4), fc.constantFrom(...DATA_COMMANDS), async ({ seed, muts }, cmd) => {
        const name = seed.endsWith('.cif') || seed.endsWith('.mmcif') ? 'data.cif' : 'data.txt';
        const argv = cmd.map((a) => (a === 'DATA' ? name : a));
        await expectFine(argv, { [name]: applyMutations(SEEDS[seed], muts), 'model.cif': enc(SEED_MODEL) });
      }),
      { seed: FUZZ_SEED + 10, numRuns: RUNS, endOnFailure: true },
    );
  });

  it('sf, compare and simulate on mutated models', async () => {
    const data = enc(SEEDS['core.cif']);
    const cmds = [
      ['sf', 'model.cif', '--dmin', '2', '--json'],
      ['compare', 'model.cif', 'data.cif', '--json'],
      ['simulate', 'model.cif', '--dmin', '2.5', '--seed', '3', '--out', 'sim.cif'],
      ['simulate', 'model.cif', '--dmin', '3', '--seed', '4', '--out', 'sim.cif', '--unmerged'],
    ];
    await fc.assert(
      fc.asyncProperty(fc.array(mutationArb, { minLength: 0, maxLength: 4 }), fc.constantFrom(...cmds), async (muts, argv) => {
        await expectFine(argv, { 'model.cif': applyMutations(SEED_MODEL, muts), 'data.cif': data });
      }),
      { seed: FUZZ_SEED + 11, numRuns: RUNS, endOnFailure: true },
    );
  });
});

describe('full-size data sets, damaged', () => {
  it('the demo data sets (thousands of rows) with damaged values and lines through rank, lattice, layer and reindex', async () => {
    const demos = ['qm-101.cif', 'qm-102.cif', 'qm-103.cif', 'qm-104.cif'].map((f) => readFileSync(join(REPO_ROOT, 'public/demo', f), 'latin1'));
    const cmds = [
      ['rank', 'data.cif', '--json'], ['rank', 'data.cif', '--chiral'], ['lattice', 'data.cif', '--json'],
      ['layer', 'data.cif', '--plane', 'h0l', '--out', 'l.png', '--size', '200'], ['reindex', 'data.cif', '--transform', 'c,a,b', '--out', 'r.cif'],
    ];
    await fc.assert(
      fc.asyncProperty(fc.nat({ max: 3 }), fc.array(mutationArb, { minLength: 1, maxLength: 12 }), fc.constantFrom(...cmds), async (d, muts, argv) => {
        await expectFine(argv, { 'data.cif': applyMutations(demos[d], muts) });
      }),
      { seed: FUZZ_SEED + 14, numRuns: Math.max(10, Math.ceil(FUZZ_RUNS / 20)), endOnFailure: true },
    );
  });
});

describe('lab profiles (JSON) on every command that reads data', () => {
  it('mutated profiles give a result or exit 2 naming the profile', async () => {
    const profile = readFileSync(join(REPO_ROOT, 'public/profiles/fernbrook-small-molecule.json'), 'utf8');
    const data = enc(SEEDS['core.cif']);
    await fc.assert(
      fc.asyncProperty(fc.array(mutationArb, { minLength: 1, maxLength: 4 }), fc.constantFrom('inspect', 'rank', 'lattice'), async (muts, cmd) => {
        const bytes = applyMutations(profile, muts);
        const a = await runner.run({ kind: 'cli', argv: [cmd, 'data.cif', '--profile', 'lab.json', '--json'], files: { 'lab.json': bytes, 'data.cif': data } }, 30_000);
        const problems = a.problems.filter((p) => !p.startsWith('error does not name the file'));
        if (a.outcome.startsWith('exit 2') && !a.outcome.includes('lab.json')) problems.push(`a refused profile is not named: ${a.outcome}`);
        if (problems.length) throw new Error(`${problems.join('\n')}\n(${a.outcome})\nprofile: ${showBytes(bytes)}`);
      }),
      { seed: FUZZ_SEED + 13, numRuns: RUNS, endOnFailure: true },
    );
  });
});

describe('random argument lists', () => {
  const words = [
    'inspect', 'rank', 'groups', 'sf', 'compare', 'simulate', 'layer', 'lattice', 'reindex', 'help', '--help', '-h', '--version', 'bogus',
    'data.cif', 'model.cif', 'missing.cif', '.', '', '-', '--', '--json', '--json=1', '--cell', '7.5,9.0,11.3,90,101.2,90', '1,2,3,90,90,200',
    'a,b,c', '--cell=', '--top', '0', '-1', '1e400', 'NaN', '3', '--chiral', '--columns', 'h,k,l,i,sigi', '--block', 'qm_seed', 'nope',
    '--plane', 'hk0', 'hkz', '0kl', 'h2l', '--out', 'out.png', 'data.cif', 'out.cif', '--size', '1e9', '64', '--transform', 'a,b,-a-c',
    '2a,b,c', 'a,b', '0,0,0', '--drop-nonintegral', '--dmin', '0.0000001', '2', '--seed', '--unmerged', '--noise', 'mean=5', 'p=-1',
    '--name', 'P 21/c', 'P 1 21/c 1', '--number', '14', '231', '--tolerance', '--length-tolerance', '--angle-tolerance', '--profile',
    '--model-block', '--incomplete', '2', '--violations', '-5', '--group', 'P 21 21 21',
  ];
  it('exit 0 or 2 with a message, never a fault or a hang', async () => {
    const files = { 'data.cif': enc(SEEDS['core.cif']), 'model.cif': enc(SEED_MODEL) };
    await fc.assert(
      fc.asyncProperty(fc.array(fc.constantFrom(...words), { minLength: 0, maxLength: 9 }), async (argv) => {
        const a = await runner.run({ kind: 'cli', argv, files }, 30_000);
        // usage errors need not name a file; every other invariant holds
        const problems = a.problems.filter((p) => !p.startsWith('error does not name the file'));
        if (problems.length) throw new Error(`${problems.join('\n')}\n(${a.outcome})\nargv: ${JSON.stringify(argv)}`);
      }),
      { seed: FUZZ_SEED + 12, numRuns: RUNS, endOnFailure: true },
    );
  });
});
