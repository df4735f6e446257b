import { clipLine, createImage, drawDiamond, drawLine, fillCircle, fillHalfCircle, fillImage, fillRect, strokeCircle, strokeRect, type RgbaImage } from './image';
import { drawText, measureText, textHeight } from './font';
import { INTENSITY_LUT, MARK, paletteColor } from './palette';
import { onLayer, type LayerPlane } from './layer-plane';

/**
 * Draws one reciprocal-lattice layer in true geometry: the in-layer axes
 * are the Cartesian directions of the layer's basis vectors (so an oblique
 * cell gives an oblique grid), distances in 1/angstrom times `view.scale`.
 * The same function makes the picture in the page and in `lacuna layer`.
 */
export interface LayerColumns {
  readonly n: number;
  readonly h: ArrayLike<number>;
  readonly k: ArrayLike<number>;
  readonly l: ArrayLike<number>;
  readonly i: ArrayLike<number>;
  readonly sigma?: ArrayLike<number>;
}

/** Zoom and pan: in-layer coordinates (1/angstrom) at the picture centre, pixels per 1/angstrom. */
export interface LayerView {
  cx: number;
  cy: number;
  scale: number;
}

export interface LayerMapOptions {
  readonly width: number;
  readonly height: number;
  readonly plane: LayerPlane;
  /** a*, b*, c* as three Cartesian rows (1/angstrom), row-major 3x3. */
  readonly recip: ArrayLike<number>;
  readonly data: LayerColumns;
  /** Calculated intensities of a trial model; drawn as the right half of each spot. */
  readonly calc?: LayerColumns;
  /** Nodes the selected rule forbids (marked even where nothing was measured). */
  readonly forbidden?: (h: number, k: number, l: number) => boolean;
  /** Text of the selected rule, shown in the legend, e.g. 'h0l: l = 2n'. */
  readonly ruleText?: string;
  readonly title?: string;
  readonly view?: LayerView;
  /** Integer pixel scale of text (1 = 5x7 font). */
  readonly textScale?: number;
  readonly legend?: boolean;
  /** Reflections with d below this (angstrom) are left out. */
  readonly dMin?: number;
}

export interface LayerMapResult {
  readonly image: RgbaImage;
  readonly view: LayerView;
  /** Screen position and table row of every spot drawn (for hover). */
  readonly spotX: Float32Array;
  readonly spotY: Float32Array;
  readonly spotRow: Int32Array;
  readonly spotCount: number;
  /** Forbidden nodes marked and, of them, those measured with I/sigma >= 3. */
  readonly forbiddenMarked: number;
  readonly violations: number;
}

/** I/sigma at which a forbidden reflection counts as clearly observed (common practice). */
export const STRONG_I_OVER_SIGMA = 3;

interface Frame2D {
  /** Unit in-layer axes (Cartesian). */
  xh: [number, number, number];
  yh: [number, number, number];
  recip: ArrayLike<number>;
}

function cart(recip: ArrayLike<number>, h: number, k: number, l: number, out: number[]): void {
  out[0] = h * recip[0] + k * recip[3] + l * recip[6];
  out[1] = h * recip[1] + k * recip[4] + l * recip[7];
  out[2] = h * recip[2] + k * recip[5] + l * recip[8];
}

function makeFrame(plane: LayerPlane, recip: ArrayLike<number>): Frame2D {
  const a: number[] = [0, 0, 0], b: number[] = [0, 0, 0];
  cart(recip, plane.e1[0], plane.e1[1], plane.e1[2], a);
  cart(recip, plane.e2[0], plane.e2[1], plane.e2[2], b);
  const la = Math.hypot(a[0], a[1], a[2]) || 1;
  const xh: [number, number, number] = [a[0] / la, a[1] / la, a[2] / la];
  const d = b[0] * xh[0] + b[1] * xh[1] + b[2] * xh[2];
  const y = [b[0] - d * xh[0], b[1] - d * xh[1], b[2] - d * xh[2]];
  const ly = Math.hypot(y[0], y[1], y[2]) || 1;
  return { xh, yh: [y[0] / ly, y[1] / ly, y[2] / ly], recip };
}

