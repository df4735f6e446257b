import { describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli';
import { captureCli as capture } from '../helpers/capture-cli';
import { decodeBits, gemmiFixture, indexGrid } from './reference-fixture';

interface JsonCondition { text: string; zone: number[][]; coeffs: number[]; modulus: number }
interface JsonSetting {
  number: number; hm: string; hall: string; crystal_system: string; laue: string; point_group: string;
  centrosymmetric: boolean; sohncke: boolean; ops: string[]; conditions: JsonCondition[];
}

describe('lacuna groups', () => {
  it('--json lists every setting; its conditions, read with the documented meaning, give gemmi\'s absences', async () => {
    const c = capture();
    expect(await runCli(['groups', '--json'], c.ctx)).toBe(0);
    expect(c.err).toBe('');
    const doc = JSON.parse(c.out) as JsonSetting[];
    expect(doc.length).toBe(559);
    for (const key of ['number', 'hm', 'hall', 'crystal_system', 'laue', 'point_group', 'centrosymmetric', 'sohncke', 'ops', 'conditions'])
      expect(doc[0]).toHaveProperty(key);
    // Reference: gemmi 0.5.7 GroupOps.systematic_absences, fixture tests/reference/symmetry-gemmi.json.
    // Meaning (conventions.md section 2): absent when for some condition e.h = 0 for every row e of
    // zone and coeffs.h is not divisible by modulus. Evaluated here from the JSON alone.
    const fx = gemmiFixture();
    const grid = indexGrid(fx.absent_grid);
    const bad: string[] = [];
    doc.forEach((s, si) => {
      const g = fx.settings[si];
      if (s.hm !== g.hm || s.ops.length !== g.order) bad.push(`${s.hm}: symbol or order differs from gemmi`);
      const want = decodeBits(fx.absent_patterns[g.absent], grid.n);
      for (let i = 0; i < grid.n; i++) {
        const h = [grid.h[i], grid.k[i], grid.l[i]];
        const dot = (v: number[]) => v[0] * h[0] + v[1] * h[1] + v[2] * h[2];
        const absent = s.conditions.some((cd) => cd.zone.every((e) => dot(e) === 0) && dot(cd.coeffs) % cd.modulus !== 0);
        if (absent !== want[i]) { bad.push(`${s.hm}: ${h.join(',')}`); break; }
      }
    });
    expect(bad).toEqual([]);
  });

  it('--name gives one setting, --number every setting of that number', async () => {
    let c = capture();
    expect(await runCli(['groups', '--json', '--name', 'P2_1/c'], c.ctx)).toBe(0);
    const one = JSON.parse(c.out) as JsonSetting[];
    expect(one.map((s) => s.hm)).toEqual(['P 1 21/c 1']);
    // P 1 21/c 1, by hand from ITA Vol. A No. 14: four operations, h0l: l = 2n and 0k0: k = 2n
    expect(one[0].ops).toEqual(['x,y,z', '-x,-y,-z', '-x,y+1/2,-z+1/2', 'x,-y+1/2,z+1/2']);
    expect(one[0].conditions.map((x) => x.text)).toEqual(['h0l: l = 2n', '0k0: k = 2n']);
    c = capture();
    expect(await runCli(['groups', '--json', '--number', '14'], c.ctx)).toBe(0);
    expect((JSON.parse(c.out) as JsonSetting[]).every((s) => s.number === 14)).toBe(true);
    c = capture();
    expect(await runCli(['groups', '--name', 'Fd-3m:2'], c.ctx)).toBe(0);
    expect(c.out).toMatch(/F d -3 m:2/);
    expect(c.out).toMatch(/hkl: h\+k, h\+l, k\+l = 2n/);
    expect(c.out).toMatch(/operations \(192\)/);
  });

  it('prints a compact table by default', async () => {
    const c = capture();
    expect(await runCli(['groups'], c.ctx)).toBe(0);
    const lines = c.out.trimEnd().split('\n');
    expect(lines.length).toBe(560);
    expect(lines[0]).toMatch(/^No\.\s+H-M symbol\s+Hall symbol\s+system\s+Laue\s+centric\s+Sohncke\s+reflection conditions$/);
    expect(lines.find((l) => l.includes('P 1 21/c 1'))).toMatch(/-P 2ybc\s+monoclinic\s+2\/m\s+yes\s+no\s+h0l: l = 2n; 0k0: k = 2n/);
  });

  it('bad input: exit 2 with an error: line', async () => {
    for (const argv of [['groups', '--name', 'P 5'], ['groups', '--number', '0'], ['groups', '--number', 'x'], ['groups', '--number', '3', '--name', 'P2'], ['groups', 'extra']]) {
      const c = capture();
      expect(await runCli(argv, c.ctx), argv.join(' ')).toBe(2);
      expect(c.err).toMatch(/^error: /);
      expect(c.out).toBe('');
    }
  });
});
