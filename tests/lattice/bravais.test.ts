import { describe, expect, it } from 'vitest';
import {
  findBravaisCandidates, makeCell, cellFromMetric, basisMatrix, formatChangeOfBasis, type BravaisType,
} from '../../src/lattice';
import type { CellParams } from '../../src/core';

/** Seeded generator (mulberry32) so every run tests the same bases. */
function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

type M = number[];
const mul = (a: M, b: M): M => {
  const o: M = [];
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) o.push(a[3 * i] * b[j] + a[3 * i + 1] * b[3 + j] + a[3 * i + 2] * b[6 + j]);
  return o;
};
const det = (m: M) => m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
const cell = (p: number[]): CellParams => ({ a: p[0], b: p[1], c: p[2], alpha: p[3], beta: p[4], gamma: p[5] });

/**
 * Primitive bases of the centred lattices, columns in the conventional basis
 * (International Tables Vol. A, Part 5, transformations to primitive cells).
 */
const h = 1 / 2, t = 1 / 3;
const PRIMITIVE: Record<string, M> = {
  P: [1, 0, 0, 0, 1, 0, 0, 0, 1],
  C: [h, h, 0, -h, h, 0, 0, 0, 1],
  I: [-h, h, h, h, -h, h, h, h, -h],
  F: [0, h, h, h, 0, h, h, h, 0],
  R: [2 * t, -t, -t, t, t, -2 * t, t, t, t],
};

/** Conventional cells chosen by hand, away from accidental higher symmetry, in this project's conventions. */
const TYPES: [BravaisType, number[]][] = [
  ['aP', [5.1, 6.3, 7.7, 79, 84, 71]],
  ['mP', [5.2, 7.1, 9.3, 90, 97, 90]],
  ['mC', [12.7, 6.1, 8.3, 90, 108, 90]],
  ['oP', [4.8, 6.9, 9.7, 90, 90, 90]],
  ['oC', [5.3, 8.1, 10.6, 90, 90, 90]],
  ['oI', [5.6, 7.4, 9.9, 90, 90, 90]],
  ['oF', [6.2, 8.8, 11.3, 90, 90, 90]],
  ['tP', [5.5, 5.5, 8.3, 90, 90, 90]],
  ['tI', [6.1, 6.1, 11.7, 90, 90, 90]],
  ['hP', [6.3, 6.3, 9.8, 90, 90, 120]],
  ['hR', [7.4, 7.4, 15.9, 90, 90, 120]],
  ['cP', [4.9, 4.9, 4.9, 90, 90, 90]],
  ['cI', [5.7, 5.7, 5.7, 90, 90, 90]],
  ['cF', [8.1, 8.1, 8.1, 90, 90, 90]],
];

function randomUnimodular(r: () => number): M {
  let m: M = [1, 0, 0, 0, 1, 0, 0, 0, 1];
  for (let s = 0; s < 5; s++) {
    const i = Math.floor(r() * 3);
    const j = (i + 1 + Math.floor(r() * 2)) % 3;
    const e: M = [1, 0, 0, 0, 1, 0, 0, 0, 1];
    e[3 * i + j] = [-2, -1, 1, 2][Math.floor(r() * 4)];
    m = mul(m, e);
  }
  return m;
}

