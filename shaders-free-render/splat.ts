import type { RgbaImage } from './image';
import { createImage } from './image';

/**
 * The shader-free point renderer. Each point is projected with the camera's
 * view-projection matrix (the same column-major matrices three.js builds) and
 * splatted as a small stamp into an RGBA buffer; a depth buffer keeps the
 * nearest point on top, so the result is depth-ordered without sorting.
 * One pass over the columns, no allocation per frame.
 */

/** Marker shapes; the 3D view and the layer map use the same meanings. */
export const SHAPE_DISC = 0;
/** Forbidden by the selected rule and weak: hollow diamond. */
export const SHAPE_DIAMOND_HOLLOW = 1;
/** Forbidden but strong (a violation): filled diamond. */
export const SHAPE_DIAMOND = 2;
/** Highlighted (picked or in the selected zone): ring. */
export const SHAPE_RING = 3;
export const SHAPE_COUNT = 4;
export const MAX_RADIUS = 12;

export interface PointCloud {
  /** Number of points. */
  n: number;
  /** x, y, z per point (reciprocal-space Cartesian, 1/angstrom). */
  xyz: Float32Array;
  /** Packed colour per point (see image.rgba). */
  color: Uint32Array;
  /** Stamp radius in pixels per point (0 = one pixel), before the global scale. */
  radius: Uint8Array;
  /** Marker shape per point (SHAPE_*). */
  shape: Uint8Array;
  /** Optional: 1 = do not draw (filters). */
  hidden?: Uint8Array;
}

export interface DepthFrame {
  readonly image: RgbaImage;
  readonly depth: Float32Array;
}

export function createDepthFrame(width: number, height: number): DepthFrame {
  const image = createImage(width, height);
  return { image, depth: new Float32Array(image.width * image.height) };
}

interface Stamp {
  dx: Int8Array;
  dy: Int8Array;
  /** 1 where the pixel is on the rim (drawn darker, so touching spots stay apart). */
  rim: Uint8Array;
  r: number;
}

function makeStamp(shape: number, r: number): Stamp {
  const dx: number[] = [], dy: number[] = [], rim: number[] = [];
  for (let y = -r; y <= r; y++) {
    for (let x = -r; x <= r; x++) {
      let inside = false, edge = false;
      if (shape === SHAPE_DISC || shape === SHAPE_RING) {
        const d = Math.sqrt(x * x + y * y);
        inside = d <= r + 0.35;
        edge = d > r - 0.75;
        if (shape === SHAPE_RING && !edge) inside = false;
      } else {
        const d = Math.abs(x) + Math.abs(y);
        inside = d <= r;
        edge = d > r - 1;
        if (shape === SHAPE_DIAMOND_HOLLOW && !edge) inside = false;
      }
      if (!inside) continue;
      dx.push(x); dy.push(y);
      rim.push(r >= 2 && edge && shape === SHAPE_DISC ? 1 : 0);
    }
  }
  return { dx: Int8Array.from(dx), dy: Int8Array.from(dy), rim: Uint8Array.from(rim), r };
}

const STAMPS: Stamp[] = [];
for (let s = 0; s < SHAPE_COUNT; s++) for (let r = 0; r <= MAX_RADIUS; r++) STAMPS.push(makeStamp(s, r));

/** Offsets of one stamp for a given row width, cached per width. */
const offsetCache = new Map<number, Int32Array[]>();
function offsetsFor(width: number): Int32Array[] {
  let o = offsetCache.get(width);
  if (!o) {
    o = STAMPS.map((s) => Int32Array.from(s.dx, (x, j) => s.dy[j] * width + x));
    offsetCache.set(width, o);
  }
  return o;
}

/** Clears colour to `background` and depth to "far". */
export function clearFrame(frame: DepthFrame, background: number): void {
  frame.image.pixels.fill(background);
  frame.depth.fill(Infinity);
}

/**
 * Splats every visible point. `radiusScale` multiplies each point's radius
 * (the view shrinks stamps for large data sets). Returns the number of
 * points that landed in the frame.
 */
