/// <reference types="vite/client" />
import './styles.css';
import GUI from 'lil-gui';
import type { ReflectionTable } from '../core';
import { byId, clear, el, fmt } from './dom';
import { makeDataset, type Dataset } from './dataset';
import { DataLoader } from './loader';
import type { AnalysisView } from './analysis-view';
import { chooseRenderer, type RendererChoice } from './render3d/choose-renderer';
import { createPointRenderer, type PointRenderer } from './render3d/point-renderer';
import { LatticeView } from './render3d/lattice-view';
import { buildCloud, type ColourMode } from './render3d/lattice-cloud';
import { LayerPanel } from './layer-panel';
import { renderSummary } from './panels/summary';
import { CAUTION, renderCandidates } from './panels/candidates';
import { renderConditions } from './panels/conditions';
import { renderStats } from './panels/stats-plots';
import { inZone, layerForRule, ruleForbids, type Rule } from './rules';
import { syntheticTable } from './synthetic';
import { installShortcuts } from './shortcuts';
import { buildGuidePanel, type GuidePanel } from './guide';
import { allSettings } from '../symmetry';
import { parseProfile, type LabProfile } from '../profile';
import type { PointCloud } from '../../shaders-free-render';
import { fileTooLargeMessage } from './size-limit';

/** The demo list (public/demo/demo.json, invented samples) names the data set opened when the address names none. */
export const DEMO_INDEX = 'demo/demo.json';
const FALLBACK_DEMO = 'demo/qm-101.cif';

interface DemoIndex { default?: string; samples?: Array<{ file: string; title?: string }> }

async function demoIndex(): Promise<DemoIndex> {
  try {
    const r = await fetch(DEMO_INDEX);
    return r.ok ? ((await r.json()) as DemoIndex) : {};
  } catch {
    return {};
  }
}

const params = new URLSearchParams(location.search);

interface Settings {
  colour: ColourMode;
  dMin: number;
  /** -5 stands for "show all". */
  minIOverSigma: number;
  spotScale: number;
}

class App {
  ds: Dataset | undefined;
  analysis: AnalysisView | undefined;
  candidate = -1;
  condition = -1;
  settings: Settings = { colour: 'intensity', dMin: 0, minIOverSigma: -5, spotScale: 1 };
  lattice: LatticeView;
  layer: LayerPanel;
  loader: DataLoader;
  cloud: PointCloud | undefined;
  /** Calculated intensities of the loaded trial model, row for row with the data. */
  calc: { n: number; h: Int16Array; k: Int16Array; l: Int16Array; i: Float32Array; name: string } | undefined;
  /** A model to load once the data are in (?model=URL). */
  pendingModelUrl: string | undefined;
  gui: GUI;
  guide: GuidePanel | undefined;
  /** The lab profile whose house rules the guide explains (public/profiles); undefined = built-in defaults. */
  profile: LabProfile | undefined;
  private dMinController: ReturnType<GUI['add']> | undefined;
  private loadStarted = 0;
  private firstPictureDone = false;

  constructor(renderer: PointRenderer, choice: RendererChoice) {
    byId('caution').textContent = CAUTION;
    this.lattice = new LatticeView(byId('lattice-host'), renderer, (row) => this.showPick(row));
    const badge = byId('renderer-badge');
    badge.textContent = choice.kind === 'cpu' ? 'CPU renderer' : 'WebGL renderer';
    badge.title = choice.reason;
    badge.dataset.renderer = choice.kind;
    this.layer = new LayerPanel(byId<HTMLCanvasElement>('layer-canvas'), byId('layer-host'), byId('layer-readout'), byId('layer-presets'), byId<HTMLInputElement>('layer-free'), byId('layer-status'));
    byId('layer-export').addEventListener('click', () => this.layer.exportPng());
    this.layer.onChange = () => this.updateGuide();
    this.loader = new DataLoader({
      progress: (stage, f, name) => this.progress(`${stage} ${name}`, f),
      table: (t, name) => this.onTable(t, name),
      analysis: (a) => this.onAnalysis(a),
      error: (msg) => this.onError(msg),
      model: (calc, name, warnings) => this.onModel(calc, name, warnings),
      modelError: (msg) => this.onError(msg),
    });
    this.gui = this.makeGui();
    this.wireFileInputs();
    installShortcuts(this);
    renderSummary(byId('summary-panel').querySelector('.body') as HTMLElement, undefined);
    this.mountGuide();
  }

