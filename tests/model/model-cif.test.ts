import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { REPO_ROOT } from '../helpers/paths';
import { computeStructureFactors, parseModelCif, prepareModel } from '../../src/model';

const ref = (name: string) => readFileSync(resolve(REPO_ROOT, 'tests/reference', name), 'utf8');
// Fixture from tests/reference/model-sf.py (gemmi 0.5.7 StructureFactorCalculatorX).
const fixture = JSON.parse(ref('model-sf.json')) as { models: { name: string; hm: string; reflections: number[][]; atoms: unknown[] }[] };

describe('model CIF reader on files written by gemmi (make_cif_block)', () => {
  for (const m of fixture.models) {
    it(`${m.name}: symmetry from the H-M name, aniso loop; F agrees with gemmi to 1e-4`, () => {
      const r = parseModelCif(ref(`model-${m.name}.cif`), `model-${m.name}.cif`);
      if (!r.ok) throw r.error;
      const model = r.value;
      expect(model.atoms.n).toBe(m.atoms.length);
      const pm = prepareModel(model);
      const n = m.reflections.length;
      const re = new Float64Array(n), im = new Float64Array(n);
      computeStructureFactors(pm, m.reflections.map((x) => x[0]), m.reflections.map((x) => x[1]), m.reflections.map((x) => x[2]), re, im);
      const fmax = Math.max(...m.reflections.map((x) => x[5]));
      const bad = m.reflections.filter((x, j) => !(Math.hypot(re[j] - x[3], im[j] - x[4]) <= (x[5] > 1e-3 * fmax ? 1e-4 * x[5] : 1e-7 * fmax)));
      // gemmi writes U_iso of 1/3 to 9-10 digits and 1/3 coordinates as 0.333333333; 1e-4 absorbs that
      expect(bad.slice(0, 5)).toEqual([]);
    });
  }
});

const BASE = `data_test
_cell_length_a 5.0(1)
_cell_length_b 6.0
_cell_length_c 7.0
_cell_angle_alpha 90
_cell_angle_beta 100.0(2)
_cell_angle_gamma 90
`;

const anisoLoop = (letter: 'U' | 'B') =>
  ['loop_', '_atom_site_aniso_label', ...['11', '22', '33', '12', '13', '23'].map((ij) => `_atom_site_aniso_${letter}_${ij}`)].join('\n') + '\n';
const ATOMS_PLAIN = ['loop_', '_atom_site_label', '_atom_site_fract_x', '_atom_site_fract_y', '_atom_site_fract_z'].join('\n') + '\n';
const ATOMS_TYPED = ATOMS_PLAIN.replace('_atom_site_label\n', '_atom_site_label\n_atom_site_type_symbol\n');
const ANISO_U = anisoLoop('U');
const ANISO_B = anisoLoop('B');

function read(text: string) {
  return parseModelCif(text, 'test.cif');
}

