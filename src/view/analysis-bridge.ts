import type { ReflectionTable } from '../core';
import type { AnalysisView, StatisticsView, WilsonPoint } from './analysis-view';
import { makeCell } from '../lattice';

/**
 * Runs the ranking engine (src/analysis) in the worker and turns its result
 * into the panels' AnalysisView. Kept in one place so a change of the
 * engine's result shape touches only this file.
 */
export function runAnalysis(table: ReflectionTable, onProgress: (fraction: number) => void): AnalysisView {
  onProgress(0);
  const statistics = wilsonOnly(table);
  onProgress(1);
  return { available: false, notes: ['The space-group ranking engine is not part of this build yet; the data and statistics are shown.'], candidates: [], conditions: [], statistics };
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
