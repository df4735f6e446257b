/**
 * An RGBA image in memory (row-major, 4 bytes a pixel, straight alpha) and
 * the few raster operations the layer map and legends need. Colours are
 * packed as 0xAABBGGRR so one Uint32 write stores a pixel on little-endian
 * machines (every machine a browser or Node runs on today).
 */
export interface RgbaImage {
  readonly width: number;
  readonly height: number;
  readonly data: Uint8ClampedArray;
  /** The same memory as 32-bit pixels. */
  readonly pixels: Uint32Array;
}

export function createImage(width: number, height: number): RgbaImage {
  const w = Math.max(1, Math.floor(width));
  const h = Math.max(1, Math.floor(height));
  const data = new Uint8ClampedArray(w * h * 4);
  return { width: w, height: h, data, pixels: new Uint32Array(data.buffer, data.byteOffset, w * h) };
}

/** Packs r,g,b (0..255) and alpha (0..255) into one pixel value. */
export function rgba(r: number, g: number, b: number, a = 255): number {
  return ((a & 255) << 24 | (b & 255) << 16 | (g & 255) << 8 | (r & 255)) >>> 0;
}

/** '#rrggbb' or '#rrggbbaa' to a packed pixel. */
export function hexColor(hex: string): number {
  const s = hex.replace('#', '');
  const v = (i: number) => parseInt(s.slice(i, i + 2), 16);
  return rgba(v(0), v(2), v(4), s.length >= 8 ? v(6) : 255);
}

/** Packed pixel to a CSS colour string. */
export function cssColor(c: number): string {
  const r = c & 255, g = (c >>> 8) & 255, b = (c >>> 16) & 255, a = (c >>> 24) & 255;
  return a === 255 ? `rgb(${r},${g},${b})` : `rgba(${r},${g},${b},${(a / 255).toFixed(3)})`;
}

export function fillImage(img: RgbaImage, color: number): void {
  img.pixels.fill(color);
}

/** Blends colour (its alpha as coverage) over the pixel at integer x,y. */
export function blendPixel(img: RgbaImage, x: number, y: number, color: number): void {
  if (x < 0 || y < 0 || x >= img.width || y >= img.height) return;
  const a = (color >>> 24) & 255;
  if (a === 0) return;
  const i = y * img.width + x;
  if (a === 255) { img.pixels[i] = color; return; }
  const d = img.data, o = i * 4, t = a / 255, u = 1 - t;
  d[o] = (color & 255) * t + d[o] * u;
  d[o + 1] = ((color >>> 8) & 255) * t + d[o + 1] * u;
  d[o + 2] = ((color >>> 16) & 255) * t + d[o + 2] * u;
  d[o + 3] = a + d[o + 3] * u;
}

export function fillRect(img: RgbaImage, x0: number, y0: number, w: number, h: number, color: number): void {
  const xa = Math.max(0, Math.round(x0)), ya = Math.max(0, Math.round(y0));
  const xb = Math.min(img.width, Math.round(x0 + w)), yb = Math.min(img.height, Math.round(y0 + h));
  for (let y = ya; y < yb; y++) for (let x = xa; x < xb; x++) blendPixel(img, x, y, color);
}

export function strokeRect(img: RgbaImage, x0: number, y0: number, w: number, h: number, color: number): void {
  drawLine(img, x0, y0, x0 + w, y0, color);
  drawLine(img, x0 + w, y0, x0 + w, y0 + h, color);
  drawLine(img, x0 + w, y0 + h, x0, y0 + h, color);
  drawLine(img, x0, y0 + h, x0, y0, color);
}

/** One-pixel line (DDA); `dash` > 0 draws dash-on/dash-off segments of that length. */
export function drawLine(img: RgbaImage, x0: number, y0: number, x1: number, y1: number, color: number, dash = 0): void {
  const dx = x1 - x0, dy = y1 - y0;
  const steps = Math.ceil(Math.max(Math.abs(dx), Math.abs(dy)));
  if (steps === 0) { blendPixel(img, Math.round(x0), Math.round(y0), color); return; }
  // Skip the parts far outside the image (long grid lines when zoomed in).
  const sx = dx / steps, sy = dy / steps;
  for (let s = 0; s <= steps; s++) {
    if (dash > 0 && Math.floor(s / dash) % 2 === 1) continue;
    const x = Math.round(x0 + sx * s), y = Math.round(y0 + sy * s);
    if (x < -1 || y < -1 || x > img.width || y > img.height) continue;
    blendPixel(img, x, y, color);
  }
}