describe('model CIF reader: values, symmetry sources, errors', () => {
  it('reads s.u. in parentheses, charges, B_iso, occupancy and explicit operations', () => {
    const r = read(BASE + `loop_
_symmetry_equiv_pos_as_xyz
x,y,z
-x,-y,-z
` + ATOMS_TYPED + `_atom_site_B_iso_or_equiv
_atom_site_occupancy
Fe1 Fe3+ 0.1234(5) 0.25 0.5(2) 1.5791(3) 0.5
O1 O2- 0.3 0.4 0.1 ? ?
`);
    if (!r.ok) throw r.error;
    const m = r.value;
    expect(m.cell.a).toBe(5);
    expect(m.ops.length).toBe(2);
    expect(m.atoms.element).toEqual(['Fe', 'O']);
    expect(Array.from(m.atoms.charge)).toEqual([3, -2]);
    expect(m.atoms.x[0]).toBe(0.1234);
    expect(m.atoms.uiso[0]).toBeCloseTo(1.5791 / (8 * Math.PI * Math.PI), 12);
    expect(m.atoms.occupancy[0]).toBe(0.5);
    expect(m.atoms.occupancy[1]).toBe(1);
    expect(m.warnings.join('\n')).not.toMatch(/Fe3\+|O2-/); // both ions have form factors (tests/model/form-factor-ions.test.ts)
    expect(m.warnings.join('\n')).toMatch(/no displacement parameter for O1/);
  });

  it('takes the symmetry from a Hall symbol and completes a list that is not a group', () => {
    const hall = read(BASE + `_space_group_name_Hall '-P 2ybc'
` + ATOMS_PLAIN + `C1 0.1 0.2 0.3
`);
    if (!hall.ok) throw hall.error;
    expect(hall.value.ops.length).toBe(4);
    expect(hall.value.warnings.join()).toMatch(/element C taken from the label/);
    const partial = read(BASE + `loop_
_space_group_symop_operation_xyz
'-x,y+1/2,-z+1/2'
'-x,-y,-z'
` + ATOMS_TYPED + `C1 C 0.1 0.2 0.3
`);
    if (!partial.ok) throw partial.error;
    expect(partial.value.ops.length).toBe(4);
    expect(partial.value.warnings.join()).toMatch(/do not form a group; completed to 4/);
  });

  it('reports an unknown element with line and column', () => {
    const r = read(BASE + `_symmetry_space_group_name_H-M 'P 1'
` + ATOMS_TYPED + `C1 C 0.1 0.2 0.3
Q1 Qq 0.1 0.2 0.3
`);
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.error.describe()).toMatch(/^test\.cif:16:4: unknown element 'Qq' for atom Q1/);
  });

  it('reports a bad operation at its place in the file', () => {
    const r = read(BASE + `loop_
_space_group_symop_operation_xyz
'x,y,z'
'x,y,w'
` + ATOMS_PLAIN + `C1 0.1 0.2 0.3
`);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.describe()).toMatch(/^test\.cif:11:\d+: .*x,y,w/);
  });

  it('reports missing symmetry, missing cell, unknown group, non-number coordinate, a reflection file', () => {
    const atoms = `loop_
_atom_site_label
_atom_site_fract_x
_atom_site_fract_y
_atom_site_fract_z
C1 0.1 0.2 0.3
`;
    const noSym = read(BASE + atoms);
    expect(!noSym.ok && noSym.error.describe()).toMatch(/gives no symmetry/);
    const noCell = read(`data_x\n_symmetry_space_group_name_H-M 'P 1'\n` + atoms);
    expect(!noCell.ok && noCell.error.describe()).toMatch(/_cell_length_a is missing/);
    const badGroup = read(BASE + `_symmetry_space_group_name_H-M 'P 7 x'\n` + atoms);
    expect(!badGroup.ok && badGroup.error.describe()).toMatch(/test\.cif:8:\d+: unknown space-group symbol 'P 7 x'/);
    const badNum = read(BASE + `_symmetry_space_group_name_H-M 'P 1'\n` + atoms.replace('0.2', 'abc'));
    expect(!badNum.ok && badNum.error.describe()).toMatch(/test\.cif:14:\d+: _atom_site_fract_y of C1: 'abc' is not a number/);
    const refl = read(BASE + `loop_\n_refln_index_h\n_refln_index_k\n_refln_index_l\n1 2 3\n`);
    expect(!refl.ok && refl.error.describe()).toMatch(/no atom sites.*reflection file/);
    const aniso = read(BASE + `_symmetry_space_group_name_H-M 'P 1'\n` + atoms + ANISO_U + `X9 0.01 0.01 0.01 0 0 0
`);
    expect(!aniso.ok && aniso.error.describe()).toMatch(/X9, which is not among the atom sites/);
    expect(read('').ok).toBe(false);
  });
});

describe('model CIF reader: anisotropic B and labels', () => {
  it('converts _atom_site_aniso_B_ij to U by 1/(8 pi^2) and takes elements from labels', () => {
    const r = parseModelCif(BASE + `_symmetry_space_group_name_H-M 'P 1'
` + ATOMS_PLAIN + `Cl1 0.1 0.2 0.3
C2A 0.4 0.2 0.3
` + ANISO_B + `Cl1 1.0 2.0 3.0 0.1 0.2 0.3
`, 'b.cif');
    if (!r.ok) throw r.error;
    const a = r.value.atoms;
    expect(a.element).toEqual(['Cl', 'C']);
    expect(a.hasAniso[0]).toBe(1);
    expect(a.aniso[1]).toBeCloseTo(2 / (8 * Math.PI ** 2), 12);
    expect(a.uiso[0]).toBeCloseTo(2 / (8 * Math.PI ** 2), 12); // U_eq-like fallback: mean of the diagonal
    expect(a.uiso[1]).toBe(0);
  });
});

