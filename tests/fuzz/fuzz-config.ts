/**
 * Fixed seed and run counts for the fuzz tests. CI uses the defaults (same inputs
 * every run); the bench's long run and a curious developer raise them:
 *   LACUNA_FUZZ_SEED=7 LACUNA_FUZZ_RUNS=5000 npx vitest run tests/fuzz
 */
export const FUZZ_SEED = Number(process.env.LACUNA_FUZZ_SEED ?? 20261201);
/** Runs per reader property; command-line properties use a fifth of it (they do more per run). */
export const FUZZ_RUNS = Number(process.env.LACUNA_FUZZ_RUNS ?? 1000);

export const enc = (s: string) => new TextEncoder().encode(s);
