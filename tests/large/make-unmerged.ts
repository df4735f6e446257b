import { closeSync, openSync, writeSync } from 'node:fs';

/**
 * Writes an invented unmerged data set (`_diffrn_refln` loop, one observation per
 * line, indices of a monoclinic cell) of `rows` observations to `path`, in
 * chunks, so even 10 million rows never sit in memory as one string. Deterministic
 * (xorshift). Used by tests/large and tests/bench/hardening.bench.ts; the files go
 * to the temp folder and are never committed.
 */
export function writeUnmergedCif(path: string, rows: number): number {
  const fd = openSync(path, 'w');
  let bytes = 0;
  const put = (s: string) => { bytes += writeSync(fd, s); };
  try {
    put([
      '# invented long collection (lab "qm"), written by tests/large/make-unmerged.ts',
      'data_qm_long_collection',
      '_cell_length_a 10.214', '_cell_length_b 12.577', '_cell_length_c 15.031',
      '_cell_angle_alpha 90', '_cell_angle_beta 104.3', '_cell_angle_gamma 90',
      '_diffrn_radiation_wavelength 0.71073',
      'loop_', '_diffrn_refln_index_h', '_diffrn_refln_index_k', '_diffrn_refln_index_l',
      '_diffrn_refln_intensity_net', '_diffrn_refln_intensity_u', '',
    ].join('\n'));
    let s = 2463534242;
    const rnd = () => { s ^= s << 13; s >>>= 0; s ^= s >>> 17; s ^= s << 5; s >>>= 0; return s / 4294967296; };
    let chunk: string[] = [];
    for (let j = 0; j < rows; j++) {
      const h = Math.floor(rnd() * 25) - 12, k = Math.floor(rnd() * 29) - 14, l = Math.floor(rnd() * 35) - 17 || 1;
      chunk.push(`${h} ${k} ${l} ${(rnd() * rnd() * 5000 - 50).toFixed(1)} ${(3 + rnd() * 40).toFixed(1)}`);
      if (chunk.length === 100_000) { put(chunk.join('\n') + '\n'); chunk = []; }
    }
    if (chunk.length) put(chunk.join('\n') + '\n');
  } finally {
    closeSync(fd);
  }
  return bytes;
}