  private makeGui(): GUI {
    const gui = new GUI({ container: byId('settings-slot'), title: 'Settings', injectStyles: false, closeFolders: true });
    gui.add(this.settings, 'colour', { 'intensity I': 'intensity', 'I/sigma': 'isigma' }).name('colour by').onChange(() => this.restyle());
    this.dMinController = gui.add(this.settings, 'dMin', 0, 5, 0.01).name('hide d below (\u00c5)').onFinishChange(() => this.restyle());
    gui.add(this.settings, 'minIOverSigma', -5, 30, 0.5).name('3D: hide I/\u03c3 below (-5 = all)').onFinishChange(() => this.restyle());
    gui.add(this.settings, 'spotScale', 0.5, 3, 0.25).name('spot size').onChange(() => this.restyle());
    gui.add({ renderer: this.lattice.kind }, 'renderer', ['cpu', 'webgl', 'auto']).name('renderer (reloads)').onChange((v: string) => {
      const p = new URLSearchParams(location.search);
      p.set('renderer', v);
      location.search = p.toString();
    });
    gui.close();
    return gui;
  }

  private mountGuide(): void {
    const slot = byId('guide-slot');
    slot.hidden = false;
    this.guide = buildGuidePanel(slot, {}, { onAxisHighlight: (axis) => this.lattice.setHighlightAxis(axis) });
  }

  /** Tells the conventions guide what is on screen: data, layer, selected candidate and its sibling settings. */
  updateGuide(): void {
    if (!this.guide) return;
    const a = this.analysis;
    const c = a && this.candidate >= 0 ? a.candidates[this.candidate] : undefined;
    const siblings = c ? allSettings().filter((s) => s.number === c.number && s.hm !== c.hm).map((s) => ({ hm: s.hm, rules: s.conditions })) : undefined;
    this.guide.update({
      table: this.ds?.table,
      cell: this.ds && !this.ds.cellAssumed ? this.ds.cell.params() : undefined,
      layer: this.layer.plane,
      candidate: c ? { hm: c.hm, rules: c.rules } : undefined,
      settings: siblings,
      profile: this.profile,
    });
  }

  private wireFileInputs(): void {
    const input = byId<HTMLInputElement>('file-input');
    byId('open-file').addEventListener('click', () => input.click());
    input.addEventListener('change', () => {
      const f = input.files?.[0];
      if (f) this.openFile(f);
      input.value = '';
    });
    const veil = byId('drop-veil');
    let depth = 0;
    window.addEventListener('dragenter', (e) => { if (e.dataTransfer?.types.includes('Files')) { depth++; veil.hidden = false; e.preventDefault(); } });
    window.addEventListener('dragover', (e) => { if (e.dataTransfer?.types.includes('Files')) e.preventDefault(); });
    window.addEventListener('dragleave', () => { depth = Math.max(0, depth - 1); if (depth === 0) veil.hidden = true; });
    window.addEventListener('drop', (e) => {
      e.preventDefault();
      depth = 0;
      veil.hidden = true;
      const f = e.dataTransfer?.files?.[0];
      if (f) this.openFile(f);
    });
    byId('message').querySelector('.close')!.addEventListener('click', () => { byId('message').hidden = true; });
    const modelInput = byId<HTMLInputElement>('model-input');
    byId('open-model').addEventListener('click', () => modelInput.click());
    modelInput.addEventListener('change', () => {
      const f = modelInput.files?.[0];
      modelInput.value = '';
      if (!f || !this.ds) return;
      void f.arrayBuffer().then((buf) => this.loader.loadModel(f.name, { bytes: buf }, this.ds!.table.h, this.ds!.table.k, this.ds!.table.l));
    });
  }

  openFile(f: File): void {
    // refuse before reading: a file the tab cannot hold would freeze it
    const tooLarge = fileTooLargeMessage(f.name, f.size);
    if (tooLarge) { this.onError(tooLarge); return; }
    this.loadStarted = performance.now();
    this.firstPictureDone = false;
    this.progress(`reading ${f.name}`, 0);
    void f.arrayBuffer().then((buf) => this.loader.loadBytes(f.name, buf), (e: unknown) => this.onError(`${f.name}: could not read the file (${String(e)})`));
  }

