import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { REPO_ROOT } from '../helpers/paths';
import { makeCell } from '../../src/lattice';
import { identityOp } from '../../src/symmetry';
import {
  atomSitesFromList, computeStructureFactors, findFormFactor, findIonFormFactor, formatTypeSymbol, formFactorAt,
  formFactorElements, formFactorIons, parseModelCif, parseTypeSymbol, prepareModel,
} from '../../src/model';

const readRef = (name: string) => JSON.parse(readFileSync(resolve(REPO_ROOT, 'tests/reference', name), 'utf8'));
// Fixture from tests/reference/formfactor-table.py: periodictable's own evaluation (cromermann.fxrayatstol)
// of the Waasmaier & Kirfel (1995) Acta Cryst. A51, 416-431 ion coefficients (independent reference).
const ions = readRef('formfactor-ions.json') as { source: string; s: number[]; values: Record<string, number[]>; electrons: Record<string, number> };
// Fixture from tests/reference/model-sf.py: gemmi 0.5.7 it92 (International Tables Vol. C Table 6.1.1.4), neutral atoms.
const neutral = (readRef('model-sf.json') as { form_factors: { s: number[]; values: Record<string, number[]> } }).form_factors;

const close = (ours: number, ref: number) => Math.abs(ours - ref) <= 1e-9 * Math.max(1, Math.abs(ref));

describe('ion form factors against periodictable (Waasmaier & Kirfel 1995; tests/reference/formfactor-ions.json)', () => {
  it('the fixture names its source and covers exactly the ions of the table', () => {
    expect(ions.source).toMatch(/Waasmaier & Kirfel \(1995\)/);
    expect(Object.keys(ions.values).sort()).toEqual(formFactorIons().sort());
    expect(formFactorIons().length).toBeGreaterThan(100);
    for (const sym of ['O2-', 'Fe2+', 'Fe3+', 'Cu1+', 'Cu2+', 'Cl1-', 'Na1+', 'H1-']) expect(formFactorIons()).toContain(sym);
  });

  it('every ion matches at every sin(theta)/lambda of the fixture (0 to 6 1/A)', () => {
    const failures: string[] = [];
    for (const [sym, values] of Object.entries(ions.values)) {
      const c = findFormFactor(sym);
      if (!c) { failures.push(`${sym}: not found`); continue; }
      ions.s.forEach((s, j) => {
        const v = formFactorAt(c, s);
        if (!close(v, values[j])) failures.push(`${sym} s=${s}: ${v} vs ${values[j]}`);
      });
    }
    expect(failures).toEqual([]);
  });

  it('ion rows are marked with their source and carry five Gaussians', () => {
    const fe3 = findFormFactor('Fe3+')!;
    expect(fe3).toMatchObject({ element: 'Fe', z: 26, charge: 3, symbol: 'Fe3+', source: 'waasmaier-kirfel-1995' });
    expect(fe3.a.length).toBe(5);
    expect(fe3.b.length).toBe(5);
    expect(fe3.a[4]).not.toBe(0);
  });
});

describe('ion form factors: sanity (common practice)', () => {
  it('f(0) equals the electron count of the ion within 0.05 (O2- ~ 10, Fe3+ ~ 23, every ion)', () => {
    expect(Math.abs(formFactorAt(findFormFactor('O2-')!, 0) - 10)).toBeLessThan(0.05);
    expect(Math.abs(formFactorAt(findFormFactor('Fe3+')!, 0) - 23)).toBeLessThan(0.05);
    expect(Math.abs(formFactorAt(findFormFactor('Cu1+')!, 0) - 28)).toBeLessThan(0.05);
    const failures: string[] = [];
    for (const sym of formFactorIons()) {
      const c = findFormFactor(sym)!;
      const electrons = c.z - c.charge; // from atomic number and charge, not from the fit
      if (!(Math.abs(formFactorAt(c, 0) - electrons) < 0.05)) failures.push(`${sym}: f(0) = ${formFactorAt(c, 0)}, ${electrons} electrons`);
    }
    expect(failures).toEqual([]);
  });

  it('a cation scatters less than its neutral atom at low angle and tends to it at high angle (common practice)', () => {
    const fe = findFormFactor('Fe')!, fe3 = findFormFactor('Fe3+')!;
    expect(formFactorAt(fe3, 0.1)).toBeLessThan(formFactorAt(fe, 0.1));
    // the missing outer electrons scatter only at low angle: at s = 1 1/A the two agree within 0.1 electron
    expect(Math.abs(formFactorAt(fe3, 1) - formFactorAt(fe, 1))).toBeLessThan(0.1);
  });
});

describe('neutral atoms unchanged (International Tables Vol. C Table 6.1.1.4, gemmi it92 fixture tests/reference/model-sf.json)', () => {
  it('values match gemmi at every s, through both lookups', () => {
    const failures: string[] = [];
    for (const [el, values] of Object.entries(neutral.values)) {
      for (const c of [findFormFactor(el)!, findIonFormFactor(el, 0)!]) {
        neutral.s.forEach((s, j) => {
          if (!close(formFactorAt(c, s), values[j])) failures.push(`${el} s=${s}: ${formFactorAt(c, s)} vs ${values[j]}`);
        });
      }
    }
    expect(failures).toEqual([]);
  });

  it('every neutral row is the four-Gaussian fit: fifth term zero, source named', () => {
    const bad = formFactorElements().filter((el) => {
      const c = findFormFactor(el)!;
      return c.a[4] !== 0 || c.b[4] !== 0 || c.charge !== 0 || c.source !== 'itc-6.1.1.4' || c.symbol !== el;
    });
    expect(bad).toEqual([]);
  });
});

