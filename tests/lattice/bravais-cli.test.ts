import { describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli';
import { realdata, REPO_ROOT } from '../helpers/paths';
import { captureCli } from '../helpers/capture-cli';

const capture = captureCli;

describe('lacuna lattice', () => {
  it('shows oP with its deviation for the near-orthorhombic monoclinic cell of cod-1560875 (beta = 90.32)', async () => {
    const c = capture();
    expect(await runCli(['lattice', realdata('cod-1560875.cif'), '--json'], c.ctx)).toBe(0);
    expect(c.err).toBe('');
    const doc = JSON.parse(c.out);
    expect(doc.reduced_cell).toEqual({ a: 8.72, b: 8.93, c: 12.94, alpha: 90, beta: 90.32, gamma: 90 });
    const types: string[] = doc.candidates.map((x: { bravais: string }) => x.bravais);
    expect(types[types.length - 1]).toBe('aP');
    const oP = doc.candidates.find((x: { bravais: string }) => x.bravais === 'oP');
    expect(oP.deviation_deg).toBeCloseTo(0.32, 3); // beta - 90 by hand
    expect(oP.transform).toBe('a,b,c');
    const mP = doc.candidates.find((x: { bravais: string }) => x.bravais === 'mP');
    expect(mP.deviation_deg).toBe(0);
    for (const x of doc.candidates) {
      expect(Object.keys(x.cell)).toEqual(['a', 'b', 'c', 'alpha', 'beta', 'gamma']);
      expect(typeof x.transform).toBe('string');
      expect(x.deviation_deg).toBeLessThanOrEqual(3);
    }
  });

  it('takes --cell and --tolerance, and the text output names the deviation', async () => {
    const c = capture();
    expect(await runCli(['lattice', '--cell', '8.72,8.93,12.94,90,90.32,90', '--tolerance', '0.1'], c.ctx)).toBe(0);
    expect(c.out).toMatch(/within 0\.1 degrees/);
    expect(c.out).not.toMatch(/\n {2}oP /);
    expect(c.out).toMatch(/\n {2}mP +0\.000 deg/);
    expect(c.out).toMatch(/confirmed from the intensities/);
  });

  it('applies the profile tolerance and monoclinic rule, and says which profile is in force', async () => {
    const c = capture(REPO_ROOT);
    const code = await runCli(['lattice', '--cell', '5,6,7,90,95,90', '--profile', 'public/profiles/fernbrook-small-molecule.json', '--json'], c.ctx);
    expect(code).toBe(0);
    expect(c.err).toBe(''); // --json: stderr stays quiet too
    const doc = JSON.parse(c.out);
    expect(doc.tolerance_deg).toBe(1.5);
    expect(doc.monoclinic_setting).toBe('beta-closest-to-90');
    const c2 = capture(REPO_ROOT);
    expect(await runCli(['lattice', '--cell', '5,6,7,90,95,90', '--profile', 'public/profiles/fernbrook-small-molecule.json'], c2.ctx)).toBe(0);
    expect(c2.err).toBe('profile in force: Fernbrook small-molecule group (public/profiles/fernbrook-small-molecule.json)\n');
  });

  it('rejects missing input, bad cells and bad tolerances with exit 2', async () => {
    const cases: [string[], RegExp][] = [
      [['lattice'], /needs a reflection file or --cell/],
      [['lattice', '--cell', '5,5,5,90,90'], /six numbers/],
      [['lattice', '--cell', '5,5,5,100,100,170'], /volume/],
      [['lattice', '--cell', '5,5,5,90,90,90', '--tolerance', '-1'], /between 0 and 10/],
      [['lattice', '--cell', '5,5,5,90,90,90', '--tolerance', 'x'], /needs a number/],
      [['lattice', 'no-such-file.cif'], /no-such-file\.cif: cannot read the file/],
    ];
    for (const [argv, re] of cases) {
      const c = capture();
      expect(await runCli(argv, c.ctx), argv.join(' ')).toBe(2);
      expect(c.err, argv.join(' ')).toMatch(/^error: /);
      expect(c.err, argv.join(' ')).toMatch(re);
    }
  });
});
