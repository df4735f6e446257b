/**
 * Small invented reflection files for the browser tests, written as CIF 1.1
 * text. Cubic 6 angstrom cell; rows chosen so every spot is far from every
 * other on screen, so spots can be counted as separate blobs.
 */
export function twoRowsCif(blockName = 'two_rows'): { text: string; count: number; rows: Array<[number, number, number]> } {
  const rows: Array<[number, number, number]> = [];
  for (let h = 1; h <= 8; h++) rows.push([h, 0, 0]);
  for (let h = 1; h <= 8; h++) rows.push([h, 0, 4]);
  const lines = [`data_${blockName}`, '_cell_length_a 6', '_cell_length_b 6', '_cell_length_c 6', '_cell_angle_alpha 90', '_cell_angle_beta 90', '_cell_angle_gamma 90',
    'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_squared_meas', '_refln_F_squared_sigma'];
  for (const [h, k, l] of rows) lines.push(`${h} ${k} ${l} 500.0 10.0`);
  return { text: lines.join('\n') + '\n', count: rows.length, rows };
}

/** A reflection loop whose sigma column holds a word on line 11: the reader must refuse it with a location. */
export function brokenCif(): string {
  return ['data_broken', '_cell_length_a 6', '_cell_length_b 6', '_cell_length_c 6', '_cell_angle_alpha 90', '_cell_angle_beta 90', '_cell_angle_gamma 90',
    'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_squared_meas', '_refln_F_squared_sigma',
    '1 0 0 100 5', '2 0 0 "unterminated'].join('\n') + '\n';
}
