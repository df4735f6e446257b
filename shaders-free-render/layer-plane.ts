/**
 * Layers of the reciprocal lattice: the nodes h with u h + v k + w l = n.
 * A layer is described by integer index vectors: one node on it (`origin`)
 * and two vectors `e1`, `e2` that step from node to node and together reach
 * every node of the layer (a basis of the 2D lattice). Pure integer work.
 */
export type Hkl = readonly [number, number, number];

export interface LayerPlane {
  readonly u: number;
  readonly v: number;
  readonly w: number;
  readonly n: number;
  /** Short name, e.g. 'hk0', 'hhl' or '1,1,0 = 2'. */
  readonly name: string;
  readonly origin: Hkl;
  readonly e1: Hkl;
  readonly e2: Hkl;
  /** What the two in-layer directions are called on the map, e.g. ['h', 'k']. */
  readonly axisLabels: readonly [string, string];
}

export const LAYER_PRESETS = ['hk0', 'h0l', '0kl', 'hk1', 'h1l', '1kl', 'hhl'] as const;

function gcd(a: number, b: number): number {
  a = Math.abs(a); b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

function cross(a: Hkl, b: Hkl): Hkl {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

const AXIS_NAMES = ['h', 'k', 'l'];

function labelFor(e: Hkl): string {
  const nz = [0, 1, 2].filter((j) => e[j] !== 0);
  if (nz.length === 1 && e[nz[0]] === 1) return AXIS_NAMES[nz[0]];
  if (nz.length === 2 && e[nz[0]] === 1 && e[nz[1]] === 1 && nz[0] === 0 && nz[1] === 1) return 'hh';
  return `[${e.join(' ')}]`;
}

/**
 * The layer u h + v k + w l = n, or an error message (as a value) when
 * (u,v,w) is zero or n is not a multiple of gcd(u,v,w) (no node lies on it).
 * The basis is chosen short: e1 along the first index axis lying in the
 * layer when there is one.
 */
export function makeLayerPlane(u: number, v: number, w: number, n: number, name?: string): LayerPlane | string {
  if (![u, v, w, n].every(Number.isInteger)) return 'layer coefficients must be integers';
  if (u === 0 && v === 0 && w === 0) return 'the layer needs a non-zero normal (u, v, w)';
  const g = gcd(gcd(u, v), w);
  if (n % g !== 0) return `no reciprocal-lattice node lies on ${u}h ${sign(v)}k ${sign(w)}l = ${n}: ${n} is not a multiple of ${g}`;
  const normal: Hkl = [u / g, v / g, w / g];
  // Kernel vectors with small entries, shortest in index length first.
  const R = 6;
  const cands: Hkl[] = [];
  for (let a = -R; a <= R; a++) for (let b = -R; b <= R; b++) for (let c = -R; c <= R; c++) {
    if ((a || b || c) && u * a + v * b + w * c === 0) cands.push([a, b, c]);
  }
  const score = (e: Hkl) => e[0] * e[0] + e[1] * e[1] + e[2] * e[2] - (e[0] > 0 ? 0.1 : 0) - (e[1] > 0 ? 0.05 : 0) - (e[2] > 0 ? 0.02 : 0) + (e[0] < 0 || (e[0] === 0 && e[1] < 0) || (e[0] === 0 && e[1] === 0 && e[2] < 0) ? 0.5 : 0);
  cands.sort((p, q) => score(p) - score(q));
  const e1 = cands[0];
  let e2: Hkl | undefined;
  for (const c of cands) {
    const x = cross(e1, c);
    if (x[0] === normal[0] && x[1] === normal[1] && x[2] === normal[2]) { e2 = c; break; }
  }
  if (!e2) for (const c of cands) {
    const x = cross(e1, c);
    if (x[0] === -normal[0] && x[1] === -normal[1] && x[2] === -normal[2]) { e2 = c; break; }
  }
  if (!e2) return 'could not find a basis for this layer (coefficients too large)';
  // One node on the layer, smallest first.
  let origin: Hkl | undefined;
  const S = Math.max(6, Math.abs(n) + 2);
  search: for (let r = 0; r <= S; r++) {
    for (let a = -r; a <= r; a++) for (let b = -r; b <= r; b++) for (let c = -r; c <= r; c++) {
      if (Math.max(Math.abs(a), Math.abs(b), Math.abs(c)) !== r) continue;
      if (u * a + v * b + w * c === n) { origin = [a, b, c]; break search; }
    }
  }
  if (!origin) return 'could not find a node on this layer (coefficients too large)';
  return { u, v, w, n, name: name ?? `${u},${v},${w} = ${n}`, origin, e1, e2, axisLabels: [labelFor(e1), labelFor(e2)] };
}

function sign(x: number): string {
  return x < 0 ? `- ${-x}` : `+ ${x}`;
}

/**
 * Parses a layer name: presets like 'hk0', 'h0l', '0kl', 'hk1', 'h1l', '1kl',
 * any 'hkN' / 'hNl' / 'Nkl' with an integer N (e.g. 'hk-2'), 'hhl', or the
 * free form 'u,v,w,n' meaning u h + v k + w l = n (spaces also separate).
 */
export function parseLayerPlane(text: string): LayerPlane | string {
  const s = text.trim().replace(/\s+/g, ' ');
  if (s === 'hhl') {
    return { u: 1, v: -1, w: 0, n: 0, name: 'hhl', origin: [0, 0, 0], e1: [1, 1, 0], e2: [0, 0, 1], axisLabels: ['hh', 'l'] };
  }
  let m = /^hk(-?\d+)$/.exec(s);
  if (m) return fixed(2, Number(m[1]), s);
  m = /^h(-?\d+)l$/.exec(s);
  if (m) return fixed(1, Number(m[1]), s);
  m = /^(-?\d+)kl$/.exec(s);
  if (m) return fixed(0, Number(m[1]), s);
  const parts = s.split(/[ ,;=]+/).filter(Boolean);
  if (parts.length === 4 && parts.every((p) => /^-?\d+$/.test(p))) {
    const [u, v, w, n] = parts.map(Number);
    return makeLayerPlane(u, v, w, n);
  }
  return `unknown layer '${text}': use a preset (${LAYER_PRESETS.join(', ')}), a form like hk2 or h-1l, or four integers u,v,w,n for u h + v k + w l = n`;
}

/** Layers with one index fixed: axis 0 (h), 1 (k) or 2 (l) equal to n. */
function fixed(axis: number, n: number, name: string): LayerPlane {
  const normal = [0, 0, 0];
  normal[axis] = 1;
  const origin: [number, number, number] = [0, 0, 0];
  origin[axis] = n;
  const free = [0, 1, 2].filter((j) => j !== axis);
  const e1: [number, number, number] = [0, 0, 0];
  const e2: [number, number, number] = [0, 0, 0];
  e1[free[0]] = 1;
  e2[free[1]] = 1;
  return { u: normal[0], v: normal[1], w: normal[2], n, name, origin, e1, e2, axisLabels: [AXIS_NAMES[free[0]], AXIS_NAMES[free[1]]] };
}

/** True when reflection (h,k,l) lies on the layer. */
export function onLayer(p: LayerPlane, h: number, k: number, l: number): boolean {
  return p.u * h + p.v * k + p.w * l === p.n;
}

/**
 * Integer coordinates (i, j) of a node on the layer: node = origin + i e1 + j e2.
 * Solved exactly with the cross products of the basis; `out` gets [i, j].
 */
export function layerCoords(p: LayerPlane, h: number, k: number, l: number, out: number[]): void {
  const d: Hkl = [h - p.origin[0], k - p.origin[1], l - p.origin[2]];
  const nrm = cross(p.e1, p.e2);
  const nn = nrm[0] * nrm[0] + nrm[1] * nrm[1] + nrm[2] * nrm[2];
  const c2 = cross(d, p.e2), c1 = cross(p.e1, d);
  out[0] = Math.round((c2[0] * nrm[0] + c2[1] * nrm[1] + c2[2] * nrm[2]) / nn);
  out[1] = Math.round((c1[0] * nrm[0] + c1[1] * nrm[1] + c1[2] * nrm[2]) / nn);
}
