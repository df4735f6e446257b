import { tableFromArrays, type ReflectionTable } from '../core';
import { makeCell } from '../lattice';

/**
 * An invented data set made in code: a monoclinic crystal of an invented
 * compound with the absences of P 1 21/c 1 (h0l: l = 2n, 0k0: k = 2n),
 * acentric Wilson-like intensities from a fixed pseudo-random sequence.
 * Used for `?synthetic=N` (benchmarks with a million reflections) and when
 * no demo file is present.
 */
export function syntheticTable(target: number, seed = 7): ReflectionTable {
  const cell = { a: 10.2, b: 12.6, c: 14.1, alpha: 90, beta: 101.5, gamma: 90 };
  const uc = makeCell(cell);
  if (!uc.ok) throw uc.error;
  const V = uc.value.volume;
  // Reflections inside the sphere of radius q: (4/3) pi q^3 V.
  // 3% larger sphere so the target count is always reached before the loop ends.
  const q = 1.03 * Math.cbrt((3 * Math.max(1, target)) / (4 * Math.PI * V));
  const hm = Math.ceil(q * cell.a) + 1, km = Math.ceil(q * cell.b) + 1, lm = Math.ceil(q * cell.c / Math.sin((cell.beta * Math.PI) / 180)) + 1;
  let s = seed >>> 0;
  const rand = () => { s = (s + 0x6d2b79f5) >>> 0; let t = s; t = Math.imul(t ^ (t >>> 15), t | 1); t ^= t + Math.imul(t ^ (t >>> 7), t | 61); return ((t ^ (t >>> 14)) >>> 0) / 4294967296; };
  const H: number[] = [], K: number[] = [], L: number[] = [], I: number[] = [], S: number[] = [];
  const q2 = q * q;
  for (let h = -hm; h <= hm && H.length < target; h++) for (let k = -km; k <= km && H.length < target; k++) for (let l = -lm; l <= lm; l++) {
    if (h === 0 && k === 0 && l === 0) continue;
    const d2 = uc.value.invDSquared(h, k, l);
    if (d2 > q2) continue;
    const absent = (k === 0 && l % 2 !== 0) || (h === 0 && l === 0 && k % 2 !== 0);
    const fall = Math.exp(-2 * 3.0 * (d2 / 4));
    const sigma = 2 + 0.03 * 1500 * fall;
    const signal = absent ? 0 : -Math.log(1 - rand() * 0.999999) * 1500 * fall;
    const noise = (rand() + rand() + rand() - 1.5) * 2 * sigma;
    H.push(h); K.push(k); L.push(l); I.push(signal + noise); S.push(sigma);
    if (H.length >= target) break;
  }
  return tableFromArrays({ h: H, k: K, l: L, i: I, sigma: S }, { source: `synthetic-${target}`, block: 'invented_monoclinic', cell });
}

/** The same data as a CIF 1.1 reflection file (for tests that load through the file input). */
export function syntheticCif(table: ReflectionTable, blockName = 'invented_monoclinic'): string {
  const c = table.meta.cell!;
  const lines = [`data_${blockName}`, `_cell_length_a ${c.a}`, `_cell_length_b ${c.b}`, `_cell_length_c ${c.c}`, `_cell_angle_alpha ${c.alpha}`, `_cell_angle_beta ${c.beta}`, `_cell_angle_gamma ${c.gamma}`,
    'loop_', '_refln_index_h', '_refln_index_k', '_refln_index_l', '_refln_F_squared_meas', '_refln_F_squared_sigma'];
  for (let r = 0; r < table.n; r++) lines.push(`${table.h[r]} ${table.k[r]} ${table.l[r]} ${table.i[r].toFixed(2)} ${table.sigma[r].toFixed(2)}`);
  return lines.join('\n') + '\n';
}
