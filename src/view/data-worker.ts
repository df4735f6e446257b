/// <reference lib="webworker" />
import { isGzip, readReflections } from '../io';
import { calculatedIntensitiesOf, parseModelCif, prepareModel } from '../model';
import { runAnalysis } from './analysis-bridge';
import { fileTooLargeMessage } from './size-limit';
import type { FromWorker, ToWorker } from './worker-protocol';

/**
 * Reading, unpacking and analysis off the page's thread, so the page stays
 * responsive with a million reflections. The columns travel back as
 * transferred buffers (no copy); the table is posted before the analysis so
 * the first picture does not wait for the ranking.
 */
const scope = self as unknown as DedicatedWorkerGlobalScope;

function post(msg: FromWorker, transfer: Transferable[] = []): void {
  scope.postMessage(msg, transfer);
}

/** Thrown when a file turns out larger than the page can hold (see size-limit.ts). */
class TooLarge extends Error {}

/** Gather a stream's chunks, stopping as soon as they pass the page's limit. */
async function collect(stream: ReadableStream<Uint8Array>, name: string, unpacked: boolean, onChunk?: (got: number) => void): Promise<Uint8Array> {
  const reader = stream.getReader();
  const parts: Uint8Array[] = [];
  let got = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    parts.push(value);
    got += value.length;
    const tooLarge = fileTooLargeMessage(name, got, unpacked);
    if (tooLarge) { void reader.cancel(); throw new TooLarge(tooLarge); }
    onChunk?.(got);
  }
  const out = new Uint8Array(got);
  let o = 0;
  for (const p of parts) { out.set(p, o); o += p.length; }
  return out;
}

async function gunzip(bytes: Uint8Array, name: string): Promise<Uint8Array> {
  const stream = new Blob([bytes as BlobPart]).stream().pipeThrough(new DecompressionStream('gzip'));
  return collect(stream, name, true);
}

async function fetchBytes(id: number, url: string): Promise<Uint8Array> {
  const res = await fetch(url, { credentials: 'same-origin' });
  if (!res.ok) throw new Error(`could not fetch ${url}: the server answered ${res.status} ${res.statusText}`);
  const total = Number(res.headers.get('content-length') ?? 0);
  const name = url.split('/').pop() || url;
  const tooLarge = fileTooLargeMessage(name, total);
  if (tooLarge) { void res.body?.cancel(); throw new TooLarge(tooLarge); }
  if (!res.body) return new Uint8Array(await res.arrayBuffer());
  return collect(res.body, name, false, (got) => {
    if (total > 0) post({ type: 'progress', id, stage: 'reading', fraction: Math.min(1, got / total) });
  });
}

async function bytesOf(id: number, msg: { url?: string; bytes?: ArrayBuffer }): Promise<Uint8Array> {
  let bytes = msg.url !== undefined ? await fetchBytes(id, msg.url) : new Uint8Array(msg.bytes!);
  if (isGzip(bytes)) bytes = await gunzip(bytes, msg.url?.split('/').pop() || 'the model');
  return bytes;
}

async function computeModel(msg: Extract<ToWorker, { type: 'model' }>): Promise<void> {
  const { id, name } = msg;
  try {
    const bytes = await bytesOf(id, msg);
    let text: string;
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    } catch {
      post({ type: 'error', id, message: `${name}: the model file is not UTF-8 text`, model: true });
      return;
    }
    const r = parseModelCif(text, name);
    if (!r.ok) { post({ type: 'error', id, message: r.error.describe(), model: true }); return; }
    const calc = Float32Array.from(calculatedIntensitiesOf(prepareModel(r.value), msg.h, msg.k, msg.l));
    post({ type: 'model', id, name, calc, warnings: r.value.warnings }, [calc.buffer]);
  } catch (err) {
    post({ type: 'error', id, message: `${name}: ${err instanceof Error ? err.message : String(err)}`, internal: true, model: true });
  }
}

scope.onmessage = async (e: MessageEvent<ToWorker>) => {
  const msg = e.data;
  if (msg.type === 'model') { await computeModel(msg); return; }
  if (msg.type !== 'load') return;
  const { id, name } = msg;
  try {
    post({ type: 'progress', id, stage: 'reading', fraction: 0 });
    let bytes = msg.url !== undefined ? await fetchBytes(id, msg.url) : new Uint8Array(msg.bytes!);
    if (isGzip(bytes)) {
      post({ type: 'progress', id, stage: 'unpacking', fraction: 0 });
      try {
        bytes = await gunzip(bytes, name);
      } catch (err) {
        if (err instanceof TooLarge) { post({ type: 'error', id, message: err.message }); return; }
        post({ type: 'error', id, message: `${name}: the file looks gzip-compressed but does not unpack (${err instanceof Error ? err.message : String(err)}); it may be truncated` });
        return;
      }
    }
    post({ type: 'progress', id, stage: 'parsing', fraction: 0 });
    const r = readReflections(bytes, { source: name.replace(/\.gz$/i, '') });
    if (!r.ok) { post({ type: 'error', id, message: r.error.describe() }); return; }
    const t = r.value;
    if (t.n === 0) {
      const why = t.meta.rejectedCount > 0 ? `: all ${t.meta.rejectedCount} rows were rejected (${Object.keys(t.meta.rejectedByReason).join('; ')})` : '';
      post({ type: 'error', id, message: `${name}: no usable reflections${why}` });
      return;
    }
    // Copies so the transferred buffers are exactly the columns (subarrays may share a larger buffer).
    const cols = { h: t.h.slice(), k: t.k.slice(), l: t.l.slice(), i: t.i.slice(), sigma: t.sigma.slice() };
    post({ type: 'table', id, n: t.n, meta: t.meta, ...cols }, [cols.h.buffer, cols.k.buffer, cols.l.buffer, cols.i.buffer, cols.sigma.buffer]);
    post({ type: 'progress', id, stage: 'analysing', fraction: 0 });
    const analysis = runAnalysis(t, (f) => post({ type: 'progress', id, stage: 'analysing', fraction: f }));
    post({ type: 'analysis', id, analysis });
  } catch (err) {
    if (err instanceof TooLarge) { post({ type: 'error', id, message: err.message }); return; }
    post({ type: 'error', id, message: `${name}: ${err instanceof Error ? err.message : String(err)}`, internal: true });
  }
};
