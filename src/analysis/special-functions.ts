/**
 * Small numerical helpers for the intensity statistics: the error function,
 * log of the normal cumulative distribution, normal densities. Double precision,
 * no allocation.
 */

const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/**
 * Complementary error function, |relative error| < 1.2e-7 everywhere
 * (Chebyshev fit of Press et al., Numerical Recipes, 2nd ed., section 6.2).
 */
export function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r = t * Math.exp(-z * z - 1.26551223 + t * (1.00002368 + t * (0.37409196 + t * (0.09678418 +
    t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 +
    t * (-0.82215223 + t * 0.17087277)))))))));
  return x >= 0 ? r : 2 - r;
}

export function erf(x: number): number {
  return 1 - erfc(x);
}

/** log of the standard normal cumulative distribution Phi(x), stable far into the lower tail. */
export function logNormalCdf(x: number): number {
  if (x > -5) return Math.log(0.5 * erfc(-x / Math.SQRT2));
  // asymptotic series: Phi(x) ~ phi(x)/|x| (1 - 1/x^2 + 3/x^4)
  const x2 = x * x;
  return -0.5 * x2 - LOG_SQRT_2PI - Math.log(-x) + Math.log(1 - 1 / x2 + 3 / (x2 * x2));
}

export function normalCdf(x: number): number {
  return 0.5 * erfc(-x / Math.SQRT2);
}

/** log of the normal density N(x; 0, s^2). */
export function logNormalPdf(x: number, s: number): number {
  const u = x / s;
  return -0.5 * u * u - Math.log(s) - LOG_SQRT_2PI;
}

/** Turn log weights into probabilities that sum to one. */
export function softmax(logw: readonly number[]): number[] {
  const m = Math.max(...logw);
  if (!Number.isFinite(m)) return logw.map(() => 1 / logw.length);
  const w = logw.map((x) => Math.exp(x - m));
  const s = w.reduce((a, b) => a + b, 0);
  return w.map((x) => x / s);
}

export function clamp(x: number, lo: number, hi: number): number {
  return x < lo ? lo : x > hi ? hi : x;
}
