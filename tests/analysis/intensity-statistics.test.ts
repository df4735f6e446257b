import { describe, expect, it } from 'vitest';
import { tableFromArrays } from '../../src/core';
import { HklIndex, intensityStatistics, nzAcentric, nzCentric, THEORY, reflectionLogOdds } from '../../src/analysis';
import { SeededRandom } from '../../src/model';

// Theoretical values and their published sources (named beside each check).
describe('theoretical intensity statistics', () => {
  it('mean |E^2-1| is 2/e acentric and 0.968 centric (Wilson 1949, Acta Cryst. 2, 318; values as tabulated in International Tables Vol. B ch. 2.1, from memory of that table)', () => {
    expect(THEORY.meanAbsE2Minus1.acentric).toBeCloseTo(0.736, 3);
    expect(THEORY.meanAbsE2Minus1.centric).toBeCloseTo(0.968, 3);
  });
  it('N(z) follows Howells, Phillips & Rogers (1950), Acta Cryst. 3, 210: values at z = 0.1, 0.5, 1 (from memory of their table)', () => {
    expect(nzAcentric(0.1)).toBeCloseTo(0.095, 3);
    expect(nzAcentric(0.5)).toBeCloseTo(0.393, 3);
    expect(nzAcentric(1)).toBeCloseTo(0.632, 3);
    expect(nzCentric(0.1)).toBeCloseTo(0.248, 3);
    expect(nzCentric(0.5)).toBeCloseTo(0.520, 3);
    expect(nzCentric(1)).toBeCloseTo(0.683, 3);
  });
  it('second moments 2 and 3, L-test 1/2 and 3/8 (Padilla & Yeates 2003, Acta Cryst. D59, 1124)', () => {
    expect(THEORY.secondMoment.acentric).toBe(2);
    expect(THEORY.secondMoment.centric).toBe(3);
    expect(THEORY.lTest.meanAbsL.untwinned).toBe(0.5);
    expect(THEORY.lTest.meanAbsL.perfectTwin).toBe(0.375);
    expect(THEORY.lTest.meanL2.untwinned).toBeCloseTo(1 / 3, 10);
  });
});

/** Ideal Wilson intensities on a grid of indices: acentric I = |A + iB|^2, centric I = A^2 (A, B normal). */
function wilsonTable(centric: boolean, n1 = 24, seed = 5, noise = 0.0) {
  const rng = new SeededRandom(seed);
  const h: number[] = [], k: number[] = [], l: number[] = [], I: number[] = [], s: number[] = [];
  for (let a = 1; a <= n1; a++)
    for (let b = 1; b <= n1; b++)
      for (let c = 1; c <= n1 / 2; c++) {
        const x = rng.normal(), y = rng.normal();
        const t = centric ? x * x : 0.5 * (x * x + y * y);
        h.push(a); k.push(b); l.push(c);
        I.push(t + noise * rng.normal());
        s.push(Math.max(noise, 1e-3));
      }
  return tableFromArrays({ h, k, l, i: I, sigma: s }, { source: centric ? 'centric' : 'acentric' });
}

function statsOf(t: ReturnType<typeof wilsonTable>) {
  const e2 = Float64Array.from(t.i);
  const sE = Float64Array.from(t.sigma);
  return intensityStatistics(t, e2, sE, new Uint8Array(t.n).fill(1), new HklIndex(t));
}

