import type { ReflectionTable } from '../core';

/**
 * The shortest decimal that reads back as the same Float32 value (at most 9
 * significant digits always suffice for binary32). Starts at 6 digits, where
 * measured values usually sit, and walks down or up.
 */
export function formatFloat32(x: number): string {
  if (!Number.isFinite(x)) return '?';
  const f = Math.fround(x);
  const fits = (p: number) => Math.fround(Number(f.toPrecision(p))) === f;
  let p = 6;
  if (fits(p)) { while (p > 1 && fits(p - 1)) p--; }
  else { while (p < 9 && !fits(p)) p++; }
  // Number(..).toString() drops exponent forms like 1e+2 where plain digits read better
  return String(Number(f.toPrecision(p)));
}

export interface WriteReflectionCifOptions {
  /** Data block name (default: the table's block, else 'lacuna'). */
  readonly blockName?: string;
  /** Extra comment lines for the header (without '#'). */
  readonly comments?: readonly string[];
}

function blockNameOf(name: string): string {
  const s = name.replace(/[^A-Za-z0-9_.\-]/g, '_').slice(0, 70);
  return s === '' ? 'lacuna' : s;
}

function commentLine(text: string): string {
  return '# ' + text.replace(/[\r\n]+/g, ' ');
}

/**
 * A CIF 1.1 reflection file with core-dictionary tags: cell, wavelength and a
 * loop of h, k, l, F^2 and sigma (`_refln_F_squared_meas/_sigma`), or, for
 * unmerged tables, `_diffrn_refln_intensity_net/_u`. Values are written with
 * the fewest digits that read back as the identical Float32, so reading the
 * output gives the same table.
 */
export function writeReflectionCif(table: ReflectionTable, opts: WriteReflectionCifOptions = {}): string {
  const m = table.meta;
  const out: string[] = ['#\\#CIF_1.1', commentLine('reflection data written by Lacuna'), commentLine(`from: ${m.source}`)];
  out.push(commentLine('intensities on the F^2 scale' + (m.origin === 'amplitude' ? ', squared from amplitudes F: I = F^2, sigma(I) = 2|F| sigma(F)' : '')));
  if (m.sigmaEstimated) out.push(commentLine('the source gave no sigmas: no sigma column is written (a reader estimates them again)'));
  for (const c of opts.comments ?? []) out.push(commentLine(c));
  out.push(`data_${blockNameOf(opts.blockName ?? m.block ?? 'lacuna')}`);
  if (m.cell) {
    const c = m.cell;
    out.push(
      `_cell_length_a    ${c.a}`, `_cell_length_b    ${c.b}`, `_cell_length_c    ${c.c}`,
      `_cell_angle_alpha ${c.alpha}`, `_cell_angle_beta  ${c.beta}`, `_cell_angle_gamma ${c.gamma}`,
    );
  }
  if (m.wavelength !== undefined) out.push(`_diffrn_radiation_wavelength ${m.wavelength}`);
  const cat = m.unmerged ? '_diffrn_refln' : '_refln';
  out.push('loop_', `${cat}_index_h`, `${cat}_index_k`, `${cat}_index_l`);
  out.push(m.unmerged ? '_diffrn_refln_intensity_net' : '_refln_F_squared_meas');
  const { h, k, l, i, sigma } = table;
  // estimated sigmas are not measurements: leave them out rather than pass them off as measured
  if (m.sigmaEstimated) {
    for (let j = 0; j < table.n; j++) out.push(`${h[j]} ${k[j]} ${l[j]} ${formatFloat32(i[j])}`);
  } else {
    out.push(m.unmerged ? '_diffrn_refln_intensity_u' : '_refln_F_squared_sigma');
    for (let j = 0; j < table.n; j++) out.push(`${h[j]} ${k[j]} ${l[j]} ${formatFloat32(i[j])} ${formatFloat32(sigma[j])}`);
  }
  return out.join('\n') + '\n';
}
