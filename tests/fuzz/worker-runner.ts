import { Worker } from 'node:worker_threads';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { REPO_ROOT } from '../helpers/paths';
import type { FuzzAnswer, FuzzRequest } from './fuzz-worker';

/**
 * The test side of fuzz-worker.ts: bundles the worker once (vite, like the bench
 * runner), sends it one request at a time and waits at most `timeoutMs` for the
 * answer. A request that takes longer is a hang: the worker is ended, a new one
 * started, and the request reported as a problem.
 */
export class FuzzRunner {
  private worker: Worker | undefined;
  private seq = 0;
  private constructor(private readonly entry: string, private readonly dir: string) {}

  static async start(): Promise<FuzzRunner> {
    const dir = mkdtempSync(join(tmpdir(), 'lacuna-fuzz-bundle-'));
    const { build } = await import('vite');
    await build({
      configFile: false,
      root: REPO_ROOT,
      logLevel: 'error',
      build: {
        ssr: join(REPO_ROOT, 'tests/fuzz/fuzz-worker.ts'),
        outDir: dir,
        emptyOutDir: true,
        target: 'node20',
        minify: false,
        rollupOptions: { output: { entryFileNames: 'fuzz-worker.mjs', format: 'es' } },
      },
    });
    return new FuzzRunner(join(dir, 'fuzz-worker.mjs'), dir);
  }

  private ensure(): Worker {
    if (!this.worker) {
      this.worker = new Worker(this.entry, { resourceLimits: { maxOldGenerationSizeMb: 2048 } });
      this.worker.unref();
    }
    return this.worker;
  }

  run(req: FuzzRequest, timeoutMs = 10_000): Promise<FuzzAnswer> {
    const w = this.ensure();
    const id = ++this.seq;
    return new Promise((resolve) => {
      const done = (a: FuzzAnswer) => {
        clearTimeout(timer);
        w.off('message', onMessage);
        w.off('error', onError);
        resolve(a);
      };
      const onMessage = (m: { id: number; answer: FuzzAnswer }) => { if (m.id === id) done(m.answer); };
      const onError = (e: Error) => { this.worker = undefined; done({ problems: [`worker died: ${e.stack ?? e.message}`], outcome: 'died' }); };
      const timer = setTimeout(() => {
        void w.terminate();
        this.worker = undefined;
        done({ problems: [`no answer within ${timeoutMs} ms: a hang or super-linear time`], outcome: 'timeout' });
      }, timeoutMs);
      w.on('message', onMessage);
      w.on('error', onError);
      w.postMessage({ id, req });
    });
  }

  async stop(): Promise<void> {
    await this.worker?.terminate();
    this.worker = undefined;
    rmSync(this.dir, { recursive: true, force: true });
  }
}

/** A short description of an input for failure reports. */
export function showBytes(b: Uint8Array, max = 400): string {
  const s = Buffer.from(b.subarray(0, max)).toString('latin1');
  return JSON.stringify(s) + (b.length > max ? ` ... (${b.length} bytes)` : '');
}