describe('intensity statistics on ideal Wilson samples (Monte Carlo, 6912 reflections)', () => {
  it('acentric sample reproduces 0.736, 2, N(z) and the untwinned L-test', () => {
    const s = statsOf(wilsonTable(false));
    expect(s.meanAbsE2Minus1).toBeGreaterThan(0.70);
    expect(s.meanAbsE2Minus1).toBeLessThan(0.77);
    expect(s.secondMoment).toBeGreaterThan(1.85);
    expect(s.secondMoment).toBeLessThan(2.15);
    expect(Math.abs(s.nz.observed[1] - nzAcentric(0.1))).toBeLessThan(0.02);
    expect(s.centricLogOdds).toBeLessThan(-1.5);
    expect(Math.abs(s.lTest.meanAbsL - 0.5)).toBeLessThan(0.02);
  });
  it('centric sample reproduces 0.968, 3 and N(z)', () => {
    const s = statsOf(wilsonTable(true));
    expect(s.meanAbsE2Minus1).toBeGreaterThan(0.92);
    expect(s.meanAbsE2Minus1).toBeLessThan(1.02);
    expect(s.secondMoment).toBeGreaterThan(2.7);
    expect(s.secondMoment).toBeLessThan(3.3);
    expect(Math.abs(s.nz.observed[1] - nzCentric(0.1))).toBeLessThan(0.02);
    expect(s.centricLogOdds).toBeGreaterThan(1.5);
  });
  it('measurement noise is accounted for: noisy acentric data stay acentric', () => {
    const s = statsOf(wilsonTable(false, 24, 9, 0.3));
    expect(s.secondMoment).toBeLessThan(2.3);
    expect(s.centricLogOdds).toBeLessThan(0);
  });
});

describe('per-reflection absence log-odds (French & Wilson 1978 present model)', () => {
  const model = { k: 1, violationFraction: 0.03 };
  it('a zero within its error favours absent; a strong reflection rules it out', () => {
    expect(reflectionLogOdds(0.5, 1, 100, model)).toBeGreaterThan(2);
    expect(reflectionLogOdds(60, 1, 100, model)).toBeLessThan(-10);
  });
  it('a truly present class has negative expected log-odds, centric zones included', () => {
    // Monte Carlo over Wilson intensities (acentric and centric) with unit errors, mean 20
    let sa = 0, sc = 0;
    const N = 4000;
    for (let j = 0; j < N; j++) {
      const u1 = (j + 0.5) / N;
      const ia = -20 * Math.log(1 - u1);                    // acentric quantile
      const x = Math.sqrt(2) * inverseErf(2 * u1 - 1);      // centric: 20 x^2, x normal
      sa += reflectionLogOdds(ia, 1, 20, model);
      sc += reflectionLogOdds(20 * x * x, 1, 20, model, 0.5);
    }
    expect(sa / N).toBeLessThan(-0.5);
    expect(sc / N).toBeLessThan(-0.2);
  });
  it('a weak reflection in weak data says little', () => {
    expect(Math.abs(reflectionLogOdds(0.5, 1, 1, model))).toBeLessThan(1.5);
  });
  it('degenerate input does not give NaN', () => {
    expect(Number.isFinite(reflectionLogOdds(0, 0, 100, model))).toBe(true);
    expect(Number.isFinite(reflectionLogOdds(-5, 1, 1e-9, model))).toBe(true);
  });
});

/** Inverse error function (Giles 2010 single-precision approximation), for test quantiles. */
function inverseErf(x: number): number {
  let w = -Math.log((1 - x) * (1 + x)), p: number;
  if (w < 5) {
    w -= 2.5;
    p = 2.81022636e-8; p = 3.43273939e-7 + p * w; p = -3.5233877e-6 + p * w; p = -4.39150654e-6 + p * w; p = 0.00021858087 + p * w;
    p = -0.00125372503 + p * w; p = -0.00417768164 + p * w; p = 0.246640727 + p * w; p = 1.50140941 + p * w;
  } else {
    w = Math.sqrt(w) - 3;
    p = -0.000200214257; p = 0.000100950558 + p * w; p = 0.00134934322 + p * w; p = -0.00367342844 + p * w; p = 0.00573950773 + p * w;
    p = -0.0076224613 + p * w; p = 0.00943887047 + p * w; p = 1.00167406 + p * w; p = 2.83297682 + p * w;
  }
  return p * x;
}
