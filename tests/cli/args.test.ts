import { describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli';
import { captureCli } from '../helpers/capture-cli';

const capture = () => captureCli();

describe('lacuna command line', () => {
  it('rejects an unknown command with exit 2 and an error: line', async () => {
    const c = capture();
    const code = await runCli(['frobnicate'], c.ctx);
    expect(code).toBe(2);
    expect(c.err).toMatch(/^error: unknown command 'frobnicate'/);
  });
  it('rejects an unknown option with exit 2', async () => {
    const c = capture();
    const code = await runCli(['inspect', '--no-such-option'], c.ctx);
    expect(code).toBe(2);
    expect(c.err).toMatch(/^error: unknown option '--no-such-option'/);
  });
  it('prints the command list for --help', async () => {
    const c = capture();
    expect(await runCli(['--help'], c.ctx)).toBe(0);
    for (const name of ['inspect', 'groups', 'rank', 'sf', 'compare', 'simulate', 'layer', 'lattice', 'reindex']) expect(c.out).toContain(name);
  });
});
