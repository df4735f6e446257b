import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { REPO_ROOT } from '../helpers/paths';
import { runCli } from '../../src/cli';

const tmp = mkdtempSync(join(tmpdir(), 'lacuna-model-cli-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
const MODEL = resolve(REPO_ROOT, 'tests/reference/model-monoclinic-special.cif');
// gemmi 0.5.7 values from tests/reference/model-sf.json (StructureFactorCalculatorX)
const fixture = JSON.parse(readFileSync(resolve(REPO_ROOT, 'tests/reference/model-sf.json'), 'utf8')) as { models: { name: string; reflections: number[][] }[] };

async function run(args: string[]) {
  let out = '', err = '';
  const code = await runCli(args, { out: (t) => { out += t; }, err: (t) => { err += t; }, interactive: false, cwd: tmp });
  return { code, out, err };
}

describe('lacuna sf', () => {
  it('prints {reflections: [{h,k,l,f,phase}]} matching gemmi', async () => {
    const r = await run(['sf', MODEL, '--dmin', '1.2', '--json']);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.out) as { reflections: { h: number; k: number; l: number; f: number; phase: number }[] };
    const ref = fixture.models.find((m) => m.name === 'monoclinic-special')!.reflections;
    expect(doc.reflections.length).toBe(ref.length);
    const byKey = new Map(ref.map((x) => [`${x[0]},${x[1]},${x[2]}`, x]));
    const failures: string[] = [];
    for (const x of doc.reflections) {
      const g = byKey.get(`${x.h},${x.k},${x.l}`);
      if (!g) { failures.push(`${x.h} ${x.k} ${x.l} not in the reference`); continue; }
      if (Math.abs(x.f - g[5]) > 1e-4 * Math.max(g[5], 1)) failures.push(`${x.h} ${x.k} ${x.l}: f ${x.f} vs ${g[5]}`);
      const dphi = Math.abs((((x.phase - g[6]) % 360) + 540) % 360 - 180);
      if (g[5] > 1 && dphi > 0.01) failures.push(`${x.h} ${x.k} ${x.l}: phase ${x.phase} vs ${g[6]}`);
    }
    expect(failures.slice(0, 10)).toEqual([]);
  });
  it('gives exit 2 with a located message for bad input', async () => {
    const noDmin = await run(['sf', MODEL]);
    expect(noDmin.code).toBe(2);
    expect(noDmin.err).toMatch(/^error: 'sf' needs --dmin/);
    const bad = join(tmp, 'bad.cif');
    writeFileSync(bad, "data_x\n_cell_length_a 5\n_cell_length_b 5\n_cell_length_c 5\n_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n_symmetry_space_group_name_H-M 'P 1'\nloop_\n_atom_site_label\n_atom_site_type_symbol\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\nX1 Zz 0 0 0\n");
    const r = await run(['sf', bad, '--dmin', '2']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^error: .*bad\.cif:15:4: unknown element 'Zz'/);
    const data = await run(['sf', resolve(REPO_ROOT, 'public/demo/qm-101.cif'), '--dmin', '2']);
    expect(data.code).toBe(2);
    expect(data.err).toMatch(/looks like a reflection file/);
  });
});

describe('lacuna simulate and compare', () => {
  it('simulate writes a file; compare --json reports scale, r1, wr2, goof, worst', async () => {
    const s = await run(['simulate', MODEL, '--dmin', '1.0', '--seed', '7', '--out', 'sim.cif', '--violations', '2', '--json']);
    expect(s.code).toBe(0);
    const summary = JSON.parse(s.out);
    expect(summary.violations.length).toBe(2);
    const c = await run(['compare', MODEL, 'sim.cif', '--json']);
    expect(c.code).toBe(0);
    const doc = JSON.parse(c.out);
    for (const key of ['scale', 'r1', 'wr2', 'goof', 'worst']) expect(doc).toHaveProperty(key);
    expect(doc.r1).toBeLessThan(0.06);
    expect(doc.worst.length).toBe(10);
    // the two weak violations sit at absent positions where the model gives 0: they are among the worst
    const worstKeys = doc.worst.map((w: { h: number; k: number; l: number }) => `${w.h},${w.k},${w.l}`);
    const violationKeys = summary.violations.map((v: { h: number; k: number; l: number }) => `${v.h},${v.k},${v.l}`);
    expect(violationKeys.filter((k: string) => worstKeys.includes(k)).length).toBeGreaterThanOrEqual(1);
  });
  it('simulate never overwrites its input and needs its options', async () => {
    const copy = join(tmp, 'model.cif');
    writeFileSync(copy, readFileSync(MODEL));
    const before = readFileSync(copy, 'utf8');
    const r = await run(['simulate', 'model.cif', '--dmin', '1', '--seed', '1', '--out', 'model.cif']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/never overwrites its input/);
    expect(readFileSync(copy, 'utf8')).toBe(before);
    expect((await run(['simulate', 'model.cif', '--dmin', '1', '--out', 'x.cif'])).err).toMatch(/needs --seed/);
    expect((await run(['simulate', 'model.cif', '--seed', '1', '--out', 'x.cif'])).err).toMatch(/needs --dmin/);
    expect((await run(['simulate', 'model.cif', '--dmin', '1', '--seed', '1'])).err).toMatch(/needs --out/);
    expect((await run(['simulate', 'model.cif', '--dmin', '1', '--seed', '1', '--out', 'x.cif', '--noise', 'p=-1'])).code).toBe(2);
    expect(existsSync(join(tmp, 'x.cif'))).toBe(false);
  });
  it('compare rejects data without usable sigma with exit 2', async () => {
    writeFileSync(join(tmp, 'zero.cif'), 'data_z\nloop_\n_refln_index_h\n_refln_index_k\n_refln_index_l\n_refln_F_squared_meas\n_refln_F_squared_sigma\n1 0 0 10 0\n0 1 0 12 0\n');
    const r = await run(['compare', MODEL, 'zero.cif']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/^error: .*zero.cif.*(no reflections|positive sigma)/);
  });
});
