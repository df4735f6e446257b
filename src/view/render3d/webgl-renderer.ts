import {
  BufferAttribute, BufferGeometry, Color, DataTexture, LinearSRGBColorSpace, Points, PointsMaterial, RGBAFormat, Scene, WebGLRenderer,
  type PerspectiveCamera,
} from 'three';
import { MAX_RADIUS, MARK, SHAPE_COUNT, SHAPE_DIAMOND, SHAPE_DIAMOND_HOLLOW, SHAPE_RING, type PointCloud } from '../../../shaders-free-render';
import type { PointRenderer } from './point-renderer';

/**
 * three.js renderer with built-in materials only (PointsMaterial, no shader
 * code of ours). PointsMaterial has one size per material, so points are
 * grouped by (shape, radius) into a few Points objects; each shape is an
 * alpha texture made here from the same rules the CPU stamps use.
 */
function shapeTexture(shape: number): DataTexture {
  const N = 32, data = new Uint8Array(N * N * 4), c = (N - 1) / 2;
  for (let y = 0; y < N; y++) for (let x = 0; x < N; x++) {
    const dx = (x - c) / c, dy = (y - c) / c;
    let on: boolean;
    if (shape === SHAPE_DIAMOND || shape === SHAPE_DIAMOND_HOLLOW) {
      const d = Math.abs(dx) + Math.abs(dy);
      on = d <= 1 && (shape === SHAPE_DIAMOND || d >= 0.62);
    } else {
      const d = Math.hypot(dx, dy);
      on = d <= 1 && (shape !== SHAPE_RING || d >= 0.62);
    }
    const o = (y * N + x) * 4;
    data[o] = data[o + 1] = data[o + 2] = 255;
    data[o + 3] = on ? 255 : 0;
  }
  const t = new DataTexture(data, N, N, RGBAFormat);
  t.needsUpdate = true;
  return t;
}

export class WebGlPointRenderer implements PointRenderer {
  readonly kind = 'webgl' as const;
  readonly canvas: HTMLCanvasElement;
  private renderer: WebGLRenderer;
  private scene = new Scene();
  private textures: DataTexture[] = [];
  private groups: Points[] = [];
  private cloud: PointCloud | undefined;
  private radiusScale = 1;

  constructor(canvas?: HTMLCanvasElement) {
    this.canvas = canvas ?? document.createElement('canvas');
    this.renderer = new WebGLRenderer({ canvas: this.canvas, antialias: false, preserveDrawingBuffer: true });
    // Colours in the cloud are already sRGB bytes: pass them through untouched.
    this.renderer.outputColorSpace = LinearSRGBColorSpace;
    this.renderer.setClearColor(new Color((MARK.background & 255) / 255, ((MARK.background >>> 8) & 255) / 255, ((MARK.background >>> 16) & 255) / 255), 1);
    for (let s = 0; s < SHAPE_COUNT; s++) this.textures.push(shapeTexture(s));
  }

  /** The GPU's own name for itself (used to detect software rasterisers). */
  rendererName(): string {
    const gl = this.renderer.getContext();
    const ext = gl.getExtension('WEBGL_debug_renderer_info');
    return String(ext ? gl.getParameter(ext.UNMASKED_RENDERER_WEBGL) : gl.getParameter(gl.RENDERER));
  }

  setCloud(cloud: PointCloud): void {
    this.cloud = cloud;
    this.rebuild();
  }

  setRadiusScale(s: number): void {
    if (s === this.radiusScale) return;
    this.radiusScale = s;
    this.rebuild();
  }

  private clearGroups(): void {
    for (const g of this.groups) {
      this.scene.remove(g);
      g.geometry.dispose();
      (g.material as PointsMaterial).dispose();
    }
    this.groups = [];
  }

  private rebuild(): void {
    this.clearGroups();
    const c = this.cloud;
    if (!c) return;
    const buckets = SHAPE_COUNT * (MAX_RADIUS + 1);
    const counts = new Int32Array(buckets);
    const bucketOf = new Int16Array(c.n);
    for (let i = 0; i < c.n; i++) {
      if (c.hidden && c.hidden[i]) { bucketOf[i] = -1; continue; }
      const r = Math.min(MAX_RADIUS, Math.round(c.radius[i] * this.radiusScale));
      const b = c.shape[i] * (MAX_RADIUS + 1) + r;
      bucketOf[i] = b;
      counts[b]++;
    }
    const pos: Float32Array[] = [], col: Uint8Array[] = [], fill = new Int32Array(buckets);
    for (let b = 0; b < buckets; b++) { pos.push(new Float32Array(counts[b] * 3)); col.push(new Uint8Array(counts[b] * 3)); }
    for (let i = 0; i < c.n; i++) {
      const b = bucketOf[i];
      if (b < 0) continue;
      const j = fill[b]++, v = c.color[i];
      pos[b].set(c.xyz.subarray(3 * i, 3 * i + 3), 3 * j);
      col[b][3 * j] = v & 255; col[b][3 * j + 1] = (v >>> 8) & 255; col[b][3 * j + 2] = (v >>> 16) & 255;
    }
    const dpr = this.renderer.getPixelRatio();
    for (let b = 0; b < buckets; b++) {
      if (counts[b] === 0) continue;
      const shape = Math.floor(b / (MAX_RADIUS + 1)), r = b % (MAX_RADIUS + 1);
      const g = new BufferGeometry();
      g.setAttribute('position', new BufferAttribute(pos[b], 3));
      g.setAttribute('color', new BufferAttribute(col[b], 3, true));
      const m = new PointsMaterial({ size: (2 * r + 1) * dpr, sizeAttenuation: false, vertexColors: true, map: this.textures[shape], alphaTest: 0.5 });
      const p = new Points(g, m);
      p.frustumCulled = false;
      this.scene.add(p);
      this.groups.push(p);
    }
  }

  /** Waits for the GPU to finish the frame (benchmarks measure whole frames). */
  finish(): void {
    const gl = this.renderer.getContext();
    const px = new Uint8Array(4);
    gl.readPixels(0, 0, 1, 1, gl.RGBA, gl.UNSIGNED_BYTE, px);
  }

  resize(w: number, h: number): void {
    this.renderer.setSize(Math.max(1, Math.round(w)), Math.max(1, Math.round(h)), false);
  }

  render(camera: PerspectiveCamera): void {
    this.renderer.render(this.scene, camera);
  }

  dispose(): void {
    this.clearGroups();
    for (const t of this.textures) t.dispose();
    this.textures = [];
    this.renderer.dispose();
    this.renderer.forceContextLoss();
  }
}
