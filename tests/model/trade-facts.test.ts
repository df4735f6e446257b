import { describe, expect, it } from 'vitest';
import { makeCell } from '../../src/lattice';
import { identityOp, translationOp, findSetting, type SymOp } from '../../src/symmetry';
import {
  atomSitesFromList, computeStructureFactors, prepareModel, findFormFactor, formFactorAt, siteSymmetryOrder,
  type AtomInput, type CrystalModel,
} from '../../src/model';

function model(ops: readonly SymOp[], atoms: AtomInput[], cell = { a: 5, b: 6, c: 7, alpha: 90, beta: 90, gamma: 90 }): CrystalModel {
  const c = makeCell(cell);
  if (!c.ok) throw c.error;
  return { source: 'test', cell: c.value, ops, atoms: atomSitesFromList(atoms), warnings: [] };
}

function sf(m: CrystalModel, hkl: number[][]) {
  const n = hkl.length;
  const re = new Float64Array(n), im = new Float64Array(n);
  computeStructureFactors(prepareModel(m), hkl.map((x) => x[0]), hkl.map((x) => x[1]), hkl.map((x) => x[2]), re, im);
  return { re, im };
}

const HKL: number[][] = [];
for (let h = -3; h <= 3; h++) for (let k = -3; k <= 3; k++) for (let l = 0; l <= 3; l++) if (h || k || l) HKL.push([h, k, l]);

const BODY_CENTRED = [identityOp(), translationOp([12, 12, 12])];
const stolOf = (m: CrystalModel, [h, k, l]: number[]) => m.cell.stol(h, k, l);

describe('facts of the trade (common practice)', () => {
  it('a primitive cell with one atom at rest gives F = f at every reflection', () => {
    const m = model([identityOp()], [{ label: 'Fe1', element: 'Fe', x: 0.13, y: 0.27, z: 0.41 }]);
    const { re, im } = sf(m, HKL);
    const fe = findFormFactor('Fe')!;
    HKL.forEach((x, j) => expect(Math.hypot(re[j], im[j])).toBeCloseTo(formFactorAt(fe, stolOf(m, x)), 10));
  });

  it('a body-centred cell of identical atoms gives F = 0 when h+k+l is odd', () => {
    const m = model(BODY_CENTRED, [{ label: 'C1', element: 'C', x: 0.1, y: 0.2, z: 0.3, uiso: 0.02 }]);
    const { re, im } = sf(m, HKL);
    const c = findFormFactor('C')!;
    HKL.forEach(([h, k, l], j) => {
      const f = Math.hypot(re[j], im[j]);
      if ((h + k + l) % 2 !== 0) expect(f).toBeLessThan(1e-12);
      else expect(f).toBeCloseTo(2 * formFactorAt(c, m.cell.stol(h, k, l)) * Math.exp(-8 * Math.PI ** 2 * 0.02 * m.cell.stol(h, k, l) ** 2), 10);
    });
  });

  it('two different atoms at 0,0,0 and 1/2,1/2,1/2 give f1 + f2 for h+k+l even and f1 - f2 for odd', () => {
    const m = model([identityOp()], [
      { label: 'Br1', element: 'Br', x: 0, y: 0, z: 0 },
      { label: 'O1', element: 'O', x: 0.5, y: 0.5, z: 0.5 },
    ]);
    const { re, im } = sf(m, HKL);
    const br = findFormFactor('Br')!, o = findFormFactor('O')!;
    HKL.forEach((x, j) => {
      const s = stolOf(m, x);
      const f1 = formFactorAt(br, s), f2 = formFactorAt(o, s);
      const expected = (x[0] + x[1] + x[2]) % 2 === 0 ? f1 + f2 : f1 - f2;
      expect(re[j]).toBeCloseTo(expected, 10);
      expect(im[j]).toBeCloseTo(0, 10);
    });
  });

  it('an atom on a special position counts once: Cl at the origin of P -1 equals one Cl in P 1', () => {
    const pm1 = findSetting('P -1')!;
    const onCentre = model(pm1.ops, [{ label: 'Cl1', element: 'Cl', x: 0, y: 0, z: 0 }]);
    expect(siteSymmetryOrder(onCentre, 0, 0, 0)).toBe(2);
    expect(siteSymmetryOrder(onCentre, 0.01, 0, 0)).toBe(1); // 0.05 A off the centre is a general position
    const single = model([identityOp()], [{ label: 'Cl1', element: 'Cl', x: 0, y: 0, z: 0 }]);
    const a = sf(onCentre, HKL), b = sf(single, HKL);
    HKL.forEach((_, j) => expect(a.re[j]).toBeCloseTo(b.re[j], 10));
  });

  it('F(-h) is the complex conjugate of F(h) (Friedel, no anomalous scattering)', () => {
    const m = model(findSetting('P 21 21 21')!.ops, [
      { label: 'S1', element: 'S', x: 0.11, y: 0.23, z: 0.37, aniso: [0.02, 0.03, 0.025, 0.004, -0.002, 0.001] },
      { label: 'N1', element: 'N', x: 0.41, y: 0.07, z: 0.19, uiso: 0.03 },
    ]);
    const plus = sf(m, HKL), minus = sf(m, HKL.map(([h, k, l]) => [-h, -k, -l]));
    HKL.forEach((_, j) => {
      expect(minus.re[j]).toBeCloseTo(plus.re[j], 9);
      expect(minus.im[j]).toBeCloseTo(-plus.im[j], 9);
    });
  });

  it('handles degenerate input: no reflections, and cancellation', () => {
    const m = model([identityOp()], [{ label: 'C1', element: 'C', x: 0, y: 0, z: 0 }]);
    const pm = prepareModel(m);
    expect(computeStructureFactors(pm, [], [], [], new Float64Array(0), new Float64Array(0))).toBe(true);
    const n = 5000;
    const cancelled = computeStructureFactors(pm, new Int32Array(n).fill(1), new Int32Array(n), new Int32Array(n), new Float64Array(n), new Float64Array(n), { signal: { aborted: true } });
    expect(cancelled).toBe(false);
  });
});
