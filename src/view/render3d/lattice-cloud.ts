import { scaleLog, scaleSqrt } from 'd3-scale';
import {
  INTENSITY_LUT, MARK, SHAPE_DIAMOND, SHAPE_DIAMOND_HOLLOW, SHAPE_DISC, STRONG_I_OVER_SIGMA, type PointCloud,
} from '../../../shaders-free-render';
import type { Dataset } from '../dataset';
import { anyRuleForbids, inZone, type Rule } from '../rules';

export type ColourMode = 'intensity' | 'isigma';

export interface CloudStyle {
  colour: ColourMode;
  /** Rules whose forbidden reflections get the diamond marks (selected candidate or condition). */
  rules: readonly Rule[];
  /** When set, reflections outside this rule's zone are dimmed. */
  zone?: Rule;
  /** Resolution filter: reflections with d below this (angstrom) are hidden. 0 = none. */
  dMin: number;
  /** Hide allowed reflections weaker than this I/sigma (forbidden ones stay: they are the evidence). Undefined = none. */
  minIOverSigma?: number;
}

export interface CloudStats {
  forbidden: number;
  violations: number;
  hidden: number;
}

function percentile(values: Float32Array, q: number, positiveOnly: boolean): number {
  const step = Math.max(1, Math.floor(values.length / 20000));
  const s: number[] = [];
  for (let j = 0; j < values.length; j += step) { const v = values[j]; if (Number.isFinite(v) && (!positiveOnly || v > 0)) s.push(v); }
  if (s.length === 0) return 1;
  s.sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(q * s.length))];
}

/** Stamp radii by data-set size: big sets get small stamps so rows stay readable. */
function radiusRange(n: number): [number, number] {
  if (n <= 3000) return [1, 6];
  if (n <= 60000) return [1, 3];
  return [0, 2];
}

/**
 * Fills (or reuses) a point cloud from the data set and the chosen style.
 * Colour on the project's perceptually ordered palette through a d3 scale:
 * square root of I, or log of I/sigma.
 */
export function buildCloud(ds: Dataset, style: CloudStyle, reuse?: PointCloud): { cloud: PointCloud; stats: CloudStats } {
  const n = ds.table.n;
  const cloud: PointCloud = reuse && reuse.n === n && reuse.xyz === ds.xyz ? reuse : {
    n, xyz: ds.xyz, color: new Uint32Array(n), radius: new Uint8Array(n), shape: new Uint8Array(n),
  };
  // The mask is kept only while something is hidden: the splat loop then skips one test per point.
  const mask = cloud.hidden ?? new Uint8Array(n);
  const { h, k, l, i } = ds.table;
  const ios = ds.iOverSigma;
  const toT = style.colour === 'intensity'
    ? scaleSqrt().domain([0, percentile(i, 0.98, true)]).range([0, 1]).clamp(true)
    : scaleLog().domain([1, Math.max(2, percentile(ios, 0.98, true))]).range([0, 1]).clamp(true);
  const values = style.colour === 'intensity' ? i : ios;
  const [r0, r1] = radiusRange(n);
  const qLimit = style.dMin > 0 ? 1 / style.dMin : Infinity;
  const rules = style.rules, zone = style.zone;
  const dimMix = (c: number) => {
    // 25% of the colour over the background.
    const bg = MARK.background;
    const mix = (s: number) => Math.round(((c >>> s) & 255) * 0.25 + ((bg >>> s) & 255) * 0.75) << s;
    return (mix(0) | mix(8) | mix(16) | 0xff000000) >>> 0;
  };
  let forbidden = 0, violations = 0, hidden = 0;
  for (let r = 0; r < n; r++) {
    const v = values[r];
    const t = v > 0 && Number.isFinite(v) ? toT(v) : 0;
    let col = INTENSITY_LUT[Math.round((0.08 + 0.92 * t) * 255)];
    let rad = Math.round(r0 + (r1 - r0) * t);
    let shape = SHAPE_DISC;
    const hh = h[r], kk = k[r], ll = l[r];
    if (rules.length > 0 && anyRuleForbids(rules, hh, kk, ll)) {
      forbidden++;
      if (ios[r] >= STRONG_I_OVER_SIGMA) {
        violations++;
        shape = SHAPE_DIAMOND; col = MARK.violator; rad = Math.max(rad, r1) + 1;
      } else {
        shape = SHAPE_DIAMOND_HOLLOW; col = MARK.forbidden; rad = Math.max(rad, Math.max(2, r1 - 1));
      }
    } else if (zone && !inZone(zone, hh, kk, ll)) {
      col = dimMix(col); rad = Math.min(rad, 1);
    }
    cloud.color[r] = col;
    cloud.radius[r] = rad;
    cloud.shape[r] = shape;
    const weak = style.minIOverSigma !== undefined && shape === SHAPE_DISC && !(ios[r] >= style.minIOverSigma);
    const hide = ds.dstar[r] > qLimit || weak ? 1 : 0;
    mask[r] = hide;
    hidden += hide;
  }
  cloud.hidden = hidden > 0 ? mask : undefined;
  return { cloud, stats: { forbidden, violations, hidden } };
}