export function splatPoints(frame: DepthFrame, cloud: PointCloud, viewProj: ArrayLike<number>, radiusScale = 1): number {
  const { width: W, height: H, pixels } = frame.image;
  const depth = frame.depth;
  const offs = offsetsFor(W);
  const m0 = viewProj[0], m1 = viewProj[1], m2 = viewProj[2], m3 = viewProj[3];
  const m4 = viewProj[4], m5 = viewProj[5], m6 = viewProj[6], m7 = viewProj[7];
  const m8 = viewProj[8], m9 = viewProj[9], m10 = viewProj[10], m11 = viewProj[11];
  const m12 = viewProj[12], m13 = viewProj[13], m14 = viewProj[14], m15 = viewProj[15];
  const hw = W * 0.5, hh = H * 0.5;
  // Pixel coordinates folded into the matrix: px = (P . [x y z 1]) / w, py = (Q . [x y z 1]) / w.
  const p0 = hw * (m0 + m3), p4 = hw * (m4 + m7), p8 = hw * (m8 + m11), p12 = hw * (m12 + m15);
  const q0 = hh * (m3 - m1), q4 = hh * (m7 - m5), q8 = hh * (m11 - m9), q12 = hh * (m15 - m13);
  const { xyz, color, radius, shape, hidden } = cloud;
  const n = cloud.n;
  // Radius after scaling, looked up rather than computed per point.
  const rmap = new Uint8Array(256);
  for (let r = 0; r < 256; r++) rmap[r] = Math.min(MAX_RADIUS, Math.round(r * radiusScale));
  let drawn = 0;
  for (let i = 0; i < n; i++) {
    if (hidden !== undefined && hidden[i] !== 0) continue;
    const j = i * 3;
    const x = xyz[j], y = xyz[j + 1], z = xyz[j + 2];
    const w = m3 * x + m7 * y + m11 * z + m15;
    if (w <= 0) continue;
    const iw = 1 / w;
    const px = (p0 * x + p4 * y + p8 * z + p12) * iw;
    const py = (q0 * x + q4 * y + q8 * z + q12) * iw;
    const r = rmap[radius[i]];
    if (r === 0) {
      // One pixel: the common case for large data sets, kept short.
      if (px < 0 || py < 0 || px >= W || py >= H) continue;
      const nz = (m2 * x + m6 * y + m10 * z + m14) * iw;
      if (nz < -1 || nz > 1) continue;
      const p = (py | 0) * W + (px | 0);
      if (nz < depth[p]) { depth[p] = nz; pixels[p] = color[i]; }
      drawn++;
      continue;
    }
    if (px < -r || py < -r || px >= W + r || py >= H + r) continue;
    const nz = (m2 * x + m6 * y + m10 * z + m14) * iw;
    if (nz < -1 || nz > 1) continue;
    const ix = Math.floor(px), iy = Math.floor(py);
    const sIndex = shape[i] * (MAX_RADIUS + 1) + r;
    const off = offs[sIndex];
    const rim = STAMPS[sIndex].rim;
    const c = color[i];
    // Darker rim colour: halve each channel, keep alpha.
    const cr = ((c >>> 1) & 0x007f7f7f) | (c & 0xff000000);
    drawn++;
    const base = iy * W + ix;
    if (ix >= r && iy >= r && ix < W - r && iy < H - r) {
      for (let s = 0; s < off.length; s++) {
        const p = base + off[s];
        if (nz < depth[p]) { depth[p] = nz; pixels[p] = rim[s] ? cr : c; }
      }
    } else {
      const st = STAMPS[sIndex];
      for (let s = 0; s < off.length; s++) {
        const qx = ix + st.dx[s], qy = iy + st.dy[s];
        if (qx < 0 || qy < 0 || qx >= W || qy >= H) continue;
        const p = qy * W + qx;
        if (nz < depth[p]) { depth[p] = nz; pixels[p] = rim[s] ? cr : c; }
      }
    }
  }
  return drawn;
}

/**
 * The point under pixel (px, py): among points whose projected centre lies
 * within their stamp radius plus `slack` pixels, the nearest to the camera.
 * Returns -1 when there is none. Used by both renderers for clicks.
 */
export function pickPoint(cloud: PointCloud, viewProj: ArrayLike<number>, width: number, height: number, px: number, py: number, radiusScale = 1, slack = 3): number {
  const m = viewProj;
  let best = -1, bestZ = Infinity, bestD = Infinity;
  for (let i = 0; i < cloud.n; i++) {
    if (cloud.hidden !== undefined && cloud.hidden[i] !== 0) continue;
    const x = cloud.xyz[3 * i], y = cloud.xyz[3 * i + 1], z = cloud.xyz[3 * i + 2];
    const w = m[3] * x + m[7] * y + m[11] * z + m[15];
    if (w <= 0) continue;
    const nz = (m[2] * x + m[6] * y + m[10] * z + m[14]) / w;
    if (nz < -1 || nz > 1) continue;
    const sx = ((m[0] * x + m[4] * y + m[8] * z + m[12]) / w + 1) * 0.5 * width;
    const sy = (1 - (m[1] * x + m[5] * y + m[9] * z + m[13]) / w) * 0.5 * height;
    const d = Math.hypot(sx - px, sy - py);
    const reach = Math.min(MAX_RADIUS, Math.round(cloud.radius[i] * radiusScale)) + slack;
    if (d > reach) continue;
    // Nearer to the camera wins; among equals, nearer to the pointer.
    if (nz < bestZ - 1e-6 || (Math.abs(nz - bestZ) <= 1e-6 && d < bestD)) { best = i; bestZ = nz; bestD = d; }
  }
  return best;
}
