import type { ReflectionTable } from '../core';
import type { AnalysisView } from './analysis-view';
import type { FromWorker, LoadStage, ToWorker } from './worker-protocol';

export interface LoaderEvents {
  progress(stage: LoadStage, fraction: number, name: string): void;
  table(table: ReflectionTable, name: string): void;
  analysis(analysis: AnalysisView, name: string): void;
  error(message: string, name: string): void;
  model(calc: Float32Array, name: string, warnings: string[]): void;
  modelError(message: string): void;
}

/**
 * Starts loads in the data worker. A new load cancels the one running (the
 * worker is ended and a fresh one started), so answers never mix.
 */
export class DataLoader {
  private worker: Worker | undefined;
  private seq = 0;
  /** Model jobs use negative ids, so they never collide with data loads. */
  private modelSeq = 0;
  private busy = false;
  private name = '';

  constructor(private events: LoaderEvents) {}

  loadBytes(name: string, bytes: ArrayBuffer): void {
    this.start({ type: 'load', id: 0, name, bytes }, [bytes]);
  }

  loadUrl(name: string, url: string): void {
    this.start({ type: 'load', id: 0, name, url });
  }

  /** Calculated intensities of a trial model at the given indices (the loaded data's). */
  loadModel(name: string, source: { bytes?: ArrayBuffer; url?: string }, h: Int16Array, k: Int16Array, l: Int16Array): void {
    this.ensureWorker();
    const id = ++this.modelSeq;
    const cols = { h: h.slice(), k: k.slice(), l: l.slice() };
    const transfer: Transferable[] = [cols.h.buffer, cols.k.buffer, cols.l.buffer];
    if (source.bytes) transfer.push(source.bytes);
    this.worker!.postMessage({ type: 'model', id: -id, name, ...source, ...cols }, transfer);
  }

  private ensureWorker(): void {
    if (this.worker) return;
    this.worker = new Worker(new URL('./data-worker.ts', import.meta.url), { type: 'module' });
    this.worker.onmessage = (e: MessageEvent<FromWorker>) => this.receive(e.data);
    this.worker.onerror = (e) => { this.busy = false; this.events.error(`the data worker failed: ${e.message || 'unknown error'}`, this.name); };
  }

  private start(msg: ToWorker, transfer: Transferable[] = []): void {
    if (this.busy && this.worker) { this.worker.terminate(); this.worker = undefined; }
    this.ensureWorker();
    const id = ++this.seq;
    this.busy = true;
    this.name = msg.name;
    this.worker!.postMessage({ ...msg, id }, transfer);
  }

  private receive(m: FromWorker): void {
    if (m.id < 0) {
      if (-m.id !== this.modelSeq) return;
      if (m.type === 'model') this.events.model(m.calc, m.name, m.warnings);
      else if (m.type === 'error') this.events.modelError(m.message);
      return;
    }
    if (m.id !== this.seq) return;
    switch (m.type) {
      case 'progress': this.events.progress(m.stage, m.fraction, this.name); break;
      case 'table':
        this.events.table({ n: m.n, h: m.h, k: m.k, l: m.l, i: m.i, sigma: m.sigma, meta: m.meta }, this.name);
        break;
      case 'analysis': this.busy = false; this.events.analysis(m.analysis, this.name); break;
      case 'error': this.busy = false; this.events.error(m.message, this.name); break;
    }
  }

  dispose(): void {
    this.worker?.terminate();
    this.worker = undefined;
  }
}