/** In-layer 2D coordinates (1/angstrom) of reflection h,k,l. */
export function layerPosition(plane: LayerPlane, recip: ArrayLike<number>, h: number, k: number, l: number): [number, number] {
  const f = makeFrame(plane, recip);
  const p = [0, 0, 0];
  cart(recip, h, k, l, p);
  return [p[0] * f.xh[0] + p[1] * f.xh[1] + p[2] * f.xh[2], p[0] * f.yh[0] + p[1] * f.yh[1] + p[2] * f.yh[2]];
}

/** A view that shows every reflection of the layer (or the origin region when empty). */
export function fitLayerView(opts: Pick<LayerMapOptions, 'plane' | 'recip' | 'data' | 'width' | 'height' | 'textScale'>): LayerView {
  const f = makeFrame(opts.plane, opts.recip);
  const p = [0, 0, 0];
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  const { data, plane } = opts;
  for (let r = 0; r < data.n; r++) {
    const h = data.h[r], k = data.k[r], l = data.l[r];
    if (!onLayer(plane, h, k, l)) continue;
    cart(opts.recip, h, k, l, p);
    const x = p[0] * f.xh[0] + p[1] * f.xh[1] + p[2] * f.xh[2];
    const y = p[0] * f.yh[0] + p[1] * f.yh[1] + p[2] * f.yh[2];
    if (x < minX) minX = x; if (x > maxX) maxX = x; if (y < minY) minY = y; if (y > maxY) maxY = y;
  }
  if (!Number.isFinite(minX)) {
    cart(opts.recip, plane.origin[0], plane.origin[1], plane.origin[2], p);
    const x = p[0] * f.xh[0] + p[1] * f.xh[1] + p[2] * f.xh[2];
    const y = p[0] * f.yh[0] + p[1] * f.yh[1] + p[2] * f.yh[2];
    minX = x - 0.5; maxX = x + 0.5; minY = y - 0.5; maxY = y + 0.5;
  }
  // Keep the layer origin in view: crystallographers read indices from it.
  const o = [0, 0, 0];
  cart(opts.recip, plane.origin[0], plane.origin[1], plane.origin[2], o);
  const ox = o[0] * f.xh[0] + o[1] * f.xh[1] + o[2] * f.xh[2], oy = o[0] * f.yh[0] + o[1] * f.yh[1] + o[2] * f.yh[2];
  minX = Math.min(minX, ox); maxX = Math.max(maxX, ox); minY = Math.min(minY, oy); maxY = Math.max(maxY, oy);
  const spanX = Math.max(maxX - minX, 1e-3), spanY = Math.max(maxY - minY, 1e-3);
  // Leave room for the title bar above and the index labels around the data.
  const title = titleBarHeight(Math.max(1, Math.round(opts.textScale ?? 1)));
  const scale = Math.min((opts.width * 0.84) / spanX, (opts.height * 0.78 - title) / spanY);
  return { cx: (minX + maxX) / 2, cy: (minY + maxY) / 2 + title / (2 * scale), scale };
}

/** Height of the title bar at text scale ts. */
function titleBarHeight(ts: number): number {
  return textHeight(ts) + 12 * ts;
}

function niceStep(pxPerIndex: number, minPx: number): number {
  const steps = [1, 2, 5, 10, 20, 50, 100, 200];
  for (const s of steps) if (s * pxPerIndex >= minPx) return s;
  return 500;
}

/** Value at which the intensity scale saturates: the 98th percentile of positive intensities. */
export function saturationLevel(values: Float32Array | number[]): number {
  const pos = Array.from(values).filter((x) => x > 0 && Number.isFinite(x)).sort((a, b) => a - b);
  if (pos.length === 0) return 1;
  return pos[Math.min(pos.length - 1, Math.floor(pos.length * 0.98))];
}

