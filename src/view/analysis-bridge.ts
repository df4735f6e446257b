import type { ReflectionTable } from '../core';
import type { AnalysisView, CandidateRow, ConditionRow, StatisticsView, WilsonPoint } from './analysis-view';
import { makeCell } from '../lattice';
import { rankSpaceGroups, type RankResult } from '../analysis';
import type { Rule } from './rules';

/**
 * Runs the ranking engine (src/analysis) in the worker and turns its result
 * into the panels' AnalysisView. Kept in one place so a change of the
 * engine's result shape touches only this file.
 */
export function runAnalysis(table: ReflectionTable, onProgress: (fraction: number) => void): AnalysisView {
  onProgress(0);
  const w = wilsonOnly(table);
  const r = rankSpaceGroups(table, {}, (f) => { onProgress(f); });
  onProgress(1);
  if (!r.ok) return { available: false, notes: [`No ranking: ${r.error.describe()}`], candidates: [], conditions: [], statistics: w };
  return fromRank(r.value, w);
}

function pct(p: number): string {
  return p >= 0.995 ? '>99%' : p < 0.005 ? '<1%' : `${Math.round(p * 100)}%`;
}

/** Maps the ranking engine's report (the `lacuna rank --json` shape) onto the panels' view. */
export function fromRank(r: RankResult, wilson: StatisticsView): AnalysisView {
  const conditions: ConditionRow[] = r.conditions.map((c) => ({
    text: c.text, zone: c.zone, coeffs: c.coeffs, modulus: c.modulus, n: c.n,
    meanIOverSigma: c.mean_i_over_sigma ?? NaN, nStrong: c.n_strong, probabilityAbsent: c.probability_absent,
  }));
  const byText = new Map<string, Rule>(conditions.map((c) => [c.text, c]));
  const classes = new Map(r.classes.map((c) => [c.id, c]));
  const candidates: CandidateRow[] = r.candidates.map((c) => {
    const why: string[] = [];
    why.push(`Laue class ${c.laue} (${c.crystal_system})${c.centrosymmetric ? ', centrosymmetric' : ', non-centrosymmetric'}${c.sohncke ? ', allowed for a chiral sample' : ''}.`);
    for (const k of c.conditions) {
      const strong = k.n_strong > 0 ? `, ${k.n_strong} strong` : '';
      const missing = k.forbidden_class_missing ? ', the forbidden reflections are missing from the file' : '';
      why.push(`${k.text}: ${k.n} tested${strong}${missing}; holds with ${pct(k.probability_absent)}.`);
    }
    for (const a of c.against.slice(0, 3)) why.push(`Against it: ${a.h} ${a.k} ${a.l} has I/\u03c3 ${a.i_over_sigma.toFixed(1)} although ${a.condition} forbids it.`);
    const cls = classes.get(c.class_id);
    if (cls && cls.members.length > 1) why.push(`The intensities cannot tell it from ${cls.members.filter((m) => m !== c.hm).slice(0, 6).join(', ')}: the bar is the probability of that group of settings together.`);
    if (c.change_of_basis) why.push(`Non-standard setting of No. ${c.number} (standard by ${c.change_of_basis}).`);
    const rules = c.conditions.map((k) => byText.get(k.text)).filter((x): x is Rule => x !== undefined);
    return { number: c.number, hm: c.hm, hall: c.hall, probability: c.probability, explanation: why, rules, centrosymmetric: c.centrosymmetric, sohncke: c.sohncke };
  });
  const st = r.statistics;
  const statistics: StatisticsView = {
    ...wilson,
    nz: { z: st.nz.z, observed: st.nz.observed, acentric: st.nz.acentric, centric: st.nz.centric },
    probabilityCentric: st.probability_centric,
  };
  const notes = [...r.warnings];
  if (r.absences_removed) notes.push('The reflections forbidden by the best candidates seem to have been removed from this file before it was saved; the ranking counts such missing classes as evidence too.');
  const best = r.laue.classes[0];
  return { available: true, notes, laue: best ? `${best.symbol} (${pct(best.probability)})` : undefined, candidates, conditions, statistics };
}

/**
 * Wilson plot points: ln<I> in shells of equal count along s^2 = (sin(theta)/lambda)^2.
 * Wilson (1949) Acta Cryst. 2, 318-321.
 */
export function wilsonPoints(table: ReflectionTable, shells = 16): { points: WilsonPoint[]; B?: number; lnK?: number } {
  if (!table.meta.cell) return { points: [] };
  const c = makeCell(table.meta.cell);
  if (!c.ok) return { points: [] };
  const cell = c.value;
  const n = table.n;
  const s2 = new Float64Array(n);
  for (let r = 0; r < n; r++) s2[r] = cell.invDSquared(table.h[r], table.k[r], table.l[r]) / 4;
  const order = Array.from({ length: n }, (_, j) => j).sort((a, b) => s2[a] - s2[b]);
  const points: WilsonPoint[] = [];
  const per = Math.max(1, Math.ceil(n / shells));
  for (let start = 0; start < n; start += per) {
    let sumI = 0, sumS = 0, m = 0;
    for (let j = start; j < Math.min(n, start + per); j++) { sumI += table.i[order[j]]; sumS += s2[order[j]]; m++; }
    if (m > 0 && sumI > 0) points.push({ s2: sumS / m, lnMeanI: Math.log(sumI / m), count: m });
  }
  // Straight-line fit over the shells beyond 1/d^2 = 0.1 (low angles are not Wilson-like; common practice).
  const use = points.filter((p) => p.s2 * 4 > 0.1);
  if (use.length < 3) return { points };
  const mx = use.reduce((s, p) => s + p.s2, 0) / use.length, my = use.reduce((s, p) => s + p.lnMeanI, 0) / use.length;
  let sxy = 0, sxx = 0;
  for (const p of use) { sxy += (p.s2 - mx) * (p.lnMeanI - my); sxx += (p.s2 - mx) ** 2; }
  const slope = sxx > 0 ? sxy / sxx : 0;
  return { points, B: -slope / 2, lnK: my - slope * mx };
}

function wilsonOnly(table: ReflectionTable): StatisticsView {
  const w = wilsonPoints(table);
  return { wilson: w.points, wilsonB: w.B, wilsonLnK: w.lnK };
}
