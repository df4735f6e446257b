import { clamp } from './special-functions';

/**
 * Centric against acentric, allowing for a centrosymmetric substructure.
 *
 * A heavy-atom (or any) substructure that is centrosymmetric by itself makes an acentric
 * structure look centric; in polar groups a single orbit always is. Write E = x + a with x
 * real (the centric part, variance q) and a complex (the rest, variance 1 - q). Then
 * E^2 = u^2 + v^2 with u ~ N(0, (1+q)/2), v ~ N(0, (1-q)/2), whose density is
 *   p_q(z) = exp(-z/(2 alpha)) I0(z (alpha - beta)/(4 alpha beta)) / (2 sqrt(alpha beta)),
 *   alpha = (1+q)/2, beta = (1-q)/2
 * (the sum of two scaled chi-square variables with one degree of freedom, derived directly
 * from the two independent normal components); q = 0 is Wilson's acentric distribution,
 * q = 1 the centric one (Wilson 1949, Acta Cryst. 2, 318-321).
 * Centrosymmetric candidates are q = 1; non-centrosymmetric ones any q in [0, 0.9], uniform.
 * Each observed z is compared with p_q blurred by its measurement error.
 */

/** exp(-x) I0(x) for x >= 0 (Abramowitz & Stegun 9.8.1-9.8.2). */
function i0e(x: number): number {
  if (x < 3.75) {
    const t = (x / 3.75) ** 2;
    return Math.exp(-x) * (1 + t * (3.5156229 + t * (3.0899424 + t * (1.2067492 + t * (0.2659732 + t * (0.0360768 + t * 0.0045813))))));
  }
  const t = 3.75 / x;
  return (0.39894228 + t * (0.01328592 + t * (0.00225319 + t * (-0.00157565 + t * (0.00916281 +
    t * (-0.02057706 + t * (0.02635537 + t * (-0.01647633 + t * 0.00392377)))))))) / Math.sqrt(x);
}

const W_N = 96;
const W_MAX = 4.6; // z up to 21
const Q_GRID = [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9];

/** Quadrature weights over w (z = w^2) for each q of Q_GRID and for q = 1, normalised. */
function densities(): { w2: Float64Array; d: Float64Array[] } {
  const dw = W_MAX / W_N;
  const w2 = new Float64Array(W_N);
  for (let i = 0; i < W_N; i++) { const w = (i + 0.5) * dw; w2[i] = w * w; }
  const make = (f: (w: number) => number) => {
    const d = new Float64Array(W_N);
    let s = 0;
    for (let i = 0; i < W_N; i++) { d[i] = f((i + 0.5) * dw) * dw; s += d[i]; }
    for (let i = 0; i < W_N; i++) d[i] /= s;
    return d;
  };
  const d = Q_GRID.map((q) => {
    const a = (1 + q) / 2, b = (1 - q) / 2;
    return make((w) => {
      const z = w * w;
      return (i0e((z * (a - b)) / (4 * a * b)) * Math.exp(-z / (2 * a)) / (2 * Math.sqrt(a * b))) * 2 * w;
    });
  });
  // centric: exp(-z/2)/sqrt(2 pi z) dz = 2 exp(-w^2/2)/sqrt(2 pi) dw
  d.push(make((w) => (2 * Math.exp(-0.5 * w * w)) / Math.sqrt(2 * Math.PI)));
  return { w2, d };
}

let DENS: ReturnType<typeof densities> | undefined;

export interface CentricEvidence {
  /** Reflections used. */
  readonly n: number;
  /** log L(centric) - log mean over q of L(acentric, q), nats, untempered. */
  readonly logOdds: number;
  /** The q of the best-fitting non-centrosymmetric model. */
  readonly bestQ: number;
}

/**
 * Evidence from normalised intensities e2 with uncertainties sE over the rows with use[j],
 * at most `maxRows` of them (evenly sampled). Measurement errors below 0.03 on the E^2
 * scale are raised to 0.03 (model error; common practice).
 */
export function centricEvidence(e2: Float64Array, sE: Float64Array, use: Uint8Array, maxRows = 3000): CentricEvidence {
  DENS ??= densities();
  const { w2, d } = DENS;
  let total = 0;
  for (let j = 0; j < e2.length; j++) if (use[j]) total++;
  const stride = Math.max(1, Math.floor(total / maxRows));
  const logL = new Float64Array(d.length);
  const g = new Float64Array(W_N);
  let n = 0, seen = 0;
  for (let j = 0; j < e2.length; j++) {
    if (!use[j]) continue;
    if (seen++ % stride) continue;
    n++;
    const z = clamp(e2[j], -5, 30);
    const s = Math.max(sE[j], 0.03);
    const inv = 1 / s;
    for (let i = 0; i < W_N; i++) { const u = (z - w2[i]) * inv; g[i] = Math.exp(-0.5 * u * u) * inv; }
    for (let m = 0; m < d.length; m++) {
      const dm = d[m];
      let L = 0;
      for (let i = 0; i < W_N; i++) L += dm[i] * g[i];
      logL[m] += Math.log(L + 1e-300);
    }
  }
  const nq = Q_GRID.length;
  let best = -Infinity, bestQ = 0;
  for (let m = 0; m < nq; m++) if (logL[m] > best) { best = logL[m]; bestQ = Q_GRID[m]; }
  let s = 0;
  for (let m = 0; m < nq; m++) s += Math.exp(logL[m] - best);
  const logMeanAcentric = best + Math.log(s / nq);
  return { n, logOdds: n ? logL[nq] - logMeanAcentric : 0, bestQ };
}