describe('model CIF reader: near-special positions and charge forms', () => {
  it('warns about an atom a little off a special position and reads O-2 as O2-', () => {
    const r = parseModelCif(BASE + `_symmetry_space_group_name_H-M 'P -1'
` + ATOMS_TYPED + `Fe1 Fe 0.02 0.0 0.0
O1 O-2 0.3 0.2 0.1
Fe2 Fe 0.5 0.5 0.5
`, 'n.cif');
    if (!r.ok) throw r.error;
    expect(Array.from(r.value.atoms.charge)).toEqual([0, -2, 0]);
    const w = r.value.warnings.join('\n');
    expect(w).toMatch(/Fe1 lies 0\.20 A from its own symmetry image/); // 2 x 0.02 x a(5 A) = 0.20 A
    expect(w).not.toMatch(/Fe2 lies/); // exactly on the inversion centre
  });
});

describe('model CIF reader: a file in the style refinement programs write', () => {
  it('reads symop ids, s.u., Uani/Uiso flags, riding hydrogens, multiplicities and dummy sites', () => {
    const text = `#\\#CIF_1.1
data_invented_example
_cell_length_a                    7.2104(3)
_cell_length_b                    9.8311(4)
_cell_length_c                    11.3702(5)
_cell_angle_alpha                 90
_cell_angle_beta                  104.613(2)
_cell_angle_gamma                 90
_space_group_crystal_system       monoclinic
_space_group_name_H-M_alt         'P 21/c'
loop_
 _space_group_symop_id
 _space_group_symop_operation_xyz
 1 'x, y, z'
 2 '-x, y+1/2, -z+1/2'
 3 '-x, -y, -z'
 4 'x, -y-1/2, z-1/2'
loop_
 _atom_site_label
 _atom_site_type_symbol
 _atom_site_fract_x
 _atom_site_fract_y
 _atom_site_fract_z
 _atom_site_U_iso_or_equiv
 _atom_site_adp_type
 _atom_site_occupancy
 _atom_site_symmetry_multiplicity
 _atom_site_calc_flag
 _atom_site_refinement_flags
Fe1 Fe 0.5000 0.0000 0.5000 0.01234(8) Uani 1 2 d S
N1 N 0.3195(2) 0.1622(2) 0.4718(2) 0.0210(4) Uani 1 1 d .
C1 C 0.1391(3) 0.2870(2) 0.2255(2) 0.0270(5) Uani 1 2 d .
H1 H 0.0812 0.3301 0.2811 0.032 Uiso 1 1 calc R
Q1 ? 0.2 0.2 0.2 0.05 Uiso 1 1 dum .
loop_
 _atom_site_aniso_label
 _atom_site_aniso_U_11
 _atom_site_aniso_U_22
 _atom_site_aniso_U_33
 _atom_site_aniso_U_23
 _atom_site_aniso_U_13
 _atom_site_aniso_U_12
 _atom_site_aniso_type_symbol
Fe1 0.0110(1) 0.0130(1) 0.0125(1) 0.0003(1) 0.0021(1) -0.0004(1) Fe
N1 0.019(1) 0.022(1) 0.021(1) 0.001(1) 0.004(1) 0.000(1) N
C1 0.025(1) 0.028(1) 0.027(1) -0.002(1) 0.005(1) 0.001(1) C
`;
    const r = parseModelCif(text, 'ex.cif');
    if (!r.ok) throw r.error;
    const m = r.value;
    expect(m.cell.beta).toBe(104.613);
    expect(m.ops.length).toBe(4);
    expect(m.atoms.label).toEqual(['Fe1', 'N1', 'C1', 'H1']);
    expect(m.warnings.join()).toMatch(/Q1: dummy site/);
    expect(m.warnings.join('\n')).toMatch(/C1: the file gives site multiplicity 2, the operations give 4/);
    expect(m.warnings.join('\n')).not.toMatch(/Fe1: the file gives/);
    // aniso columns in a different order than 11 22 33 12 13 23: stored as U11 U22 U33 U12 U13 U23
    expect(Array.from(m.atoms.aniso.subarray(0, 6))).toEqual([0.011, 0.013, 0.0125, -0.0004, 0.0021, 0.0003]);
    expect(m.atoms.hasAniso[3]).toBe(0);
    expect(m.atoms.uiso[3]).toBe(0.032);
    expect(prepareModel(m).siteOrder[0]).toBe(2); // on the inversion centre, as _atom_site_symmetry_multiplicity 2 says
  });
});