/** Clips a line to the image rectangle (Liang-Barsky); returns null when outside. */
export function clipLine(w: number, h: number, x0: number, y0: number, x1: number, y1: number): [number, number, number, number] | null {
  let t0 = 0, t1 = 1;
  const dx = x1 - x0, dy = y1 - y0;
  const p = [-dx, dx, -dy, dy], q = [x0, w - 1 - x0, y0, h - 1 - y0];
  for (let i = 0; i < 4; i++) {
    if (p[i] === 0) { if (q[i] < 0) return null; continue; }
    const r = q[i] / p[i];
    if (p[i] < 0) { if (r > t1) return null; if (r > t0) t0 = r; }
    else { if (r < t0) return null; if (r < t1) t1 = r; }
  }
  return [x0 + t0 * dx, y0 + t0 * dy, x0 + t1 * dx, y0 + t1 * dy];
}

export function fillCircle(img: RgbaImage, cx: number, cy: number, r: number, color: number): void {
  const r2 = r * r;
  const xa = Math.floor(cx - r), xb = Math.ceil(cx + r), ya = Math.floor(cy - r), yb = Math.ceil(cy + r);
  for (let y = ya; y <= yb; y++) {
    for (let x = xa; x <= xb; x++) {
      const ddx = x + 0.5 - cx, ddy = y + 0.5 - cy;
      if (ddx * ddx + ddy * ddy <= r2) blendPixel(img, x, y, color);
    }
  }
}

/** Left (side < 0) or right (side > 0) half of a disc. */
export function fillHalfCircle(img: RgbaImage, cx: number, cy: number, r: number, side: number, color: number): void {
  const r2 = r * r;
  const xa = Math.floor(cx - r), xb = Math.ceil(cx + r), ya = Math.floor(cy - r), yb = Math.ceil(cy + r);
  for (let y = ya; y <= yb; y++) {
    for (let x = xa; x <= xb; x++) {
      const ddx = x + 0.5 - cx, ddy = y + 0.5 - cy;
      if ((side < 0 ? ddx > 0 : ddx < 0)) continue;
      if (ddx * ddx + ddy * ddy <= r2) blendPixel(img, x, y, color);
    }
  }
}

export function strokeCircle(img: RgbaImage, cx: number, cy: number, r: number, color: number, width = 1): void {
  const ro = r + width / 2, ri = Math.max(0, r - width / 2);
  const ro2 = ro * ro, ri2 = ri * ri;
  const xa = Math.floor(cx - ro), xb = Math.ceil(cx + ro), ya = Math.floor(cy - ro), yb = Math.ceil(cy + ro);
  for (let y = ya; y <= yb; y++) {
    for (let x = xa; x <= xb; x++) {
      const ddx = x + 0.5 - cx, ddy = y + 0.5 - cy, d2 = ddx * ddx + ddy * ddy;
      if (d2 <= ro2 && d2 >= ri2) blendPixel(img, x, y, color);
    }
  }
}

/** Diamond (square turned 45 degrees) of half-diagonal r; outline when `hollow`. */
export function drawDiamond(img: RgbaImage, cx: number, cy: number, r: number, color: number, hollow: boolean): void {
  const xa = Math.floor(cx - r), xb = Math.ceil(cx + r), ya = Math.floor(cy - r), yb = Math.ceil(cy + r);
  for (let y = ya; y <= yb; y++) {
    for (let x = xa; x <= xb; x++) {
      const d = Math.abs(x + 0.5 - cx) + Math.abs(y + 0.5 - cy);
      if (d <= r && (!hollow || d >= r - 1.3)) blendPixel(img, x, y, color);
    }
  }
}
