import { fail, ok, type CellParams, type InputLocation, type ReflectionTable, type Result } from '../core';

/**
 * Unit-cell geometry. Lengths in angstrom, angles in degrees at every interface.
 *
 * Orthogonalisation (the one convention of the project, see DEVELOPERS.md):
 * a along x, b in the xy plane, c* along z. `orth` maps fractional to Cartesian
 * coordinates, x_cart = orth . x_frac; its columns are the vectors a, b, c.
 * The rows of its inverse `frac` are the reciprocal vectors a*, b*, c*, so a
 * reflection h = (h,k,l) sits at the Cartesian point h . frac = h a* + k b* + l c*.
 * Formulas: International Tables Vol. B, section 1.1.3 (reciprocal cell) and
 * Giacovazzo et al., Fundamentals of Crystallography, ch. 2 (metric tensors).
 */
export class UnitCell implements CellParams {
  readonly a: number;
  readonly b: number;
  readonly c: number;
  readonly alpha: number;
  readonly beta: number;
  readonly gamma: number;
  /** Cell volume in cubic angstrom. */
  readonly volume: number;
  /** Reciprocal cell: lengths in 1/angstrom, angles in degrees. */
  readonly reciprocal: CellParams;
  /** Direct metric tensor G (3x3, row-major): G_ij = a_i . a_j. */
  readonly metric: Float64Array;
  /** Reciprocal metric tensor G* = G^-1 (row-major); 1/d^2 = h G* h^T. */
  readonly reciprocalMetric: Float64Array;
  /** Fractional -> Cartesian (row-major 3x3); columns a, b, c. */
  readonly orth: Float64Array;
  /** Cartesian -> fractional (row-major 3x3); rows a*, b*, c*. */
  readonly frac: Float64Array;

  /** Use makeCell, which checks the parameters. */
  constructor(p: CellParams) {
    this.a = p.a; this.b = p.b; this.c = p.c;
    this.alpha = p.alpha; this.beta = p.beta; this.gamma = p.gamma;
    const ca = cosDeg(p.alpha), cb = cosDeg(p.beta), cg = cosDeg(p.gamma);
    const sa = sinDeg(p.alpha), sb = sinDeg(p.beta), sg = sinDeg(p.gamma);
    const root = Math.sqrt(1 - ca * ca - cb * cb - cg * cg + 2 * ca * cb * cg);
    const V = p.a * p.b * p.c * root;
    this.volume = V;
    const as = (p.b * p.c * sa) / V, bs = (p.a * p.c * sb) / V, cs = (p.a * p.b * sg) / V;
    const cas = (cb * cg - ca) / (sb * sg), cbs = (ca * cg - cb) / (sa * sg), cgs = (ca * cb - cg) / (sa * sb);
    this.reciprocal = { a: as, b: bs, c: cs, alpha: acosDeg(cas), beta: acosDeg(cbs), gamma: acosDeg(cgs) };
    this.metric = Float64Array.of(
      p.a * p.a, p.a * p.b * cg, p.a * p.c * cb,
      p.a * p.b * cg, p.b * p.b, p.b * p.c * ca,
      p.a * p.c * cb, p.b * p.c * ca, p.c * p.c,
    );
    this.reciprocalMetric = Float64Array.of(
      as * as, as * bs * cgs, as * cs * cbs,
      as * bs * cgs, bs * bs, bs * cs * cas,
      as * cs * cbs, bs * cs * cas, cs * cs,
    );
    // columns a = (a,0,0), b = (b cos g, b sin g, 0), c = (c cos b, c (cos a - cos b cos g)/sin g, V/(a b sin g))
    const cx = p.c * cb, cy = (p.c * (ca - cb * cg)) / sg, cz = V / (p.a * p.b * sg);
    this.orth = Float64Array.of(p.a, p.b * cg, cx, 0, p.b * sg, cy, 0, 0, cz);
    // inverse of the upper-triangular orth
    const m00 = 1 / p.a, m11 = 1 / (p.b * sg), m22 = 1 / cz;
    const m01 = -(p.b * cg) * m00 * m11;
    const m12 = -cy * m11 * m22;
    const m02 = (p.b * cg * cy - cx * p.b * sg) * m00 * m11 * m22;
    this.frac = Float64Array.of(m00, m01, m02, 0, m11, m12, 0, 0, m22);
  }

