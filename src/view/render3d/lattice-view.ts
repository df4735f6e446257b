import { PerspectiveCamera, Vector3 } from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import { multiplyMat4, pickPoint, projectPoint, type PointCloud } from '../../../shaders-free-render';
import { clear, svg } from '../dom';
import type { Dataset } from '../dataset';
import type { PointRenderer, RendererKind } from './point-renderer';

/**
 * The 3D reciprocal lattice: owns the camera, the orbit controls, the chosen
 * renderer and an SVG overlay with the a*, b*, c* axes and the picked spot.
 * Renders on demand (when the camera or the points change), not in a loop.
 */
export class LatticeView {
  readonly camera = new PerspectiveCamera(32, 1, 0.001, 100);
  private controls: OrbitControls;
  private overlay: SVGSVGElement;
  private ds: Dataset | undefined;
  private cloud: PointCloud | undefined;
  private radiusScale = 1;
  private picked = -1;
  private frameQueued = false;
  private extent = 1;
  private readonly vp = new Float64Array(16);
  private resizeObserver: ResizeObserver;
  private down: { x: number; y: number } | undefined;
  private highlight: string | null = null;

  constructor(private host: HTMLElement, readonly renderer: PointRenderer, private onPick: (row: number) => void) {
    this.renderer.canvas.className = 'lattice-canvas';
    this.renderer.canvas.dataset.renderer = renderer.kind;
    this.overlay = svg('svg', { class: 'lattice-overlay' });
    host.append(this.renderer.canvas, this.overlay);
    this.camera.up.set(0, 0, 1);
    this.controls = new OrbitControls(this.camera, this.overlay);
    this.controls.enableDamping = false;
    this.controls.zoomSpeed = 1.2;
    this.controls.addEventListener('change', () => this.requestRender());
    this.overlay.addEventListener('pointerdown', (e) => { this.down = { x: e.clientX, y: e.clientY }; });
    this.overlay.addEventListener('pointerup', (e) => {
      if (this.down && Math.hypot(e.clientX - this.down.x, e.clientY - this.down.y) < 4) this.pickAt(e.clientX, e.clientY);
      this.down = undefined;
    });
    this.resizeObserver = new ResizeObserver(() => this.resize());
    this.resizeObserver.observe(host);
    this.resize();
  }

  get kind(): RendererKind {
    return this.renderer.kind;
  }

  private resize(): void {
    const w = Math.max(1, this.host.clientWidth), h = Math.max(1, this.host.clientHeight);
    this.renderer.resize(w, h);
    this.overlay.setAttribute('viewBox', `0 0 ${w} ${h}`);
    this.camera.aspect = w / h;
    this.camera.updateProjectionMatrix();
    this.requestRender();
  }

  setData(ds: Dataset): void {
    this.ds = ds;
    this.picked = -1;
    let q = 0;
    for (let r = 0; r < ds.table.n; r++) if (ds.dstar[r] > q) q = ds.dstar[r];
    this.extent = q > 0 ? q : 1;
    this.camera.near = this.extent * 0.01;
    this.camera.far = this.extent * 40;
    this.viewFrom(new Vector3(1, -1.5, 0.85));
  }

  setCloud(cloud: PointCloud, radiusScale = 1): void {
    this.cloud = cloud;
    this.radiusScale = radiusScale;
    this.renderer.setRadiusScale(radiusScale);
    this.renderer.setCloud(cloud);
    this.requestRender();
  }

  /** Camera on the given side of the origin, looking at it, the whole lattice in view. */
  viewFrom(dir: Vector3, up = new Vector3(0, 0, 1)): void {
    const d = dir.clone().normalize();
    const dist = (this.extent * 1.15) / Math.tan((this.camera.fov * Math.PI) / 360);
    this.camera.up.copy(up);
    this.camera.position.copy(d.multiplyScalar(dist));
    this.controls.target.set(0, 0, 0);
    this.camera.lookAt(0, 0, 0);
    this.camera.updateProjectionMatrix();
    this.controls.update();
    this.requestRender();
  }

  /** Look down a reciprocal axis (0 = a*, 1 = b*, 2 = c*). */
  viewAlong(axis: 0 | 1 | 2): void {
    if (!this.ds) return;
    const f = this.ds.recip;
    const v = new Vector3(f[3 * axis], f[3 * axis + 1], f[3 * axis + 2]);
    const up = axis === 2 ? new Vector3(0, 1, 0) : new Vector3(0, 0, 1);
    this.viewFrom(v, up);
  }

  resetView(): void {
    this.viewFrom(new Vector3(1, -1.5, 0.85));
  }

  /** Emphasises one axis ('a*', 'b*', 'c*', or the direct 'a', 'b', 'c' drawn dashed), or none. */
  setHighlightAxis(axis: string | null): void {
    this.highlight = axis;
    this.requestRender();
  }

  /** Shows a ring around table row `row` (or none with -1). */
  setPicked(row: number): void {
    this.picked = row;
    this.requestRender();
  }

  requestRender(): void {
    if (this.frameQueued) return;
    this.frameQueued = true;
    requestAnimationFrame(() => {
      this.frameQueued = false;
      this.renderNow();
    });
  }