export function drawLayerMap(opts: LayerMapOptions): LayerMapResult {
  const { width, height, plane, recip, data } = opts;
  const ts = Math.max(1, Math.round(opts.textScale ?? 1));
  const img = createImage(width, height);
  fillImage(img, MARK.background);
  const view = opts.view ?? fitLayerView(opts);
  const f = makeFrame(plane, recip);
  const p = [0, 0, 0];
  const toScreen = (h: number, k: number, l: number, out: number[]) => {
    cart(recip, h, k, l, p);
    const x = p[0] * f.xh[0] + p[1] * f.xh[1] + p[2] * f.xh[2];
    const y = p[0] * f.yh[0] + p[1] * f.yh[1] + p[2] * f.yh[2];
    out[0] = width / 2 + (x - view.cx) * view.scale;
    out[1] = height / 2 - (y - view.cy) * view.scale;
  };
  const s0 = [0, 0], s1 = [0, 0], s2 = [0, 0];
  const [oh, ok, ol] = plane.origin;
  const e1 = plane.e1, e2 = plane.e2;
  toScreen(oh, ok, ol, s0);
  toScreen(oh + e1[0], ok + e1[1], ol + e1[2], s1);
  toScreen(oh + e2[0], ok + e2[1], ol + e2[2], s2);
  const v1 = [s1[0] - s0[0], s1[1] - s0[1]], v2 = [s2[0] - s0[0], s2[1] - s0[1]];
  const len1 = Math.hypot(v1[0], v1[1]), len2 = Math.hypot(v2[0], v2[1]);
  // Range of node coordinates (i, j) that can appear on screen.
  const det = v1[0] * v2[1] - v1[1] * v2[0];
  let iMin = Infinity, iMax = -Infinity, jMin = Infinity, jMax = -Infinity;
  for (const [cx, cy] of [[0, 0], [width, 0], [0, height], [width, height]]) {
    const dx = cx - s0[0], dy = cy - s0[1];
    const i = (dx * v2[1] - dy * v2[0]) / det, j = (v1[0] * dy - v1[1] * dx) / det;
    iMin = Math.min(iMin, i); iMax = Math.max(iMax, i); jMin = Math.min(jMin, j); jMax = Math.max(jMax, j);
  }
  iMin = Math.floor(iMin) - 1; iMax = Math.ceil(iMax) + 1; jMin = Math.floor(jMin) - 1; jMax = Math.ceil(jMax) + 1;
  const nodeCount = (iMax - iMin + 1) * (jMax - jMin + 1);
  const spacing = Math.min(len1, len2, Math.abs(det) / Math.max(len1, len2));
  const denseGrid = spacing < 4 || nodeCount > 400_000;

  // Extent of the data on this layer, so the grid stops where measurement stops.
  let maxQ = 0;
  const layerRows: number[] = [];
  const dMin = opts.dMin ?? 0;
  for (let r = 0; r < data.n; r++) {
    const h = data.h[r], k = data.k[r], l = data.l[r];
    if (!onLayer(plane, h, k, l)) continue;
    cart(recip, h, k, l, p);
    const q = Math.hypot(p[0], p[1], p[2]);
    if (dMin > 0 && q > 1 / dMin) continue;
    layerRows.push(r);
    if (q > maxQ) maxQ = q;
  }

  // Grid: rows of constant j (along e1) and columns of constant i (along e2).
  if (!denseGrid) {
    for (let j = jMin; j <= jMax; j++) {
      const ax = s0[0] + j * v2[0] + iMin * v1[0], ay = s0[1] + j * v2[1] + iMin * v1[1];
      const bx = s0[0] + j * v2[0] + iMax * v1[0], by = s0[1] + j * v2[1] + iMax * v1[1];
      const c = clipLine(width, height, ax, ay, bx, by);
      if (c) drawLine(img, c[0], c[1], c[2], c[3], j === 0 ? MARK.gridStrong : MARK.grid);
    }
    for (let i = iMin; i <= iMax; i++) {
      const ax = s0[0] + i * v1[0] + jMin * v2[0], ay = s0[1] + i * v1[1] + jMin * v2[1];
      const bx = s0[0] + i * v1[0] + jMax * v2[0], by = s0[1] + i * v1[1] + jMax * v2[1];
      const c = clipLine(width, height, ax, ay, bx, by);
      if (c) drawLine(img, c[0], c[1], c[2], c[3], i === 0 ? MARK.gridStrong : MARK.grid);
    }
  } else {
    for (const [vx, vy] of [v1, v2]) {
      const c = clipLine(width, height, s0[0] - vx * 1e4, s0[1] - vy * 1e4, s0[0] + vx * 1e4, s0[1] + vy * 1e4);
      if (c) drawLine(img, c[0], c[1], c[2], c[3], MARK.gridStrong);
    }
  }
  // Resolution limit of the data on this layer.
  if (maxQ > 0) {
    const centre = [0, 0];
    // The foot of the layer normal through the reciprocal origin, in screen space.
    const ox = -view.cx * view.scale + width / 2, oy = height / 2 + view.cy * view.scale;
    centre[0] = ox; centre[1] = oy;
    cart(recip, oh, ok, ol, p);
    // Distance of the layer from the origin along its normal.
    const inPlane = [p[0] * f.xh[0] + p[1] * f.xh[1] + p[2] * f.xh[2], p[0] * f.yh[0] + p[1] * f.yh[1] + p[2] * f.yh[2]];
    const off2 = p[0] * p[0] + p[1] * p[1] + p[2] * p[2] - inPlane[0] ** 2 - inPlane[1] ** 2;
    const rr = Math.sqrt(Math.max(0, maxQ * maxQ - Math.max(0, off2)));
    if (rr * view.scale > 4) strokeCircle(img, centre[0], centre[1], rr * view.scale, MARK.grid, 1);
  }

  // Forbidden nodes of the selected rule: hollow teal diamonds.
  let forbiddenMarked = 0;
  const spot = [0, 0];
  const mark = Math.max(2.5, Math.min(7, spacing * 0.32));
  if (opts.forbidden && !denseGrid) {
    for (let i = iMin; i <= iMax; i++) for (let j = jMin; j <= jMax; j++) {
      const h = oh + i * e1[0] + j * e2[0], k = ok + i * e1[1] + j * e2[1], l = ol + i * e1[2] + j * e2[2];
      if (h === 0 && k === 0 && l === 0) continue;
      if (maxQ > 0) { cart(recip, h, k, l, p); if (Math.hypot(p[0], p[1], p[2]) > maxQ * 1.02) continue; }
      if (!opts.forbidden(h, k, l)) continue;
      const x = s0[0] + i * v1[0] + j * v2[0], y = s0[1] + i * v1[1] + j * v2[1];
      if (x < -10 || y < -10 || x > width + 10 || y > height + 10) continue;
      drawDiamond(img, x, y, mark, MARK.forbidden, true);
      forbiddenMarked++;
    }
  }

  // Spots: measured on the left half, calculated on the right half when a model is loaded.
  const lay = Float32Array.from(layerRows, (r) => data.i[r]);
  const sat = saturationLevel(lay);
  let calcMap: Map<number, number> | undefined;
  let calcSat = 1;
  if (opts.calc) {
    calcMap = new Map();
    const c = opts.calc;
    const vals: number[] = [];
    for (let r = 0; r < c.n; r++) {
      if (!onLayer(plane, c.h[r], c.k[r], c.l[r])) continue;
      calcMap.set(key(c.h[r], c.k[r], c.l[r]), c.i[r]);
      vals.push(c.i[r]);
    }
    calcSat = saturationLevel(vals);
  }
  const rMax = Math.max(1.5, Math.min(14, spacing * 0.46));
  const rMin = Math.min(1.5, rMax);
  const spotX = new Float32Array(layerRows.length), spotY = new Float32Array(layerRows.length), spotRow = new Int32Array(layerRows.length);
  let spotCount = 0, violations = 0;
  // Weak first, so strong spots stay on top where they touch.
  layerRows.sort((a, b) => data.i[a] - data.i[b]);
  for (const r of layerRows) {
    const h = data.h[r], k = data.k[r], l = data.l[r];
    toScreen(h, k, l, spot);
    const x = spot[0], y = spot[1];
    if (x < -rMax || y < -rMax || x > width + rMax || y > height + rMax) continue;
    const I = data.i[r];
    const t = Math.sqrt(Math.min(1, Math.max(0, I / sat)));
    const rad = rMin + (rMax - rMin) * t;
    const col = paletteColor(0.08 + 0.92 * t);
    const sig = data.sigma ? data.sigma[r] : NaN;
    const strongForbidden = opts.forbidden !== undefined && opts.forbidden(h, k, l) && sig > 0 && I / sig >= STRONG_I_OVER_SIGMA;
    if (strongForbidden) {
      drawDiamond(img, x, y, Math.max(rad, mark) + 1.5, MARK.violator, false);
      strokeCircle(img, x, y, Math.max(rad, mark) + 4, MARK.violator, 1.5);
      violations++;
    } else if (calcMap) {
      fillHalfCircle(img, x, y, rad, -1, col);
      const ci = calcMap.get(key(h, k, l));
      if (ci !== undefined) {
        const tc = Math.sqrt(Math.min(1, Math.max(0, ci / calcSat)));
        fillHalfCircle(img, x, y, rMin + (rMax - rMin) * tc, 1, MARK.calc);
      }
    } else {
      fillCircle(img, x, y, rad, col);
    }
    spotX[spotCount] = x; spotY[spotCount] = y; spotRow[spotCount] = r; spotCount++;
  }
  // Calculated-only reflections (model predicts, nothing measured).
  if (calcMap) {
    const measured = new Set(layerRows.map((r) => key(data.h[r], data.k[r], data.l[r])));
    for (const [kk, ci] of calcMap) {
      if (measured.has(kk)) continue;
      const [h, k, l] = unkey(kk);
      toScreen(h, k, l, spot);
      const tc = Math.sqrt(Math.min(1, Math.max(0, ci / calcSat)));
      if (tc > 0.05) fillHalfCircle(img, spot[0], spot[1], rMin + (rMax - rMin) * tc, 1, MARK.calc);
    }
  }

  // Axis arrows and index labels along the rows through the layer origin.
  const th = textHeight(ts);
  const labelEvery1 = niceStep(len1, measureText('-00', ts) + 8 * ts);
  const labelEvery2 = niceStep(len2, th + 8 * ts);
  const ux = [v1[0] / (len1 || 1), v1[1] / (len1 || 1)], uy = [v2[0] / (len2 || 1), v2[1] / (len2 || 1)];
  for (let i = Math.ceil(iMin / labelEvery1) * labelEvery1; i <= iMax; i += labelEvery1) {
    if (i === 0) continue;
    const x = s0[0] + i * v1[0] - uy[0] * (8 * ts) , y = s0[1] + i * v1[1] - uy[1] * (8 * ts);
    if (x < 4 || y < 4 || x > width - 4 || y > height - 4) continue;
    drawText(img, String(i), x, y - th / 2, MARK.textDim, ts, 'center');
  }
  for (let j = Math.ceil(jMin / labelEvery2) * labelEvery2; j <= jMax; j += labelEvery2) {
    if (j === 0) continue;
    const x = s0[0] + j * v2[0] - ux[0] * (8 * ts), y = s0[1] + j * v2[1] - ux[1] * (8 * ts);
    if (x < 4 || y < 4 || x > width - 4 || y > height - 4) continue;
    drawText(img, String(j), x, y - th / 2, MARK.textDim, ts, 'right');
  }
  arrow(img, s0, ux, Math.min(width, height) * 0.12, MARK.axisA, plane.axisLabels[0], ts);
  arrow(img, s0, uy, Math.min(width, height) * 0.12, MARK.axisB, plane.axisLabels[1], ts);

  // Title and legend.
  const pad = 6 * ts;
  {
    const title = `layer ${plane.name}` + (opts.title ? `  ${opts.title}` : '');
    fillRect(img, 0, 0, width, titleBarHeight(ts), MARK.panel);
    drawText(img, clip(title, Math.floor((width - 2 * pad) / (6 * ts))), pad, pad, MARK.text, ts);
  }
  if (opts.legend !== false) drawLegend(img, ts, { calc: Boolean(opts.calc), rule: opts.ruleText, forbidden: Boolean(opts.forbidden), sat, spotCount, violations }, spotX.subarray(0, spotCount), spotY.subarray(0, spotCount));
  return { image: img, view, spotX, spotY, spotRow, spotCount, forbiddenMarked, violations };
}