describe('Bravais lattice search (Le Page 1982 twofold axes)', () => {
  it('finds the true type first, with its conventional cell, from random perturbed primitive bases of all 14 types', () => {
    const r = rng(1982);
    const failures: string[] = [];
    for (const [type, params] of TYPES) {
      const conv = makeCell(cell(params));
      if (!conv.ok) throw conv.error;
      const pPrim = PRIMITIVE[type === 'aP' ? 'P' : type[1]];
      for (let trial = 0; trial < 12; trial++) {
        const u = randomUnimodular(r);
        const q = mul(pPrim, u); // conventional -> input basis
        // Cartesian input basis, columns; then a slight random strain (about 0.01 degree)
        const strain: M = [1, 0, 0, 0, 1, 0, 0, 0, 1].map((x) => x + (r() - 0.5) * 2e-4);
        const b = mul(strain, mul(Array.from(conv.value.orth), q));
        const g = mul([b[0], b[3], b[6], b[1], b[4], b[7], b[2], b[5], b[8]], b);
        const input = cellFromMetric(g);
        const res = findBravaisCandidates(input);
        if (!res.ok) { failures.push(`${type}: ${res.error.message}`); continue; }
        const top = res.value.candidates[0];
        const label = `${type} trial ${trial} (input ${Object.values(input).map((x) => x.toFixed(3)).join(' ')})`;
        if (top.bravais !== type) { failures.push(`${label}: first candidate ${top.bravais}`); continue; }
        if (top.deviationDeg > 0.1) failures.push(`${label}: deviation ${top.deviationDeg}`);
        // same lattice: conventional(true) -> found is integer and unimodular
        const m = mul(q, basisMatrix(top.transform));
        if (m.some((x) => Math.abs(x - Math.round(x)) > 1e-9) || Math.abs(Math.abs(det(m)) - 1) > 1e-9)
          failures.push(`${label}: found cell ${formatChangeOfBasis(top.transform)} is another lattice (M = ${m.map((x) => x.toFixed(3))})`);
        if (type !== 'aP') {
          let got = [top.cell.a, top.cell.b, top.cell.c, top.cell.alpha, top.cell.beta, top.cell.gamma];
          // orthorhombic axes may come in the input's order: compare the sorted lengths
          if (type[0] === 'o') got = [...got.slice(0, 3).sort((x, y) => x - y), ...got.slice(3)];
          if (got.some((x, j) => Math.abs(x - params[j]) > (j < 3 ? 0.01 : 0.1)))
            failures.push(`${label}: cell ${got.map((x) => x.toFixed(3)).join(' ')} expected ${params.join(' ')}`);
        }
      }
    }
    expect(failures).toEqual([]);
  });

  it('lists the near-orthorhombic monoclinic cell with its deviation (beta = 90.32)', () => {
    // cell of /work/shared/realdata/cod-1560875.cif
    const res = findBravaisCandidates(cell([8.72, 8.93, 12.94, 90, 90.32, 90]));
    if (!res.ok) throw res.error;
    const oP = res.value.candidates.find((c) => c.bravais === 'oP');
    expect(oP).toBeDefined();
    expect(oP!.deviationDeg).toBeCloseTo(0.32, 2); // the angle that must become 90
    const mP = res.value.candidates.find((c) => c.bravais === 'mP');
    expect(mP!.deviationDeg).toBeLessThan(1e-9);
    expect(formatChangeOfBasis(mP!.transform)).toBe('a,b,c');
    // a 0.2 degree tolerance keeps only the monoclinic and triclinic lattices
    const strict = findBravaisCandidates(cell([8.72, 8.93, 12.94, 90, 90.32, 90]), { toleranceDeg: 0.2 });
    if (!strict.ok) throw strict.error;
    expect(strict.value.candidates.map((c) => c.bravais)).toEqual(['mP', 'aP']);
  });

  it('sorts highest symmetry first and ends with aP', () => {
    const res = findBravaisCandidates(cell([5, 5, 5, 60, 60, 60])); // primitive cell of cF
    if (!res.ok) throw res.error;
    const types = res.value.candidates.map((c) => c.bravais);
    expect(types[0]).toBe('cF');
    expect(types[types.length - 1]).toBe('aP');
    // cF contains tI, hR, oF, oI, mC sub-lattice descriptions (International Tables Vol. A, group-subgroup relations of m-3m)
    for (const t of ['tI', 'hR', 'oF', 'oI', 'mC']) expect(types).toContain(t);
    const conv = res.value.candidates[0].cell;
    expect(conv.a).toBeCloseTo(5 * Math.SQRT2, 9);
  });

  it('the monoclinic rule can pick the I-centred cell choice of an mC lattice, with beta closer to 90', () => {
    // C-centred cell a=12.7 b=6.1 c=8.3 beta=125 given as its primitive cell (a-b)/2, (a+b)/2, c.
    // By hand: a.c = -60.46, |a+c| = 10.45; the I cell (c, a+c) has cos(beta) = c.(a+c)/(|c||a+c|) = 0.097 -> 95.6 degrees.
    const conv = makeCell(cell([12.7, 6.1, 8.3, 90, 125, 90]));
    if (!conv.ok) throw conv.error;
    const b = mul(Array.from(conv.value.orth), PRIMITIVE.C);
    const input = cellFromMetric(mul([b[0], b[3], b[6], b[1], b[4], b[7], b[2], b[5], b[8]], b));
    const reduced = findBravaisCandidates(input, { monoclinicRule: 'reduced' });
    const closest = findBravaisCandidates(input, { monoclinicRule: 'beta-closest-to-90' });
    if (!reduced.ok || !closest.ok) throw new Error('search failed');
    const mr = reduced.value.candidates.find((c) => c.bravais === 'mC')!;
    const mc = closest.value.candidates.find((c) => c.bravais === 'mC')!;
    expect(mr.centring).toBe('C');
    expect(mr.cell.beta).toBeCloseTo(125, 6);
    expect(mc.centring).toBe('I');
    expect(mc.cell.beta).toBeCloseTo(95.6, 1);
    expect(mc.cell.b).toBeCloseTo(6.1, 9);
  });

  it('reports a bad cell as an error value', () => {
    const res = findBravaisCandidates(cell([5, 5, 5, 90, 90, 200]));
    expect(res.ok).toBe(false);
  });
});
