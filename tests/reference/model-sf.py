#!/usr/bin/python3
"""Reference structure factors of invented trial models, computed with gemmi.

Source: gemmi %(version)s (Debian python3-gemmi), gemmi.StructureFactorCalculatorX
.calculate_sf_from_small_structure, with form factors of International Tables Vol. C
Table 6.1.1.4 (gemmi's it92 table). Occupancies of atoms on special positions are made
crystallographic with gemmi's SmallStructure.change_occupancies_to_crystallographic(),
so gemmi decides the site multiplicities independently of our code.

Writes tests/reference/model-sf.json (the fixture tests read) and one model CIF per model,
tests/reference/model-<name>.cif, written by gemmi's make_cif_block (tests our reader on CIF
written by another program). The models are invented for this test; they describe no real compound.

Run: /usr/bin/python3 tests/reference/model-sf.py
"""
import json, math, os
import gemmi

HERE = os.path.dirname(os.path.abspath(__file__))

# name, H-M symbol, cell, dmin, atoms: (label, type, x, y, z, occ, Uiso or None, aniso (U11 U22 U33 U12 U13 U23) or None)
MODELS = [
    ('monoclinic-special', 'P 1 21/c 1', (7.21, 9.83, 11.37, 90, 104.6, 90), 1.2, [
        ('Fe1', 'Fe', 0.0, 0.0, 0.0, 1.0, 0.012, None),          # on an inversion centre
        ('Br1', 'Br', 0.2317, 0.1186, 0.4072, 1.0, 0.031, None),
        ('O1', 'O', 0.1520, -0.0841, 0.1203, 1.0, 0.024, None),
        ('N1', 'N', -0.1475, 0.1622, 0.0718, 1.0, 0.021, None),
        ('C1', 'C', 0.3391, 0.2870, 0.2255, 1.0, 0.027, None),
        ('C2', 'C', 0.4633, 0.3512, 0.1337, 0.75, 0.035, None),  # partly occupied
    ]),
    ('orthorhombic-aniso', 'P 21 21 21', (6.02, 8.47, 13.91, 90, 90, 90), 1.0, [
        ('S1', 'S', 0.1182, 0.2245, 0.0871, 1.0, None, (0.021, 0.018, 0.025, 0.002, -0.003, 0.001)),
        ('O1', 'O', 0.3364, 0.1577, 0.1390, 1.0, None, (0.034, 0.029, 0.022, -0.006, 0.004, 0.002)),
        ('C1', 'C', -0.0514, 0.3821, 0.1512, 1.0, None, (0.026, 0.021, 0.030, 0.001, 0.002, -0.004)),
        ('N1', 'N', 0.2040, 0.4902, 0.3106, 1.0, 0.028, None),
        ('Cl1', 'Cl', 0.6610, 0.0433, 0.4275, 1.0, None, (0.041, 0.036, 0.030, 0.008, -0.002, 0.005)),
    ]),
    ('c-centred-axis', 'C 1 2/c 1', (14.36, 5.88, 12.04, 90, 111.2, 90), 1.1, [
        ('Cu1', 'Cu', 0.0, 0.3127, 0.25, 1.0, None, (0.015, 0.019, 0.017, 0.0, 0.004, 0.0)),  # on a 2-fold axis
        ('O1', 'O', 0.0923, 0.1104, 0.3561, 1.0, 0.022, None),
        ('O2', 'O', 0.1647, 0.4518, 0.1859, 1.0, None, (0.030, 0.024, 0.028, 0.003, 0.009, -0.002)),
        ('C1', 'C', 0.2412, 0.3046, 0.4433, 1.0, 0.026, None),
    ]),
    ('trigonal-axis', 'P 31 2 1', (6.73, 6.73, 9.18, 90, 90, 120), 1.1, [
        ('Si1', 'Si', 0.4702, 0.0, 1.0 / 3.0, 1.0, 0.010, None),  # on a 2-fold axis
        ('O1', 'O', 0.4135, 0.2668, 0.2141, 1.0, None, (0.020, 0.017, 0.019, 0.010, -0.002, -0.003)),
        ('Ge1', 'Ge', 0.0, 0.0, 0.1092, 0.5, 0.015, None),        # general position, half occupied
    ]),
    ('cubic-face-centred', 'F m -3 m', (5.62, 5.62, 5.62, 90, 90, 90), 0.9, [
        ('K1', 'K', 0.0, 0.0, 0.0, 1.0, 0.018, None),
        ('I1', 'I', 0.5, 0.5, 0.5, 1.0, 0.022, None),
    ]),
]


