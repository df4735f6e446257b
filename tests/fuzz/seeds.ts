/**
 * Small, valid seed files for the fuzzers, one per input style the readers know:
 * CIF 1.1 core (merged, amplitudes, unmerged), mmCIF, whitespace text with a header,
 * CSV and TSV, and a trial-model CIF. Deterministic (no randomness here), invented
 * data (lab "qm", made-up cells).
 */

const CELL_CORE = [
  '_cell_length_a 7.512(2)', '_cell_length_b 9.034(3)', '_cell_length_c 11.270(4)',
  '_cell_angle_alpha 90', '_cell_angle_beta 101.25(1)', '_cell_angle_gamma 90',
  '_diffrn_radiation_wavelength 0.71073',
];

/** A fixed list of (h, k, l, I, sigma) rows: varied signs, one weak and one negative intensity. */
export function seedRows(count = 24): [number, number, number, number, number][] {
  const rows: [number, number, number, number, number][] = [];
  for (let j = 0; rows.length < count; j++) {
    const h = (j % 5) - 2, k = ((j * 7) % 6) - 1, l = ((j * 3) % 7) - 3;
    if (h === 0 && k === 0 && l === 0) continue;
    const i = ((j * 977) % 1500) / 3 - 20;
    rows.push([h, k, l, Number(i.toFixed(2)), Number((2 + (j % 9) * 0.7).toFixed(2))]);
  }
  return rows;
}

const rowText = (sep: string) => seedRows().map((r) => r.join(sep));

export const SEEDS: Record<string, string> = {
  'core.cif': [
    '# invented test data', 'data_qm_seed', ...CELL_CORE,
    "_diffrn_ambient_temperature 150", "_exptl_crystal_description 'small block'",
    'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_squared_meas', '_refln_F_squared_sigma',
    ...rowText(' '), '',
  ].join('\n'),
  'amplitudes.cif': [
    'data_qm_amp', ...CELL_CORE,
    'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_meas', '_refln_F_sigma', '_refln_observed_status',
    ...seedRows().map((r) => `${r[0]} ${r[1]} ${r[2]} ${Math.abs(r[3]) / 10} ${r[4] / 10} o`), '',
  ].join('\n'),
  'unmerged.cif': [
    'data_qm_unmerged', ...CELL_CORE,
    'loop_', '_diffrn_refln_index_h', '_diffrn_refln_index_k', '_diffrn_refln_index_l', '_diffrn_refln_intensity_net', '_diffrn_refln_intensity_u',
    ...rowText(' '), ...rowText(' ').slice(0, 8), '',
  ].join('\n'),
  'structure.mmcif': [
    'data_QMSEED',
    '_cell.length_a 61.20', '_cell.length_b 71.35', '_cell.length_c 82.10',
    '_cell.angle_alpha 90.00', '_cell.angle_beta 97.20', '_cell.angle_gamma 90.00',
    '#', 'loop_', '_refln.wavelength_id', '_refln.crystal_id', '_refln.index_h', '_refln.index_k', '_refln.index_l',
    '_refln.intensity_meas', '_refln.intensity_sigma', '_refln.status',
    ...seedRows().map((r) => `1 1 ${r.join(' ')} o`), '#', '',
  ].join('\n'),
  'table.txt': ['# exported by hand', 'h k l I sigI', ...rowText('  '), ''].join('\n'),
  'table.csv': ['h,k,l,F2,sigF2', ...rowText(','), ''].join('\n'),
  'table.tsv': ['H\tK\tL\tIobs\tsigma\tbatch', ...seedRows().map((r) => `${r.join('\t')}\t1`), ''].join('\n'),
};

/** A small trial-model CIF (invented, P 1 21/c 1) for the model reader and sf/compare/simulate. */
export const SEED_MODEL = [
  'data_qm_model',
  '_cell_length_a 7.512', '_cell_length_b 9.034', '_cell_length_c 11.270',
  '_cell_angle_alpha 90', '_cell_angle_beta 101.25', '_cell_angle_gamma 90',
  "_space_group_name_H-M_alt 'P 1 21/c 1'",
  'loop_', '_space_group_symop_operation_xyz', "'x, y, z'", "'-x, y+1/2, -z+1/2'", "'-x, -y, -z'", "'x, -y+1/2, z+1/2'",
  'loop_', '_atom_site_label', '_atom_site_type_symbol', '_atom_site_fract_x', '_atom_site_fract_y', '_atom_site_fract_z',
  '_atom_site_occupancy', '_atom_site_U_iso_or_equiv',
  'Fe1 Fe 0.1250 0.2500 0.3100 1 0.012(1)',
  'O1 O2- 0.3100 0.1800 0.4400 1 0.020',
  'N1 N 0.4500 0.0600 0.1200 1 0.025',
  '',
].join('\n');
