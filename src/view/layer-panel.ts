import {
  drawLayerMap, fitLayerView, LAYER_PRESETS, onLayer, parseLayerPlane, type LayerColumns, type LayerMapResult, type LayerPlane, type LayerView,
} from '../../shaders-free-render';
import { clear, el, fmt } from './dom';
import type { Dataset } from './dataset';
import { anyRuleForbids, type Rule } from './rules';

/**
 * The layer map: one layer u h + v k + w l = n drawn by the CPU renderer's
 * layer drawer (the same code as `lacuna layer`), with zoom (wheel), pan
 * (drag), double-click to fit, a hover readout and PNG export.
 */
export interface LayerPanelState {
  rules: readonly Rule[];
  ruleText?: string;
  calc?: LayerColumns;
  dMin: number;
}

export class LayerPanel {
  plane: LayerPlane;
  private ds: Dataset | undefined;
  private state: LayerPanelState = { rules: [], dMin: 0 };
  private view: LayerView | undefined;
  private last: LayerMapResult | undefined;
  private ctx: CanvasRenderingContext2D;
  private drag: { x: number; y: number; cx: number; cy: number } | undefined;
  private queued = false;
  private resizeObserver: ResizeObserver;
  /** Called with the layer name whenever it changes (keyboard shortcuts, rule selection). */
  onChange: (name: string) => void = () => {};

  constructor(private canvas: HTMLCanvasElement, private host: HTMLElement, private readout: HTMLElement, private presetBar: HTMLElement, private freeInput: HTMLInputElement, private status: HTMLElement) {
    const ctx = canvas.getContext('2d');
    if (!ctx) throw new Error('canvas 2D is not available');
    this.ctx = ctx;
    this.plane = parseLayerPlane('hk0') as LayerPlane;
    for (const name of LAYER_PRESETS) {
      const b = el('button', { class: 'preset', text: name, attrs: { 'data-layer': name, type: 'button' } });
      b.addEventListener('click', () => this.setLayer(name));
      presetBar.append(b);
    }
    freeInput.addEventListener('keydown', (e) => { if (e.key === 'Enter') this.setLayer(freeInput.value); });
    canvas.addEventListener('wheel', (e) => this.zoom(e), { passive: false });
    canvas.addEventListener('pointerdown', (e) => {
      if (!this.view) return;
      canvas.setPointerCapture(e.pointerId);
      this.drag = { x: e.clientX, y: e.clientY, cx: this.view.cx, cy: this.view.cy };
    });
    canvas.addEventListener('pointermove', (e) => {
      if (this.drag && this.view) {
        this.view = { ...this.view, cx: this.drag.cx - (e.clientX - this.drag.x) / this.view.scale, cy: this.drag.cy + (e.clientY - this.drag.y) / this.view.scale };
        this.request();
      } else this.hover(e);
    });
    canvas.addEventListener('pointerup', () => { this.drag = undefined; });
    canvas.addEventListener('pointerleave', () => { this.readout.textContent = ''; });
    canvas.addEventListener('dblclick', () => { this.view = undefined; this.request(); });
    this.resizeObserver = new ResizeObserver(() => this.request());
    this.resizeObserver.observe(host);
    this.markPreset();
  }

  setData(ds: Dataset | undefined): void {
    this.ds = ds;
    this.view = undefined;
    this.request();
  }

  setState(s: LayerPanelState): void {
    this.state = s;
    this.request();
  }

  /** Switches to a layer by name (preset, hkN form or 'u,v,w,n'); errors show beside the input. */
  setLayer(name: string): boolean {
    const p = parseLayerPlane(name);
    if (typeof p === 'string') { this.status.textContent = p; this.status.classList.add('error'); return false; }
    this.status.textContent = '';
    this.status.classList.remove('error');
    this.plane = p;
    this.freeInput.value = p.name;
    this.view = undefined;
    this.markPreset();
    this.request();
    this.onChange(p.name);
    return true;
  }

  private markPreset(): void {
    for (const b of Array.from(this.presetBar.querySelectorAll('button'))) b.classList.toggle('active', b.dataset.layer === this.plane.name);
  }