  /** The direct-cell parameters as a plain object. */
  params(): CellParams {
    return { a: this.a, b: this.b, c: this.c, alpha: this.alpha, beta: this.beta, gamma: this.gamma };
  }
  /** 1/d^2 = h G* h^T in 1/angstrom^2. */
  invDSquared(h: number, k: number, l: number): number {
    const g = this.reciprocalMetric;
    return g[0] * h * h + g[4] * k * k + g[8] * l * l + 2 * (g[1] * h * k + g[2] * h * l + g[5] * k * l);
  }
  /** Interplanar spacing d(hkl) in angstrom (Infinity for 0 0 0). */
  dSpacing(h: number, k: number, l: number): number {
    return 1 / Math.sqrt(this.invDSquared(h, k, l));
  }
  /** sin(theta)/lambda = 1/(2d), in 1/angstrom. */
  stol(h: number, k: number, l: number): number {
    return 0.5 * Math.sqrt(this.invDSquared(h, k, l));
  }
  /** Bragg angle 2-theta in degrees for wavelength lambda (angstrom); NaN beyond the limiting sphere. */
  twoTheta(h: number, k: number, l: number, lambda: number): number {
    const s = lambda * this.stol(h, k, l);
    return s > 1 ? NaN : (2 * Math.asin(s) * 180) / Math.PI;
  }
  /** Cartesian coordinates (1/angstrom) of reciprocal-lattice point h, written into out. */
  reciprocalPoint(h: number, k: number, l: number, out: Float64Array | number[] = new Float64Array(3)): Float64Array | number[] {
    const f = this.frac;
    out[0] = h * f[0] + k * f[3] + l * f[6];
    out[1] = h * f[1] + k * f[4] + l * f[7];
    out[2] = h * f[2] + k * f[5] + l * f[8];
    return out;
  }
  /** The reciprocal basis vector a* (i = 0), b* (1) or c* (2) in Cartesian coordinates, 1/angstrom. */
  reciprocalBasis(i: 0 | 1 | 2): [number, number, number] {
    const f = this.frac;
    return [f[3 * i], f[3 * i + 1], f[3 * i + 2]];
  }
  /** The direct basis vector a (0), b (1) or c (2) in Cartesian coordinates, angstrom. */
  directBasis(i: 0 | 1 | 2): [number, number, number] {
    const o = this.orth;
    return [o[i], o[3 + i], o[6 + i]];
  }
}

/** Exact values at the common angles keep 90-degree cells free of 6e-17 residues. */
function cosDeg(x: number): number {
  if (x === 90) return 0;
  if (x === 60) return 0.5;
  if (x === 120) return -0.5;
  return Math.cos((x * Math.PI) / 180);
}
function sinDeg(x: number): number {
  if (x === 90) return 1;
  return Math.sin((x * Math.PI) / 180);
}
function acosDeg(c: number): number {
  if (c === 0) return 90;
  return (Math.acos(Math.max(-1, Math.min(1, c))) * 180) / Math.PI;
}

/** Below this, V/(abc) means a flat cell: angles within ~0.01 degree of coplanar. */
const MIN_VOLUME_FRACTION = 1e-4;

/**
 * Check cell parameters and build the cell. Errors (as values) for: a missing or
 * non-finite parameter, a non-positive length, an angle outside (0, 180), and
 * angles that cannot close a cell (zero or imaginary volume).
 */
export function makeCell(p: CellParams, where: InputLocation = {}): Result<UnitCell> {
  const names = ['a', 'b', 'c', 'alpha', 'beta', 'gamma'] as const;
  for (const n of names) {
    const v = p[n];
    if (typeof v !== 'number' || !Number.isFinite(v)) return fail(`cell parameter ${n} is not a finite number (${String(v)})`, where);
  }
  for (const n of ['a', 'b', 'c'] as const)
    if (p[n] <= 0) return fail(`cell length ${n} = ${p[n]} must be positive (angstrom)`, where);
  for (const n of ['alpha', 'beta', 'gamma'] as const)
    if (p[n] <= 0 || p[n] >= 180) return fail(`cell angle ${n} = ${p[n]} must lie strictly between 0 and 180 degrees`, where);
  const ca = cosDeg(p.alpha), cb = cosDeg(p.beta), cg = cosDeg(p.gamma);
  const q = 1 - ca * ca - cb * cb - cg * cg + 2 * ca * cb * cg;
  if (!(q > MIN_VOLUME_FRACTION * MIN_VOLUME_FRACTION))
    return fail(
      `cell angles ${p.alpha}, ${p.beta}, ${p.gamma} give ${q <= 0 ? 'an imaginary or zero' : 'an almost zero'} volume`,
      where,
      'Each angle must be smaller than the sum of the other two, and the three together less than 360 degrees.',
    );
  return ok(new UnitCell(p));
}

/**
 * Parse `a,b,c,alpha,beta,gamma` (commas or spaces) as given to `--cell`.
 * `label` names the source in errors, e.g. '--cell'.
 */
export function parseCellText(text: string, label: string): Result<UnitCell> {
  const parts = text.trim().split(/[\s,]+/).filter((s) => s !== '');
  if (parts.length !== 6) return fail(`${label} needs six numbers a,b,c,alpha,beta,gamma (angstrom, degrees); got ${parts.length}: '${text}'`, {});
  const v = parts.map(Number);
  const bad = parts.findIndex((s, j) => !Number.isFinite(v[j]) || s === '');
  if (bad >= 0) return fail(`${label}: '${parts[bad]}' is not a number`, {});
  const r = makeCell({ a: v[0], b: v[1], c: v[2], alpha: v[3], beta: v[4], gamma: v[5] });
  if (!r.ok) return fail(`${label}: ${r.error.message}`, {}, r.error.hint);
  return r;
}

/**
 * (sin(theta)/lambda)^2 for every reflection of a table, written into `out`
 * (allocated when not given or too short). No allocation in the loop.
 */
export function stolSquaredColumn(cell: UnitCell, table: ReflectionTable, out?: Float64Array): Float64Array {
  const n = table.n;
  const res = out && out.length >= n ? out : new Float64Array(n);
  const g = cell.reciprocalMetric;
  const g00 = 0.25 * g[0], g11 = 0.25 * g[4], g22 = 0.25 * g[8];
  const g01 = 0.5 * g[1], g02 = 0.5 * g[2], g12 = 0.5 * g[5];
  const H = table.h, K = table.k, L = table.l;
  for (let j = 0; j < n; j++) {
    const h = H[j], k = K[j], l = L[j];
    res[j] = g00 * h * h + g11 * k * k + g22 * l * l + g01 * h * k + g02 * h * l + g12 * k * l;
  }
  return res;
}