function key(h: number, k: number, l: number): number {
  return ((h + 512) * 1024 + (k + 512)) * 1024 + (l + 512);
}
function unkey(x: number): [number, number, number] {
  const l = (x % 1024) - 512, k = (Math.floor(x / 1024) % 1024) - 512, h = Math.floor(x / 1048576) - 512;
  return [h, k, l];
}

function clip(s: string, n: number): string {
  return s.length <= n ? s : s.slice(0, Math.max(0, n - 2)) + '..';
}

function arrow(img: RgbaImage, o: number[], u: number[], len: number, color: number, label: string, ts: number): void {
  const ex = o[0] + u[0] * len, ey = o[1] + u[1] * len;
  for (let w = -1; w <= 1; w++) drawLine(img, o[0] + w * -u[1] * 0.5, o[1] + w * u[0] * 0.5, ex + w * -u[1] * 0.5, ey + w * u[0] * 0.5, color);
  const hx = -u[1], hy = u[0], hl = 6 * ts;
  drawLine(img, ex, ey, ex - u[0] * hl + hx * hl * 0.5, ey - u[1] * hl + hy * hl * 0.5, color);
  drawLine(img, ex, ey, ex - u[0] * hl - hx * hl * 0.5, ey - u[1] * hl - hy * hl * 0.5, color);
  const align = u[0] < -0.3 ? 'right' : u[0] > 0.3 ? 'left' : 'center';
  const tw = measureText(label, ts), tx = ex + u[0] * 8 * ts, ty = ey + u[1] * 8 * ts - textHeight(ts) / 2;
  const left = align === 'left' ? tx : align === 'right' ? tx - tw : tx - tw / 2;
  // A dark backing keeps the axis name readable over spots.
  fillRect(img, left - 2 * ts, ty - 2 * ts, tw + 4 * ts, textHeight(ts) + 4 * ts, MARK.panel);
  drawText(img, label, tx, ty, color, ts, align);
}

