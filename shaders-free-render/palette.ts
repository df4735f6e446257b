import { rgba } from './image';

/**
 * Lacuna's intensity palette: lightness rises steadily from a deep indigo
 * through plum and coral to a pale cream, so equal steps in the scaled value
 * look like equal steps on a dark background. Built in CIE L*C*h (D65) from
 * four control points of our own and converted to sRGB once, into a 256-entry
 * lookup table of packed pixels.
 */
const STOPS: ReadonlyArray<readonly [t: number, L: number, C: number, h: number]> = [
  [0, 24, 34, 292],
  [0.36, 46, 52, 336],
  [0.68, 69, 58, 42],
  [1, 96, 34, 92],
];

function labToSrgb(L: number, a: number, b: number): [number, number, number] {
  // CIELAB -> XYZ (D65 white) -> linear sRGB -> gamma-encoded sRGB.
  const fy = (L + 16) / 116, fx = fy + a / 500, fz = fy - b / 200;
  const inv = (t: number) => (t > 6 / 29 ? t * t * t : 3 * (6 / 29) ** 2 * (t - 4 / 29));
  const X = 0.95047 * inv(fx), Y = inv(fy), Z = 1.08883 * inv(fz);
  const rl = 3.2404542 * X - 1.5371385 * Y - 0.4985314 * Z;
  const gl = -0.969266 * X + 1.8760108 * Y + 0.041556 * Z;
  const bl = 0.0556434 * X - 0.2040259 * Y + 1.0572252 * Z;
  const enc = (u: number) => {
    const v = Math.min(1, Math.max(0, u));
    return Math.round(255 * (v <= 0.0031308 ? 12.92 * v : 1.055 * v ** (1 / 2.4) - 0.055));
  };
  return [enc(rl), enc(gl), enc(bl)];
}

function lchAt(t: number): [number, number, number] {
  let j = 0;
  while (j < STOPS.length - 2 && t > STOPS[j + 1][0]) j++;
  const [t0, L0, C0, h0] = STOPS[j], [t1, L1, C1, h1] = STOPS[j + 1];
  const u = Math.min(1, Math.max(0, (t - t0) / (t1 - t0)));
  let dh = h1 - h0;
  if (dh > 180) dh -= 360; else if (dh < -180) dh += 360;
  return [L0 + (L1 - L0) * u, C0 + (C1 - C0) * u, h0 + dh * u];
}

/** 256 packed colours, index 0 = weakest. */
export const INTENSITY_LUT: Uint32Array = (() => {
  const lut = new Uint32Array(256);
  for (let i = 0; i < 256; i++) {
    const [L, C, h] = lchAt(i / 255);
    const hr = (h * Math.PI) / 180;
    const [r, g, b] = labToSrgb(L, C * Math.cos(hr), C * Math.sin(hr));
    lut[i] = rgba(r, g, b);
  }
  return lut;
})();

/** Colour for t in 0..1 (clamped). */
export function paletteColor(t: number): number {
  const i = Math.round(Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0)) * 255);
  return INTENSITY_LUT[i];
}

/** CIE L* of each palette entry (for tests: it must rise monotonically). */
export function paletteLightness(t: number): number {
  return lchAt(t)[0];
}

/** Fixed colours for marks that are not intensities. */
export const MARK = {
  background: rgba(17, 20, 28),
  panel: rgba(26, 30, 41),
  grid: rgba(70, 84, 104, 150),
  gridStrong: rgba(110, 128, 150, 220),
  text: rgba(214, 220, 230),
  textDim: rgba(140, 150, 166),
  /** Nodes the selected rule forbids: hollow diamonds in a cool teal. */
  forbidden: rgba(64, 208, 196),
  /** Forbidden but measured strong (I/sigma >= 3): a hot signal red. */
  violator: rgba(255, 72, 56),
  /** Calculated (model) intensities: a cold green-blue. */
  calc: rgba(120, 200, 255),
  axisA: rgba(240, 110, 110),
  axisB: rgba(120, 220, 120),
  axisC: rgba(120, 160, 255),
} as const;
