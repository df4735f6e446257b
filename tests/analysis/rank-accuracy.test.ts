import { describe, expect, it } from 'vitest';
import { runSuite, suiteSettings } from './rank-accuracy';

// CI runs a subsample (every 8th standard setting and every 3rd common non-standard one);
// `npm run bench` runs all 230 types and all listed non-standard settings (tests/bench/rank.bench.ts).
// Targets (issue 4): top class right on >= 97 %, truth among the top 5 classes on >= 99 %,
// no wrong class above probability 0.9. The remaining misses in the full run are
// centrosymmetric high-symmetry groups with few atoms, whose statistics look acentric.
describe('ranking accuracy on simulated data (subsample)', () => {
  it('finds the right class of indistinguishable groups', () => {
    const { standard, nonStandard } = suiteSettings();
    expect(standard.length).toBe(230);
    const pick = [...standard.filter((_, j) => j % 8 === 3), ...nonStandard.filter((_, j) => j % 3 === 0)];
    const o = runSuite(pick);
    console.log(`rank accuracy (CI subsample): ${o.top1}/${o.total} top-1, ${o.top3}/${o.total} top-3, ${o.top5}/${o.total} top-5, ${o.confidentWrong} confident wrong\n${o.failures.join('\n')}`);
    expect(o.top1).toBeGreaterThanOrEqual(Math.ceil(0.97 * o.total));
    expect(o.top5).toBeGreaterThanOrEqual(Math.ceil(0.99 * o.total));
    expect(o.confidentWrong).toBe(0);
  }, 600_000);
  it('stays right or honestly unsure on weak, incomplete data', () => {
    const { standard, nonStandard } = suiteSettings();
    const pick = [...standard.filter((_, j) => j % 12 === 5), ...nonStandard.filter((_, j) => j % 6 === 1)];
    const o = runSuite(pick, 1000, 'weak');
    console.log(`rank accuracy, weak data (CI subsample): ${o.top1}/${o.total} top-1, ${o.top3}/${o.total} top-3, ${o.top5}/${o.total} top-5, ${o.confidentWrong} confident wrong\n${o.failures.join('\n')}`);
    expect(o.top1).toBeGreaterThanOrEqual(Math.ceil(0.9 * o.total));
    expect(o.top5).toBeGreaterThanOrEqual(Math.ceil(0.97 * o.total));
    expect(o.confidentWrong).toBe(0);
  }, 600_000);
  it('handles files as deposited: merged to one asymmetric unit, absences removed', () => {
    const { standard, nonStandard } = suiteSettings();
    const pick = [...standard.filter((_, j) => j % 12 === 7), ...nonStandard.filter((_, j) => j % 6 === 2)];
    const o = runSuite(pick, 1000, 'deposited');
    console.log(`rank accuracy, deposited-style files (CI subsample): ${o.top1}/${o.total} top-1, ${o.top3}/${o.total} top-3, ${o.top5}/${o.total} top-5, ${o.confidentWrong} confident wrong\n${o.failures.join('\n')}`);
    // one or two axial reflections per screw axis is thin evidence (the full suite in the bench
    // scores about 99 %); the subsample allows a miss or two, never a confident wrong answer
    expect(o.top1).toBeGreaterThanOrEqual(Math.ceil(0.92 * o.total));
    expect(o.top5).toBeGreaterThanOrEqual(Math.ceil(0.97 * o.total));
    expect(o.confidentWrong).toBe(0);
  }, 600_000);
});
