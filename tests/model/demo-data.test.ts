import { mkdtempSync, readFileSync, rmSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { REPO_ROOT } from '../helpers/paths';
import { runCli } from '../../src/cli';

// The demo files must be exactly what our own simulator makes from the invented models
// (public/demo/regenerate.mjs); this fails when the simulator changes and the demo was not regenerated.
const DEMO = resolve(REPO_ROOT, 'public/demo');
const manifest = JSON.parse(readFileSync(join(DEMO, 'demo.json'), 'utf8')) as {
  default: string; samples: { file: string; model: string; simulate_args: string[] }[];
};
const tmp = mkdtempSync(join(tmpdir(), 'lacuna-demo-'));
symlinkSync(join(DEMO, 'models'), join(tmp, 'models'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

describe('demo data (public/demo)', () => {
  it('names a default that exists among the samples', () => {
    expect(manifest.samples.map((s) => s.file)).toContain(manifest.default);
    expect(manifest.samples.length).toBeGreaterThanOrEqual(4);
  });
  for (const s of manifest.samples) {
    it(`${s.file} is reproduced byte for byte by lacuna simulate`, async () => {
      let err = '';
      const code = await runCli(s.simulate_args, { out: () => {}, err: (t) => { err += t; }, interactive: false, cwd: tmp });
      expect(err).toBe('');
      expect(code).toBe(0);
      expect(readFileSync(join(tmp, s.file), 'utf8')).toBe(readFileSync(join(DEMO, s.file), 'utf8'));
    });
  }
});