  openUrl(url: string): void {
    let u: URL;
    try {
      u = new URL(url, location.href);
    } catch {
      this.onError(`?data=${url}: not a valid address`);
      return;
    }
    if (u.origin !== location.origin) { this.onError(`?data=${url}: only data from this server can be opened by address (same origin)`); return; }
    this.loadStarted = performance.now();
    this.firstPictureDone = false;
    this.loader.loadUrl(decodeURIComponent(u.pathname.split('/').pop() || url), u.href);
  }

  /** Opens a table made in the page (synthetic data), skipping the worker's reading step. */
  openTable(t: ReflectionTable, name: string): void {
    this.loadStarted = performance.now();
    this.onTable(t, name);
    this.onAnalysis({ available: false, notes: ['Invented data made in the page; no ranking is run for it.'], candidates: [], conditions: [] });
  }

  progress(label: string, fraction: number): void {
    const p = byId('progress');
    p.hidden = false;
    // Stages without a measurable fraction (parsing) show a moving bar instead of a frozen one.
    p.classList.toggle('busy', fraction <= 0);
    (p.querySelector('.fill') as HTMLElement).style.width = `${Math.round(Math.max(0.03, fraction) * 100)}%`;
    p.querySelector('.label')!.textContent = label;
  }

  private endProgress(): void {
    byId('progress').hidden = true;
  }

  onTable(t: ReflectionTable, name: string): void {
    const ds = makeDataset(t, name);
    this.ds = ds;
    this.analysis = undefined;
    this.calc = undefined;
    byId('open-model').textContent = 'Model\u2026';
    delete document.body.dataset.model;
    this.candidate = -1;
    this.condition = -1;
    byId('message').hidden = true;
    const title = byId('dataset-name');
    title.textContent = `${name}${t.meta.block ? ' \u00b7 ' + t.meta.block : ''} \u00b7 ${t.n.toLocaleString('en')} reflections`;
    title.title = title.textContent;
    if (this.dMinController) {
      this.settings.dMin = 0;
      this.dMinController.min(0).max(Math.max(1, Math.ceil(ds.dMax * 10) / 10)).updateDisplay();
    }
    this.lattice.setData(ds);
    this.layer.setData(ds);
    renderSummary(byId('summary-panel').querySelector('.body') as HTMLElement, ds);
    if (ds.cellAssumed) this.note('This file gives no unit cell: the lattice is drawn in index space (a unit cube per cell). Give the cell in the file for true geometry.');
    this.restyle();
    this.showPick(-1);
    this.refreshEvidence();
    this.progress(`analysing ${name}`, 0.05);
    if (this.pendingModelUrl) { const u = this.pendingModelUrl; this.pendingModelUrl = undefined; this.openModelUrl(u); }
    requestAnimationFrame(() => {
      if (!this.firstPictureDone) {
        this.firstPictureDone = true;
        document.body.dataset.firstPictureMs = String(Math.round(performance.now() - this.loadStarted));
      }
    });
  }

  /** Opens a trial model (CIF) by address; its intensities appear beside the measured ones in the layer map. */
  openModelUrl(url: string): void {
    const u = new URL(url, location.href);
    if (u.origin !== location.origin) { this.onError(`?model=${url}: only models from this server can be opened by address`); return; }
    if (!this.ds) { this.pendingModelUrl = u.href; return; }
    this.loader.loadModel(decodeURIComponent(u.pathname.split('/').pop() || url), { url: u.href }, this.ds.table.h, this.ds.table.k, this.ds.table.l);
  }

  onModel(calc: Float32Array, name: string, warnings: string[]): void {
    const ds = this.ds;
    if (!ds || calc.length !== ds.table.n) return;
    this.calc = { n: ds.table.n, h: ds.table.h, k: ds.table.k, l: ds.table.l, i: calc, name };
    byId('open-model').textContent = `Model: ${name}`;
    if (warnings.length) this.note(`${name}: ${warnings.join('; ')}`);
    this.restyle();
    document.body.dataset.model = name;
  }

  onAnalysis(a: AnalysisView): void {
    this.analysis = a;
    this.endProgress();
    if (a.available && a.candidates.length > 0) this.candidate = 0;
    this.restyle();
    this.refreshEvidence();
    document.body.dataset.state = 'ready';
  }

