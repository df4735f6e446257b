/**
 * Helpers for benchmark files (tests/bench/*.bench.ts), see run.mjs for the row format.
 */
export interface BenchRow {
  readonly name: string;
  readonly median: number;
  readonly unit: string;
  readonly runs: number;
  readonly target?: string;
  readonly note?: string;
}

/** Print one result row in the format run.mjs collects. */
export function reportBench(bench: string, row: BenchRow): void {
  process.stdout.write(JSON.stringify({ bench, ...row }) + '\n');
}

export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/** Run fn `runs` times after `warmup` untimed runs; wall-clock seconds of each timed run. */
export function timeRuns(fn: () => void, runs: number, warmup = 1): number[] {
  for (let j = 0; j < warmup; j++) fn();
  const t: number[] = [];
  for (let j = 0; j < runs; j++) {
    const t0 = performance.now();
    fn();
    t.push((performance.now() - t0) / 1000);
  }
  return t;
}
