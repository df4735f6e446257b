/**
 * The ranking accuracy suite: simulated data (tests/analysis/rank-simulation.ts) for space-group
 * settings, ranked, scored by class of indistinguishable candidates (same Laue class, same
 * absences, same centrosymmetry: the truth counts as found when its class is found).
 */
import { allSettings, type SpaceGroupSetting } from '../../src/symmetry';
import { rankSpaceGroups } from '../../src/analysis';
import { simulateCase, type CaseQuality } from './rank-simulation';

/** Standard settings (first of each number) and common non-standard ones. */
export function suiteSettings(): { standard: SpaceGroupSetting[]; nonStandard: SpaceGroupSetting[] } {
  const all = allSettings();
  const seen = new Set<number>();
  const standard: SpaceGroupSetting[] = [];
  for (const s of all) if (!seen.has(s.number)) { seen.add(s.number); standard.push(s); }
  const names = [
    'P 1 21/n 1', 'P 1 21/a 1', 'C 1 2/c 1', 'I 1 2/a 1', 'P 1 1 21/b', 'P 21 1 1', 'P 1 n 1', 'C 1 c 1', 'I 1 2 1',
    'P n 21 a', 'P b n 21', 'P 21 c a', 'P c 21 b', 'P b c a', 'P n m a', 'P b n m', 'P c m n', 'A 21 a m', 'B b 21 m', 'C c c a:1',
    'P 21 21 2', 'P 2 21 21', 'A b a 2', 'F d d 2', 'I 41/a:2', 'F d -3 m:2', 'R -3:R', 'R 3 c:R', 'P n -3:2', 'P 4/n:2',
  ];
  const nonStandard = names.map((n) => all.find((s) => s.hm === n)).filter((s): s is SpaceGroupSetting => s !== undefined);
  return { standard, nonStandard };
}

export interface SuiteOutcome {
  readonly total: number;
  readonly top1: number;
  readonly top3: number;
  readonly top5: number;
  /** Wrong classes given probability > 0.9. */
  readonly confidentWrong: number;
  readonly failures: string[];
}

export function runSuite(settings: readonly SpaceGroupSetting[], seedBase = 1000, quality: CaseQuality = 'normal'): SuiteOutcome {
  let top1 = 0, top3 = 0, top5 = 0, confidentWrong = 0;
  const failures: string[] = [];
  for (const s of settings) {
    const c = simulateCase(s, seedBase + s.index, 3000, quality);
    const r = rankSpaceGroups(c.table);
    if (!r.ok) { failures.push(`${s.hm}: error ${r.error.message}`); continue; }
    const v = r.value;
    const cls = v.classes.findIndex((k) => k.members.includes(s.hm));
    if (cls === 0) top1++;
    else {
      failures.push(`${s.hm} (No. ${s.number}): top ${v.candidates[0].hm} p=${v.classes[0].probability.toFixed(3)}, truth class rank ${cls + 1}`);
      if (v.classes[0].probability > 0.9) confidentWrong++;
    }
    if (cls >= 0 && cls < 3) top3++;
    if (cls >= 0 && cls < 5) top5++;
  }
  return { total: settings.length, top1, top3, top5, confidentWrong, failures };
}