  onError(message: string): void {
    this.endProgress();
    const box = byId('message');
    box.hidden = false;
    box.classList.add('error');
    const kept = this.ds ? ` The data shown are still ${this.ds.name}.` : '';
    box.querySelector('.text')!.textContent = `Could not open: ${message}.${kept}`;
    document.body.dataset.state = this.ds ? 'ready' : 'error';
  }

  note(message: string): void {
    const box = byId('message');
    box.hidden = false;
    box.classList.remove('error');
    box.querySelector('.text')!.textContent = message;
  }

  /** The rules whose forbidden reflections are marked: the selected condition, else the selected candidate's. */
  activeRules(): { rules: readonly Rule[]; label: string; zone?: Rule } {
    const a = this.analysis;
    if (a && this.condition >= 0 && a.conditions[this.condition]) {
      const c = a.conditions[this.condition];
      return { rules: [c], label: c.text, zone: c.zone.length ? c : undefined };
    }
    if (a && this.candidate >= 0 && a.candidates[this.candidate]) {
      const c = a.candidates[this.candidate];
      return { rules: c.rules, label: c.hm };
    }
    return { rules: [], label: '' };
  }

  restyle(): void {
    const ds = this.ds;
    if (!ds) return;
    const act = this.activeRules();
    const minIos = this.settings.minIOverSigma > -5 ? this.settings.minIOverSigma : undefined;
    const { cloud } = buildCloud(ds, { colour: this.settings.colour, rules: act.rules, zone: act.zone, dMin: this.settings.dMin, minIOverSigma: minIos }, this.cloud);
    this.cloud = cloud;
    this.lattice.setCloud(cloud, this.settings.spotScale);
    this.layer.setState({ rules: act.rules, ruleText: act.label || undefined, dMin: this.settings.dMin, calc: this.calc });
  }

  refreshEvidence(): void {
    this.updateGuide();
    const a = this.analysis;
    renderCandidates(byId('candidates-panel').querySelector('.body') as HTMLElement, a, this.candidate, (j) => this.selectCandidate(j));
    renderConditions(byId('conditions-panel').querySelector('.body') as HTMLElement, a, this.condition, (j) => this.selectCondition(j));
    const act = this.activeRules();
    renderStats(byId('stats-strip'), this.ds, a?.statistics, act.rules, act.label);
  }

  selectCandidate(j: number): void {
    this.candidate = j;
    this.condition = -1;
    this.restyle();
    this.refreshEvidence();
  }

  selectCondition(j: number): void {
    this.condition = j;
    const c = this.analysis?.conditions[j];
    if (c) {
      const layer = layerForRule(c);
      if (layer) this.layer.setLayer(layer);
    }
    this.restyle();
    this.refreshEvidence();
  }

  stepCandidate(delta: number): void {
    const n = this.analysis?.candidates.length ?? 0;
    if (n === 0) return;
    this.selectCandidate(((this.candidate < 0 ? 0 : this.candidate + delta) + n) % n);
  }

  showPick(row: number): void {
    const info = byId('pick-info');
    clear(info);
    this.lattice.setPicked(row);
    const ds = this.ds;
    if (!ds || row < 0) { info.append(el('span', { class: 'muted', text: 'Click a spot to read it.' })); return; }
    const t = ds.table, h = t.h[row], k = t.k[row], l = t.l[row];
    info.dataset.hkl = `${h} ${k} ${l}`;
    info.append(
      el('span', { class: 'hkl', text: `h k l = ${h} ${k} ${l}` }),
      el('span', { text: `d ${fmt(1 / ds.dstar[row], 3)} \u00c5` }),
      el('span', { text: `I ${fmt(t.i[row], 1)}` }),
      el('span', { text: `\u03c3 ${fmt(t.sigma[row], 1)}` }),
      el('span', { text: `I/\u03c3 ${fmt(ds.iOverSigma[row], 1)}` }),
    );
    if (this.calc) info.append(el('span', { text: `I calc ${fmt(this.calc.i[row], 1)} (unscaled, ${this.calc.name})` }));
    const tested = (this.analysis?.conditions ?? []).filter((c) => inZone(c, h, k, l) && c.zone.length + (c.coeffs.some((x) => x !== 0) ? 1 : 0) > 0);
    const lines = tested.filter((c) => ruleForbids(c, h, k, l)).map((c) => c.text);
    const allowed = tested.filter((c) => !ruleForbids(c, h, k, l)).map((c) => c.text);
    if (lines.length) info.append(el('span', { class: 'tests forbidden', text: `would be absent under: ${lines.join('; ')}` }));
    if (allowed.length) info.append(el('span', { class: 'tests', text: `tests and obeys: ${allowed.slice(0, 6).join('; ')}${allowed.length > 6 ? ' ...' : ''}` }));
    if (!lines.length && !allowed.length) info.append(el('span', { class: 'tests muted', text: 'tests no condition in the table' }));
  }

