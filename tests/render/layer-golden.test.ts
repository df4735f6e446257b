import { describe, expect, it } from 'vitest';
import { deflateSync, inflateSync } from 'node:zlib';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { decodePng, drawLayerMap, encodePng, MARK, parseLayerPlane, type LayerPlane } from '../../shaders-free-render';
import { syntheticMonoclinic } from './synthetic-layer';

/**
 * Golden picture of a small layer. The golden PNG is committed beside this file.
 * To regenerate after an intended change of the layer map's look:
 *   UPDATE_GOLDEN=1 npx vitest run tests/render/layer-golden.test.ts
 * then LOOK at tests/render/golden-h0l.png before committing it.
 */
const GOLDEN = resolve(import.meta.dirname, 'golden-h0l.png');

function render() {
  const { table, recip } = syntheticMonoclinic();
  const plane = parseLayerPlane('h0l') as LayerPlane;
  return drawLayerMap({
    width: 320, height: 320, plane, recip, data: table, textScale: 1,
    forbidden: (h, k, l) => k === 0 && l % 2 !== 0, ruleText: 'h0l: l = 2n', title: 'synthetic',
  });
}

describe('layer map golden picture', () => {
  it('matches the committed golden PNG within a pixel tolerance', () => {
    const r = render();
    const png = encodePng(r.image, (b) => deflateSync(b));
    if (process.env.UPDATE_GOLDEN === '1' || !existsSync(GOLDEN)) {
      writeFileSync(GOLDEN, png);
      if (process.env.UPDATE_GOLDEN !== '1') throw new Error(`golden PNG was missing and has been written to ${GOLDEN}: look at it, commit it, rerun`);
    }
    const gold = decodePng(new Uint8Array(readFileSync(GOLDEN)), (b) => inflateSync(b));
    expect([gold.width, gold.height]).toEqual([r.image.width, r.image.height]);
    // Tolerance: a channel may differ by up to 24 levels (rounding in blends), and at most 0.5% of pixels may differ more.
    let bad = 0;
    for (let p = 0; p < gold.data.length; p += 4) {
      let worst = 0;
      for (let c = 0; c < 4; c++) worst = Math.max(worst, Math.abs(gold.data[p + c] - r.image.data[p + c]));
      if (worst > 24) bad++;
    }
    expect(bad / (gold.width * gold.height)).toBeLessThan(0.005);
  });

  it('draws one spot per measured reflection of the layer and marks the violator', () => {
    const { table } = syntheticMonoclinic();
    let onLayerCount = 0;
    for (let r = 0; r < table.n; r++) if (table.k[r] === 0) onLayerCount++;
    const r = render();
    expect(r.spotCount).toBe(onLayerCount);
    expect(r.violations).toBe(1); // 1 0 3 was made strong on purpose; the other l-odd h0l are weak
    expect(r.forbiddenMarked).toBeGreaterThan(0);
  });

  it('draws calculated intensities as the right half of each spot', () => {
    const { table, recip } = syntheticMonoclinic();
    const plane = parseLayerPlane('h0l') as LayerPlane;
    const r = drawLayerMap({ width: 320, height: 320, plane, recip, data: table, calc: table, legend: false });
    // The strongest spot of the layer: left of its centre the intensity palette, right of it the model colour.
    let best = -1;
    for (let j = 0; j < r.spotCount; j++) if (best < 0 || table.i[r.spotRow[j]] > table.i[r.spotRow[best]]) best = j;
    const x = Math.round(r.spotX[best]), y = Math.floor(r.spotY[best]);
    expect(r.image.pixels[y * 320 + x + 3]).toBe(MARK.calc);
    expect(r.image.pixels[y * 320 + x - 4]).not.toBe(MARK.calc);
  });

  it('round-trips a PNG through our writer and reader', () => {
    const r = render();
    const back = decodePng(encodePng(r.image, (b) => deflateSync(b)), (b) => inflateSync(b));
    expect(Buffer.from(back.data).equals(Buffer.from(r.image.data))).toBe(true);
  });
});
