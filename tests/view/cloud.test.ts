import { describe, expect, it } from 'vitest';
import { getSetting, isSystematicallyAbsent } from '../../src/symmetry';
import { makeCell } from '../../src/lattice';
import { INTENSITY_LUT, MARK, SHAPE_DIAMOND, SHAPE_DIAMOND_HOLLOW, SHAPE_DISC, paletteLightness } from '../../shaders-free-render';
import { makeDataset, buildCloud, syntheticTable } from '../../src/view';
import { tableFromArrays } from '../../src/core';

describe('the 3D point cloud', () => {
  const table = syntheticTable(3000);
  const ds = makeDataset(table, 'synthetic');

  it('places every reflection at distance 1/d from the origin (metric tensor reference)', () => {
    const cell = makeCell(table.meta.cell!);
    if (!cell.ok) throw cell.error;
    let worst = 0;
    for (let r = 0; r < table.n; r++) {
      const q = Math.hypot(ds.xyz[3 * r], ds.xyz[3 * r + 1], ds.xyz[3 * r + 2]);
      worst = Math.max(worst, Math.abs(q - 1 / cell.value.dSpacing(table.h[r], table.k[r], table.l[r])));
    }
    expect(worst).toBeLessThan(1e-6);
  });

  it('marks what P 1 21/c 1 forbids with diamonds, strong ones (I/sigma >= 3) filled', () => {
    const s = getSetting('P 1 21/c 1');
    const { cloud, stats } = buildCloud(ds, { colour: 'intensity', rules: s.conditions, dMin: 0 });
    let forbidden = 0, strong = 0;
    for (let r = 0; r < table.n; r++) {
      const absent = isSystematicallyAbsent(s, table.h[r], table.k[r], table.l[r]);
      const io = table.i[r] / table.sigma[r];
      if (absent) { forbidden++; if (io >= 3) strong++; }
      const want = !absent ? SHAPE_DISC : io >= 3 ? SHAPE_DIAMOND : SHAPE_DIAMOND_HOLLOW;
      if (cloud.shape[r] !== want) throw new Error(`${table.h[r]} ${table.k[r]} ${table.l[r]}: shape ${cloud.shape[r]}, expected ${want}`);
    }
    expect(forbidden).toBeGreaterThan(10);
    expect(stats.forbidden).toBe(forbidden);
    expect(stats.violations).toBe(strong);
    for (let r = 0; r < table.n; r++) if (cloud.shape[r] === SHAPE_DIAMOND) expect(cloud.color[r]).toBe(MARK.violator);
  });

  it('hides reflections beyond the resolution filter and draws nothing hidden', () => {
    const { cloud, stats } = buildCloud(ds, { colour: 'isigma', rules: [], dMin: 2.0 });
    let beyond = 0;
    for (let r = 0; r < table.n; r++) if (1 / ds.dstar[r] < 2.0) beyond++;
    expect(stats.hidden).toBe(beyond);
    for (let r = 0; r < table.n; r++) expect(cloud.hidden![r]).toBe(1 / ds.dstar[r] < 2.0 ? 1 : 0);
    expect(buildCloud(ds, { colour: 'isigma', rules: [], dMin: 0 }).cloud.hidden).toBeUndefined();
  });

  it('hides weak allowed reflections on request but never the forbidden ones', () => {
    const s = getSetting('P 1 21/c 1');
    const { cloud } = buildCloud(ds, { colour: 'intensity', rules: s.conditions, dMin: 0, minIOverSigma: 5 });
    for (let r = 0; r < table.n; r++) {
      const absent = isSystematicallyAbsent(s, table.h[r], table.k[r], table.l[r]);
      const io = table.i[r] / table.sigma[r];
      expect(cloud.hidden![r], `${table.h[r]} ${table.k[r]} ${table.l[r]}`).toBe(!absent && !(io >= 5) ? 1 : 0);
    }
  });

  it('copes with one reflection, zero sigma and NaN intensity', () => {
    const t = tableFromArrays({ h: [1, 2], k: [0, 0], l: [0, 1], i: [NaN, 5], sigma: [0, 0] }, { source: 'tiny', cell: { a: 5, b: 5, c: 5, alpha: 90, beta: 90, gamma: 90 } });
    const d = makeDataset(t, 'tiny');
    const { cloud } = buildCloud(d, { colour: 'isigma', rules: [], dMin: 0 });
    expect(cloud.n).toBe(2);
    for (let r = 0; r < 2; r++) expect(cloud.color[r] >>> 24).toBe(255);
  });

  it('uses a palette whose lightness rises steadily (perceptually ordered)', () => {
    // CIE L* of the control curve, and relative luminance of the sRGB table entries (WCAG formula) as an independent check.
    for (let j = 1; j <= 50; j++) expect(paletteLightness(j / 50)).toBeGreaterThan(paletteLightness((j - 1) / 50));
    const lum = (c: number) => {
      const ch = [c & 255, (c >>> 8) & 255, (c >>> 16) & 255].map((v) => { const s = v / 255; return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4; });
      return 0.2126 * ch[0] + 0.7152 * ch[1] + 0.0722 * ch[2];
    };
    for (let j = 8; j < 256; j += 8) expect(lum(INTENSITY_LUT[j])).toBeGreaterThan(lum(INTENSITY_LUT[j - 8]));
  });
});