/** The corner (bottom right first) whose box of w x h covers the fewest spots. */
function quietCorner(img: RgbaImage, w: number, h: number, pad: number, top: number, xs: Float32Array, ys: Float32Array): [number, number] {
  const corners: Array<[number, number]> = [
    [img.width - w - pad, img.height - h - pad], [img.width - w - pad, top + pad], [pad, img.height - h - pad], [pad, top + pad],
  ];
  let best = corners[0], bestCount = Infinity;
  for (const [x0, y0] of corners) {
    let c = 0;
    for (let j = 0; j < xs.length; j++) if (xs[j] >= x0 - 6 && xs[j] <= x0 + w + 6 && ys[j] >= y0 - 6 && ys[j] <= y0 + h + 6) c++;
    if (c < bestCount) { bestCount = c; best = [x0, y0]; }
  }
  return best;
}

function drawLegend(img: RgbaImage, ts: number, o: { calc: boolean; rule?: string; forbidden: boolean; sat: number; spotCount: number; violations: number }, xs: Float32Array, ys: Float32Array): void {
  const th = textHeight(ts), pad = 6 * ts, line = th + 5 * ts;
  const rows: Array<[kind: string, text: string]> = [['bar', '']];
  rows.push(['disc', o.calc ? 'left half: measured I' : 'measured I']);
  if (o.calc) rows.push(['calc', 'right half: calculated I']);
  if (o.forbidden) {
    rows.push(['hollow', `forbidden by ${o.rule ?? 'selection'}`]);
    rows.push(['viol', `forbidden, yet I/\u03c3 \u2265 3 (${o.violations})`]);
  }
  const textW = Math.max(...rows.map((r) => measureText(r[1], ts)), measureText('weak  I  strong', ts));
  const boxW = textW + 3 * pad + 12 * ts, boxH = rows.length * line + th + pad;
  if (boxW + 2 * pad > img.width || boxH + titleBarHeight(ts) + 2 * pad > img.height) return;
  const [x0, y0] = quietCorner(img, boxW, boxH, pad, titleBarHeight(ts), xs, ys);
  fillRect(img, x0, y0, boxW, boxH, MARK.panel);
  strokeRect(img, x0, y0, boxW, boxH, MARK.grid);
  let y = y0 + pad;
  for (const [kind, text] of rows) {
    const mx = x0 + pad + 5 * ts, my = y + th / 2;
    if (kind === 'bar') {
      const bw = boxW - 2 * pad;
      for (let x = 0; x < bw; x++) fillRect(img, x0 + pad + x, y, 1, th, INTENSITY_LUT[Math.round((0.08 + 0.92 * Math.sqrt(x / bw)) * 255)]);
      drawText(img, 'weak', x0 + pad + 2, y + th + 2 * ts, MARK.textDim, ts);
      drawText(img, 'strong', x0 + pad + bw - 2, y + th + 2 * ts, MARK.textDim, ts, 'right');
      y += line + th;
      continue;
    }
    if (kind === 'disc') fillCircle(img, mx, my, 4 * ts, paletteColor(0.7));
    if (kind === 'calc') fillHalfCircle(img, mx, my, 4 * ts, 1, MARK.calc);
    if (kind === 'hollow') drawDiamond(img, mx, my, 4 * ts, MARK.forbidden, true);
    if (kind === 'viol') drawDiamond(img, mx, my, 4 * ts, MARK.violator, false);
    drawText(img, text, x0 + pad + 12 * ts, y, MARK.text, ts);
    y += line;
  }
}