  /** Fills the lab-profile chooser from public/profiles/index.json (files served by this server). */
  async listProfiles(): Promise<void> {
    const sel = byId<HTMLSelectElement>('profile-select');
    let list: Array<{ file: string; name: string }> = [];
    try {
      const r = await fetch('profiles/index.json');
      if (r.ok) list = ((await r.json()) as { profiles?: Array<{ file: string; name: string }> }).profiles ?? [];
    } catch {
      list = [];
    }
    if (list.length === 0) return;
    clear(sel);
    sel.append(el('option', { text: 'built-in lab defaults', attrs: { value: '' } }));
    for (const p of list) sel.append(el('option', { text: p.name, attrs: { value: p.file } }));
    sel.hidden = false;
    sel.addEventListener('change', () => void this.useProfile(sel.value));
  }

  async useProfile(file: string): Promise<void> {
    if (!file) { this.profile = undefined; this.updateGuide(); return; }
    try {
      const r = await fetch(`profiles/${encodeURIComponent(file)}`);
      if (!r.ok) throw new Error(`the server answered ${r.status}`);
      const parsed = parseProfile(await r.text(), file);
      if (!parsed.ok) { this.onError(parsed.error.describe()); return; }
      this.profile = parsed.value;
      this.updateGuide();
    } catch (e) {
      this.onError(`${file}: ${e instanceof Error ? e.message : String(e)}`);
    }
  }

  /** Fills the demo chooser in the top bar. */
  listDemos(samples: Array<{ file: string; title?: string }>): void {
    const sel = byId<HTMLSelectElement>('demo-select');
    if (samples.length === 0) { sel.hidden = true; return; }
    clear(sel);
    sel.append(el('option', { text: 'demo data\u2026', attrs: { value: '' } }));
    for (const s of samples) sel.append(el('option', { text: s.title ? `${s.file}: ${s.title}` : s.file, attrs: { value: s.file } }));
    sel.hidden = false;
    sel.addEventListener('change', () => { if (sel.value) this.openUrl(`demo/${sel.value}`); sel.value = ''; });
  }

  viewAlong(axis: 0 | 1 | 2): void {
    this.lattice.viewAlong(axis);
  }

  runBench(frames: number): void {
    const out = byId('bench-result');
    // Let layout settle, then measure.
    requestAnimationFrame(() => requestAnimationFrame(() => {
      const ms = this.lattice.bench(frames);
      out.textContent = JSON.stringify({ renderer: this.lattice.kind, points: this.ds?.table.n ?? 0, ms_per_frame: Number(ms.toFixed(3)) });
      out.hidden = false;
    }));
  }
}

export type { App };

async function start(): Promise<void> {
  const choice = chooseRenderer(params.get('renderer'));
  const app = new App(await createPointRenderer(choice.kind), choice);
  (window as unknown as { lacuna: App }).lacuna = app;
  // Inputs are wired from here on (tests wait for this before choosing files).
  document.body.dataset.app = 'ready';
  const synthetic = params.get('synthetic');
  const data = params.get('data');
  const bench = Number(params.get('bench') ?? 0);
  const model = params.get('model');
  if (model) app.openModelUrl(model);
  if (synthetic) {
    const n = Math.max(1, Math.min(5_000_000, Number(synthetic) || 1000));
    app.openTable(syntheticTable(n), `synthetic-${n}`);
  } else if (data) {
    app.openUrl(data);
  }
  void app.listProfiles();
  void demoIndex().then((idx) => {
    if (!synthetic && !data) app.openUrl(idx.default ? `demo/${idx.default}` : FALLBACK_DEMO);
    app.listDemos(idx.samples ?? []);
  });
  if (bench > 0) {
    const wait = () => (app.ds ? app.runBench(bench) : setTimeout(wait, 50));
    wait();
  }
}

void start();
