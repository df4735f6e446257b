import { describe, expect, it } from 'vitest';
import { layerCoords, layerPosition, makeLayerPlane, onLayer, parseLayerPlane, type LayerPlane } from '../../shaders-free-render';
import { makeCell } from '../../src/lattice';

function gcd(a: number, b: number): number { a = Math.abs(a); b = Math.abs(b); while (b) [a, b] = [b, a % b]; return a; }

describe('layers u h + v k + w l = n', () => {
  it('gives a node on the layer and a basis of its 2D lattice for every small (u,v,w,n)', () => {
    const failures: string[] = [];
    for (let u = -2; u <= 2; u++) for (let v = -2; v <= 2; v++) for (let w = -2; w <= 2; w++) for (const n of [0, 1, 2, -3]) {
      if (!u && !v && !w) continue;
      const p = makeLayerPlane(u, v, w, n);
      const g = gcd(gcd(u, v), w);
      if (n % g !== 0) { if (typeof p !== 'string') failures.push(`${u},${v},${w},${n}: should have no node`); continue; }
      if (typeof p === 'string') { failures.push(`${u},${v},${w},${n}: ${p}`); continue; }
      if (!onLayer(p, ...p.origin)) failures.push(`${u},${v},${w},${n}: origin off the layer`);
      for (const e of [p.e1, p.e2]) if (u * e[0] + v * e[1] + w * e[2] !== 0) failures.push(`${u},${v},${w},${n}: basis vector leaves the layer`);
      // A basis of the layer lattice: e1 x e2 = +-(u,v,w)/g (its cell has the smallest possible area).
      const x = [p.e1[1] * p.e2[2] - p.e1[2] * p.e2[1], p.e1[2] * p.e2[0] - p.e1[0] * p.e2[2], p.e1[0] * p.e2[1] - p.e1[1] * p.e2[0]];
      const s = x[0] * u + x[1] * v + x[2] * w;
      if (Math.abs(s) !== (u * u + v * v + w * w) / g) failures.push(`${u},${v},${w},${n}: not a primitive basis`);
      // Every node round-trips through its layer coordinates.
      const ij = [0, 0];
      for (let i = -3; i <= 3; i++) for (let j = -3; j <= 3; j++) {
        const h = p.origin[0] + i * p.e1[0] + j * p.e2[0], k = p.origin[1] + i * p.e1[1] + j * p.e2[1], l = p.origin[2] + i * p.e1[2] + j * p.e2[2];
        layerCoords(p, h, k, l, ij);
        if (ij[0] !== i || ij[1] !== j) failures.push(`${u},${v},${w},${n}: node ${i},${j} came back as ${ij}`);
      }
    }
    expect(failures.slice(0, 10)).toEqual([]);
  });

  it('parses presets, hkN forms and the free form, and explains bad names', () => {
    expect((parseLayerPlane('hk0') as LayerPlane).axisLabels).toEqual(['h', 'k']);
    expect((parseLayerPlane('h0l') as LayerPlane).axisLabels).toEqual(['h', 'l']);
    expect((parseLayerPlane('1kl') as LayerPlane).origin).toEqual([1, 0, 0]);
    expect((parseLayerPlane('hk-2') as LayerPlane).n).toBe(-2);
    const hhl = parseLayerPlane('hhl') as LayerPlane;
    expect(onLayer(hhl, 3, 3, 7)).toBe(true);
    expect(onLayer(hhl, 3, 2, 7)).toBe(false);
    expect(onLayer(parseLayerPlane('1,1,0,2') as LayerPlane, 3, -1, 5)).toBe(true);
    expect(parseLayerPlane('hx0')).toMatch(/unknown layer 'hx0'/);
    expect(parseLayerPlane('0,0,0,1')).toMatch(/non-zero normal/);
  });

  it('puts reflections at their true in-layer distances (oblique monoclinic cell)', () => {
    // Distances in the layer must equal |h - h'| in reciprocal space, computed from the metric (1/d).
    const cell = makeCell({ a: 6, b: 8, c: 10, alpha: 90, beta: 105, gamma: 90 });
    if (!cell.ok) throw cell.error;
    const p = parseLayerPlane('h0l') as LayerPlane;
    const pairs: Array<[[number, number, number], [number, number, number]]> = [[[0, 0, 0], [1, 0, 0]], [[0, 0, 0], [0, 0, 1]], [[1, 0, 0], [0, 0, 1]], [[2, 0, -3], [-1, 0, 2]]];
    for (const [a, b] of pairs) {
      const pa = layerPosition(p, cell.value.frac, ...a), pb = layerPosition(p, cell.value.frac, ...b);
      const dist = Math.hypot(pa[0] - pb[0], pa[1] - pb[1]);
      const ref = 1 / cell.value.dSpacing(a[0] - b[0], a[1] - b[1], a[2] - b[2]);
      expect(dist).toBeCloseTo(ref, 10);
    }
  });
});