describe('ion lookup and type symbols', () => {
  it('reads the CIF form, the sign-first form and a bare sign', () => {
    for (const text of ['Fe3+', 'Fe+3', 'fe3+', ' Fe3+ ']) expect(findFormFactor(text)?.symbol).toBe('Fe3+');
    expect(findFormFactor('Na+')?.symbol).toBe('Na1+');
    expect(findFormFactor('O-2')?.symbol).toBe('O2-');
    expect(findFormFactor('Cu1+')?.symbol).toBe('Cu1+');
    expect(findIonFormFactor('Fe', 2)?.symbol).toBe('Fe2+');
    expect(findIonFormFactor('Fe', 0)?.symbol).toBe('Fe');
    expect(parseTypeSymbol('Fe+3')).toEqual({ element: 'Fe', charge: 3 });
    expect(['Fe', 'Fe3+', 'O2-', 'Cu1+'].map((s) => { const t = parseTypeSymbol(s)!; return formatTypeSymbol(t.element, t.charge); }))
      .toEqual(['Fe', 'Fe3+', 'O2-', 'Cu1+']);
  });

  it('an ion neither table lists is undefined, not the neutral atom', () => {
    expect(findFormFactor('Fe7+')).toBeUndefined();
    expect(findFormFactor('N3-')).toBeUndefined();
    expect(findIonFormFactor('N', -3)).toBeUndefined();
    expect(findIonFormFactor('Xx', 1)).toBeUndefined();
    expect(findFormFactor('Xx2+')).toBeUndefined();
  });
});

// a 5 A cubic cell in P 1 with typed, isotropic atom sites
const CUBIC_P1 = ['data_ions', ...['a', 'b', 'c'].map((x) => `_cell_length_${x} 5`), ...['alpha', 'beta', 'gamma'].map((x) => `_cell_angle_${x} 90`),
  'loop_', '_symmetry_equiv_pos_as_xyz', 'x,y,z', 'loop_',
  ...['label', 'type_symbol', 'fract_x', 'fract_y', 'fract_z', 'U_iso_or_equiv'].map((x) => `_atom_site_${x}`), ''].join('\n');

describe('ions in a model', () => {
  it('the reader warns only about ions neither table has', () => {
    const r = parseModelCif(CUBIC_P1 + `Fe1 Fe+3 0 0 0 0
O1 O2- 0.5 0.5 0.5 0
N1 N3- 0.25 0.25 0.25 0
N2 N3- 0.75 0.25 0.25 0
`, 'ions.cif');
    if (!r.ok) throw r.error;
    expect(Array.from(r.value.atoms.charge)).toEqual([3, -2, -3, -3]);
    const w = r.value.warnings.join('\n');
    expect(w).not.toMatch(/Fe\+3|O2-/);
    expect(w).toMatch(/N3-: no form factor for this ion .*the neutral N form factor .*is used/);
    expect(w.match(/N3-/g)?.length).toBe(1); // once per type symbol
  });

  it('one Fe3+ at rest in P 1 gives |F| = f(Fe3+) of periodictable at s = h/(2a) (5-Gaussian rows in the kernel)', () => {
    const r = parseModelCif(CUBIC_P1 + 'Fe1 Fe3+ 0.13 0.27 0.41 0\n', 'fe3.cif');
    if (!r.ok) throw r.error;
    const pm = prepareModel(r.value);
    expect(pm.types.map((t) => t.symbol)).toEqual(['Fe3+']);
    // a = 5 A: (h 0 0) lies at s = h / 10, so these h hit fixture points exactly
    const hs = [1, 2, 3, 5, 8, 12, 16, 20];
    const re = new Float64Array(hs.length), im = new Float64Array(hs.length);
    computeStructureFactors(pm, hs, hs.map(() => 0), hs.map(() => 0), re, im);
    const failures: string[] = [];
    hs.forEach((h, j) => {
      const ref = ions.values['Fe3+'][ions.s.indexOf(h / 10)];
      if (!(Math.abs(Math.hypot(re[j], im[j]) - ref) <= 1e-9 * ref)) failures.push(`${h} 0 0: ${Math.hypot(re[j], im[j])} vs ${ref}`);
    });
    expect(failures).toEqual([]);
  });

  it('the same element as ion and as neutral atom are two form-factor types; an unlisted ion uses the neutral atom', () => {
    const c = makeCell({ a: 5, b: 5, c: 5, alpha: 90, beta: 90, gamma: 90 });
    if (!c.ok) throw c.error;
    const pm = prepareModel({
      source: 'test', cell: c.value, ops: [identityOp()], warnings: [],
      atoms: atomSitesFromList([
        { label: 'Fe1', element: 'Fe', charge: 2, x: 0, y: 0, z: 0 },
        { label: 'Fe2', element: 'Fe', charge: 3, x: 0.5, y: 0, z: 0 },
        { label: 'Fe3', element: 'Fe', x: 0, y: 0.5, z: 0 },
        { label: 'Fe4', element: 'Fe', charge: 3, x: 0, y: 0, z: 0.5 },
        { label: 'N1', element: 'N', charge: -3, x: 0.5, y: 0.5, z: 0.5 },
      ]),
    });
    expect(pm.types.map((t) => t.symbol)).toEqual(['Fe2+', 'Fe3+', 'Fe', 'N']);
    expect(Array.from(pm.typeOf)).toEqual([0, 1, 2, 1, 3]);
  });
});
