/**
 * cos and sin of an angle given in turns (1 turn = 2 pi), for the structure-factor loop.
 *
 * Phases h.(R x + t) are naturally in turns, so the argument reduction is exact (drop the
 * integer part), and a 1024-entry table plus a short Taylor correction gives about 1e-15
 * absolute error while costing much less than Math.cos + Math.sin.
 */
const N = 1024;
const STEP = (2 * Math.PI) / N;
export const COS_TABLE = new Float64Array(N + 1);
export const SIN_TABLE = new Float64Array(N + 1);
for (let j = 0; j <= N; j++) {
  COS_TABLE[j] = Math.cos(j * STEP);
  SIN_TABLE[j] = Math.sin(j * STEP);
}
export const TURN_TABLE_SIZE = N;
export const TURN_TABLE_STEP = STEP;

/**
 * Writes cos and sin of `turns` into out[0], out[1]. The kernel inlines the same steps;
 * this function is the readable reference and is what the tests exercise.
 */
export function cosSinTurns(turns: number, out: Float64Array): void {
  const u = (turns - Math.floor(turns)) * N;
  const j = Math.round(u);
  const d = (u - j) * STEP; // |d| <= pi/N
  const d2 = d * d;
  const cd = 1 - d2 * (0.5 - d2 / 24);
  const sd = d * (1 - d2 / 6);
  const c = COS_TABLE[j];
  const s = SIN_TABLE[j];
  out[0] = c * cd - s * sd;
  out[1] = s * cd + c * sd;
}
