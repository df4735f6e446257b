import type { ReflectionMeta } from '../core';
import type { AnalysisView } from './analysis-view';

/** Messages between the page and data-worker.ts. `id` ties answers to one load. */
export type ToWorker =
  | { type: 'load'; id: number; name: string; bytes?: ArrayBuffer; url?: string }
  /** A trial model (CIF): calculated intensities at the given indices. */
  | { type: 'model'; id: number; name: string; bytes?: ArrayBuffer; url?: string; h: Int16Array; k: Int16Array; l: Int16Array };

export type LoadStage = 'reading' | 'unpacking' | 'parsing' | 'analysing';

export type FromWorker =
  | { type: 'progress'; id: number; stage: LoadStage; fraction: number }
  | { type: 'table'; id: number; n: number; meta: ReflectionMeta; h: Int16Array; k: Int16Array; l: Int16Array; i: Float32Array; sigma: Float32Array }
  | { type: 'analysis'; id: number; analysis: AnalysisView }
  | { type: 'model'; id: number; name: string; calc: Float32Array; warnings: string[] }
  | { type: 'error'; id: number; message: string; internal?: boolean; model?: boolean };