  renderNow(): void {
    this.renderer.render(this.camera);
    this.drawOverlay();
  }

  private viewProj(): Float64Array {
    this.camera.updateMatrixWorld();
    multiplyMat4(this.vp, this.camera.projectionMatrix.elements, this.camera.matrixWorldInverse.elements);
    return this.vp;
  }

  private pickAt(clientX: number, clientY: number): void {
    if (!this.cloud) return;
    const rect = this.overlay.getBoundingClientRect();
    const row = pickPoint(this.cloud, this.viewProj(), rect.width, rect.height, clientX - rect.left, clientY - rect.top, this.radiusScale);
    this.picked = row;
    this.onPick(row);
    this.requestRender();
  }

  /** Screen position of a table row (for tests and the overlay), or undefined when off screen. */
  screenPositionOf(row: number): [number, number] | undefined {
    if (!this.ds) return undefined;
    const out = [0, 0, 0];
    const w = projectPoint(this.viewProj(), this.ds.xyz[3 * row], this.ds.xyz[3 * row + 1], this.ds.xyz[3 * row + 2], out);
    if (w <= 0) return undefined;
    const W = this.host.clientWidth, H = this.host.clientHeight;
    return [(out[0] + 1) * 0.5 * W, (1 - out[1]) * 0.5 * H];
  }

  private drawOverlay(): void {
    clear(this.overlay);
    if (!this.ds) return;
    const W = this.host.clientWidth, H = this.host.clientHeight;
    const vp = this.viewProj();
    const p0 = [0, 0, 0], p1 = [0, 0, 0];
    const toPx = (v: number[]) => [(v[0] + 1) * 0.5 * W, (1 - v[1]) * 0.5 * H];
    projectPoint(vp, 0, 0, 0, p0);
    const o = toPx(p0);
    const names = ['a*', 'b*', 'c*'], cls = ['axis-a', 'axis-b', 'axis-c'];
    const f = this.ds.recip;
    for (let j = 0; j < 3; j++) {
      const len = Math.hypot(f[3 * j], f[3 * j + 1], f[3 * j + 2]) || 1;
      const s = (this.extent * 0.55) / len;
      const w = projectPoint(vp, f[3 * j] * s, f[3 * j + 1] * s, f[3 * j + 2] * s, p1);
      if (w <= 0) continue;
      const e = toPx(p1);
      const hi = this.highlight === names[j] ? ' highlight' : '';
      this.overlay.append(svg('line', { x1: o[0], y1: o[1], x2: e[0], y2: e[1], class: `axis ${cls[j]}${hi}` }));
      const dx = e[0] - o[0], dy = e[1] - o[1], dl = Math.hypot(dx, dy) || 1;
      this.overlay.append(svg('text', { x: e[0] + (dx / dl) * 12, y: e[1] + (dy / dl) * 12 + 4, class: `axis-label ${cls[j]}${hi}`, 'text-anchor': 'middle' }, names[j]));
    }
    // A direct axis on request (from the conventions guide): dashed, along the real-space vector.
    const direct = ['a', 'b', 'c'].indexOf(this.highlight ?? '');
    if (direct >= 0) {
      const v = this.ds.cell.directBasis(direct as 0 | 1 | 2);
      const s = (this.extent * 0.55) / (Math.hypot(v[0], v[1], v[2]) || 1);
      if (projectPoint(vp, v[0] * s, v[1] * s, v[2] * s, p1) > 0) {
        const e = toPx(p1);
        this.overlay.append(svg('line', { x1: o[0], y1: o[1], x2: e[0], y2: e[1], class: `axis direct ${cls[direct]} highlight` }));
        this.overlay.append(svg('text', { x: e[0] + 8, y: e[1] - 6, class: `axis-label ${cls[direct]} highlight` }, `${names[direct][0]} (direct)`));
      }
    }
    if (this.picked >= 0) {
      const pos = this.screenPositionOf(this.picked);
      if (pos) this.overlay.append(svg('circle', { cx: pos[0], cy: pos[1], r: 9, class: 'pick-ring' }));
    }
  }

  /** `?bench=N`: N frames of a steady rotation about c*; milliseconds per frame (median of the frames). */
  bench(frames: number): number {
    const times: number[] = [];
    const start = this.camera.position.clone();
    const r = Math.hypot(start.x, start.y), z = start.z, a0 = Math.atan2(start.y, start.x);
    for (let f = 0; f < frames; f++) {
      const a = a0 + (2 * Math.PI * f) / Math.max(1, frames);
      this.camera.position.set(r * Math.cos(a), r * Math.sin(a), z);
      this.camera.lookAt(0, 0, 0);
      const t0 = performance.now();
      this.renderer.render(this.camera);
      this.renderer.finish?.();
      times.push(performance.now() - t0);
    }
    this.camera.position.copy(start);
    this.camera.lookAt(0, 0, 0);
    this.requestRender();
    times.sort((x, y) => x - y);
    return times[Math.floor(times.length / 2)];
  }

  dispose(): void {
    this.resizeObserver.disconnect();
    this.controls.dispose();
    this.renderer.dispose();
    this.renderer.canvas.remove();
    this.overlay.remove();
  }
}