  private zoom(e: WheelEvent): void {
    e.preventDefault();
    if (!this.view) return;
    const rect = this.canvas.getBoundingClientRect();
    const mx = e.clientX - rect.left - rect.width / 2, my = e.clientY - rect.top - rect.height / 2;
    const f = Math.exp(-e.deltaY * 0.0015);
    const v = this.view;
    // Keep the point under the pointer fixed.
    const wx = v.cx + mx / v.scale, wy = v.cy - my / v.scale;
    const scale = Math.min(1e5, Math.max(5, v.scale * f));
    this.view = { scale, cx: wx - mx / scale, cy: wy + my / scale };
    this.request();
  }

  private hover(e: PointerEvent): void {
    const r = this.last, ds = this.ds;
    if (!r || !ds) return;
    const rect = this.canvas.getBoundingClientRect();
    const x = e.clientX - rect.left, y = e.clientY - rect.top;
    let best = -1, bestD = 12;
    for (let j = 0; j < r.spotCount; j++) {
      const d = Math.hypot(r.spotX[j] - x, r.spotY[j] - y);
      if (d < bestD) { bestD = d; best = j; }
    }
    if (best < 0) { this.readout.textContent = ''; return; }
    const row = r.spotRow[best], t = ds.table;
    const forbidden = this.state.rules.length > 0 && anyRuleForbids(this.state.rules, t.h[row], t.k[row], t.l[row]);
    // Calculated intensities are row for row with the data (unscaled |F|^2).
    const calc = this.state.calc && this.state.calc.n === t.n ? `   I calc ${fmt(this.state.calc.i[row], 1)} (unscaled)` : '';
    this.readout.textContent = `${t.h[row]} ${t.k[row]} ${t.l[row]}   I ${fmt(t.i[row], 1)}   \u03c3 ${fmt(t.sigma[row], 1)}   I/\u03c3 ${fmt(ds.iOverSigma[row], 1)}   d ${fmt(1 / ds.dstar[row], 3)} \u00c5${calc}${forbidden ? '   forbidden by the selection' : ''}`;
  }

  request(): void {
    if (this.queued) return;
    this.queued = true;
    requestAnimationFrame(() => { this.queued = false; this.draw(); });
  }

  /** Number of spots in the last picture (tests read it from the canvas' data attribute too). */
  get spotCount(): number {
    return this.last?.spotCount ?? 0;
  }

  draw(): void {
    const w = Math.max(50, Math.floor(this.host.clientWidth)), h = Math.max(50, Math.floor(this.host.clientHeight));
    if (this.canvas.width !== w || this.canvas.height !== h) { this.canvas.width = w; this.canvas.height = h; }
    const ds = this.ds;
    if (!ds) { this.ctx.fillStyle = '#11141c'; this.ctx.fillRect(0, 0, w, h); return; }
    const rules = this.state.rules;
    const opts = {
      width: w, height: h, plane: this.plane, recip: ds.recip, data: ds.table, calc: this.state.calc,
      forbidden: rules.length ? (hh: number, kk: number, ll: number) => anyRuleForbids(rules, hh, kk, ll) : undefined,
      ruleText: this.state.ruleText, title: ds.name, textScale: w >= 560 ? 2 : 1, dMin: this.state.dMin,
    };
    if (!this.view) this.view = fitLayerView(opts);
    const r = drawLayerMap({ ...opts, view: this.view });
    this.last = r;
    this.ctx.putImageData(new ImageData(r.image.data as Uint8ClampedArray<ArrayBuffer>, r.image.width, r.image.height), 0, 0);
    this.canvas.dataset.spots = String(r.spotCount);
    this.canvas.dataset.layer = this.plane.name;
    this.canvas.dataset.calc = this.state.calc ? 'yes' : 'no';
    let onThis = 0;
    for (let j = 0; j < ds.table.n; j++) if (onLayer(this.plane, ds.table.h[j], ds.table.k[j], ds.table.l[j])) onThis++;
    this.status.textContent = `${onThis.toLocaleString('en')} reflections on this layer`;
    this.status.classList.remove('error');
  }

  /** Saves the current picture as a PNG file. */
  exportPng(): void {
    this.canvas.toBlob((blob) => {
      if (!blob) return;
      const a = el('a', { attrs: { download: `layer-${this.plane.name.replace(/[^\w-]+/g, '_')}.png` } });
      a.href = URL.createObjectURL(blob);
      document.body.append(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(a.href), 10_000);
    }, 'image/png');
  }

  dispose(): void {
    this.resizeObserver.disconnect();
    clear(this.presetBar);
  }
}