def build(name, hm, cell, atoms):
    st = gemmi.SmallStructure()
    st.name = name
    st.cell = gemmi.UnitCell(*cell)
    st.spacegroup_hm = hm
    for label, el, x, y, z, occ, uiso, aniso in atoms:
        s = gemmi.SmallStructure.Site()
        s.label = label
        s.type_symbol = el
        s.element = gemmi.Element(el)
        s.fract = gemmi.Fractional(x, y, z)
        s.occ = occ
        if aniso is not None:
            s.aniso = gemmi.SMat33d(*aniso)
            s.u_iso = (aniso[0] + aniso[1] + aniso[2]) / 3.0  # written to the CIF as U_eq-like value; not used by gemmi when aniso is set
        else:
            s.u_iso = uiso
        st.add_site(s)
    st.setup_cell_images()
    return st


def hemisphere(cell, dmin):
    uc = gemmi.UnitCell(*cell)
    hmax = [int(math.ceil(p / dmin)) for p in cell[:3]]
    out = []
    for h in range(-hmax[0], hmax[0] + 1):
        for k in range(-hmax[1], hmax[1] + 1):
            for l in range(0, hmax[2] + 1):
                if l == 0 and (k < 0 or (k == 0 and h <= 0)):
                    continue
                if uc.calculate_d([h, k, l]) >= dmin:
                    out.append((h, k, l))
    return out


fixture = {
    'source': 'gemmi %s StructureFactorCalculatorX.calculate_sf_from_small_structure; '
              'form factors International Tables Vol. C Table 6.1.1.4 (it92)' % gemmi.__version__,
    'generated_by': 'tests/reference/model-sf.py',
    'models': [],
}
for name, hm, cell, dmin, atoms in MODELS:
    st = build(name, hm, cell, atoms)
    # CIF for the reader test, written before occupancies are made crystallographic
    doc = gemmi.cif.Document()
    doc.add_copied_block(st.make_cif_block())
    doc.write_file(os.path.join(HERE, 'model-%s.cif' % name))
    st.change_occupancies_to_crystallographic()
    calc = gemmi.StructureFactorCalculatorX(st.cell)
    refl = []
    for h, k, l in hemisphere(cell, dmin):
        F = calc.calculate_sf_from_small_structure(st, [h, k, l])
        refl.append([h, k, l, F.real, F.imag, abs(F), math.degrees(math.atan2(F.imag, F.real))])
    sg = gemmi.SpaceGroup(hm)
    fixture['models'].append({
        'name': name,
        'hm': hm,
        'hall': sg.hall,
        'cell': dict(zip(['a', 'b', 'c', 'alpha', 'beta', 'gamma'], cell)),
        'dmin': dmin,
        'ops': [op.triplet() for op in sg.operations()],
        # the same operations as integers: rotation row-major, translation over 24 (gemmi's Op.DEN)
        'ops_int': [[[v // gemmi.Op.DEN for row in op.rot for v in row], list(op.tran)] for op in sg.operations()],
        'atoms': [{'label': a[0], 'element': a[1], 'x': a[2], 'y': a[3], 'z': a[4], 'occupancy': a[5],
                   'uiso': a[6] if a[6] is not None else (a[7][0] + a[7][1] + a[7][2]) / 3.0,
                   'aniso': list(a[7]) if a[7] is not None else None} for a in atoms],
        'crystallographic_occupancy': [s.occ for s in st.sites],
        'columns': ['h', 'k', 'l', 're', 'im', 'f', 'phase_deg'],
        'reflections': refl,
    })

# Form factors at several s = sin(theta)/lambda
ff = {'source': 'gemmi %s Element(x).it92.calculate_sf(s^2): International Tables Vol. C Table 6.1.1.4' % gemmi.__version__,
      's': [0.0, 0.05, 0.1, 0.2, 0.3, 0.5, 0.8, 1.2, 1.6, 2.0], 'values': {}}
for el in ['H', 'C', 'O', 'Fe', 'Br', 'Cf']:
    c = gemmi.Element(el).it92
    ff['values'][el] = [c.calculate_sf(s * s) for s in ff['s']]
fixture['form_factors'] = ff

with open(os.path.join(HERE, 'model-sf.json'), 'w') as f:
    json.dump(fixture, f, separators=(',', ':'))
    f.write('\n')
print('wrote', len(fixture['models']), 'models,', sum(len(m['reflections']) for m in fixture['models']), 'reflections')
