import { scaleLinear } from 'd3-scale';
import { clear, el, fmt, svg } from '../dom';
import type { StatisticsView } from '../analysis-view';
import type { Dataset } from '../dataset';
import { anyRuleForbids, type Rule } from '../rules';

/**
 * Small statistics plots drawn as SVG with d3 scales: the Wilson plot, the
 * cumulative N(z) against the acentric and centric curves, and I/sigma
 * histograms of the reflections the selected rules forbid against the rest.
 */
const W = 250, H = 150, M = { l: 36, r: 8, t: 26, b: 26 };

function frame(title: string, xLabel: string, yLabel: string): { root: SVGSVGElement; plot: SVGGElement } {
  const root = svg('svg', { viewBox: `0 0 ${W} ${H}`, class: 'plot', role: 'img', 'aria-label': title });
  root.append(svg('text', { x: M.l, y: 12, class: 'plot-title' }, title));
  root.append(svg('text', { x: W - M.r, y: H - 3, class: 'plot-axis-label', 'text-anchor': 'end' }, xLabel));
  root.append(svg('text', { x: 4, y: M.t - 6, class: 'plot-axis-label' }, yLabel));
  const plot = svg('g');
  root.append(plot);
  return { root, plot };
}

function axes(plot: SVGGElement, x: { (v: number): number; ticks(n: number): number[] }, y: { (v: number): number; ticks(n: number): number[] }, xf: (v: number) => string = (v) => fmt(v, 2), yf: (v: number) => string = (v) => fmt(v, 1)): void {
  plot.append(svg('line', { x1: M.l, y1: H - M.b, x2: W - M.r, y2: H - M.b, class: 'plot-axis' }));
  plot.append(svg('line', { x1: M.l, y1: M.t, x2: M.l, y2: H - M.b, class: 'plot-axis' }));
  for (const t of x.ticks(4)) {
    plot.append(svg('line', { x1: x(t), y1: H - M.b, x2: x(t), y2: H - M.b + 3, class: 'plot-axis' }));
    plot.append(svg('text', { x: x(t), y: H - M.b + 12, class: 'plot-tick', 'text-anchor': 'middle' }, xf(t)));
  }
  for (const t of y.ticks(4)) {
    plot.append(svg('line', { x1: M.l - 3, y1: y(t), x2: M.l, y2: y(t), class: 'plot-axis' }));
    plot.append(svg('text', { x: M.l - 5, y: y(t) + 3, class: 'plot-tick', 'text-anchor': 'end' }, yf(t)));
  }
}

function polyline(plot: SVGGElement, pts: Array<[number, number]>, cls: string): void {
  if (pts.length < 2) return;
  plot.append(svg('polyline', { points: pts.map((p) => `${p[0].toFixed(1)},${p[1].toFixed(1)}`).join(' '), class: cls }));
}

export function wilsonPlot(s: StatisticsView | undefined): SVGSVGElement {
  const { root, plot } = frame('Wilson plot', 's\u00b2 = (sin\u03b8/\u03bb)\u00b2', 'ln\u27e8I\u27e9');
  const pts = s?.wilson ?? [];
  if (pts.length < 2) { plot.append(svg('text', { x: W / 2, y: H / 2, class: 'plot-empty', 'text-anchor': 'middle' }, 'needs a cell and data')); return root; }
  const x = scaleLinear().domain([0, Math.max(...pts.map((p) => p.s2)) * 1.05]).range([M.l, W - M.r]);
  const ys = pts.map((p) => p.lnMeanI);
  const y = scaleLinear().domain([Math.min(...ys) - 0.3, Math.max(...ys) + 0.3]).range([H - M.b, M.t]).nice();
  axes(plot, x, y, x.tickFormat(4), y.tickFormat(4));
  if (s?.wilsonB !== undefined && s.wilsonLnK !== undefined) {
    const x0 = x.domain()[0], x1 = x.domain()[1];
    polyline(plot, [[x(x0), y(s.wilsonLnK - 2 * s.wilsonB * x0)], [x(x1), y(s.wilsonLnK - 2 * s.wilsonB * x1)]], 'fit-line');
    root.append(svg('text', { x: W - M.r, y: 12, class: 'plot-note', 'text-anchor': 'end' }, `B \u2248 ${fmt(s.wilsonB, 1)} \u00c5\u00b2`));
  }
  for (const p of pts) plot.append(svg('circle', { cx: x(p.s2), cy: y(p.lnMeanI), r: 2.6, class: 'pt' }));
  return root;
}

export function nzPlot(s: StatisticsView | undefined): SVGSVGElement {
  const { root, plot } = frame('N(z) cumulative', 'z = I/\u27e8I\u27e9', 'N(z)');
  const nz = s?.nz;
  const x = scaleLinear().domain([0, 1]).range([M.l, W - M.r]);
  const y = scaleLinear().domain([0, 1]).range([H - M.b, M.t]);
  axes(plot, x, y, (v) => fmt(v, 1), (v) => fmt(v, 1));
  // Theory: acentric 1 - exp(-z), centric erf(sqrt(z/2)) (Howells, Phillips & Rogers 1950).
  const zs = Array.from({ length: 41 }, (_, j) => j / 40);
  polyline(plot, zs.map((z) => [x(z), y(1 - Math.exp(-z))]), 'theory acentric');
  polyline(plot, zs.map((z) => [x(z), y(erf(Math.sqrt(z / 2)))]), 'theory centric');
  if (nz) {
    polyline(plot, nz.z.map((z, j) => [x(z), y(nz.observed[j])]), 'observed');
    nz.z.forEach((z, j) => plot.append(svg('circle', { cx: x(z), cy: y(nz.observed[j]), r: 2.2, class: 'pt' })));
  } else plot.append(svg('text', { x: W / 2, y: H / 2, class: 'plot-empty', 'text-anchor': 'middle' }, 'shown after ranking'));
  root.append(svg('text', { x: W - M.r, y: 12, class: 'plot-note', 'text-anchor': 'end' }, s?.probabilityCentric !== undefined ? `P(centric) ${fmt(s.probabilityCentric * 100, 0)}%` : ''));
  const lg = svg('g', { class: 'legend' });
  lg.append(svg('text', { x: W - M.r - 4, y: H - M.b - 26, 'text-anchor': 'end', class: 'lg acentric' }, 'acentric'));
  lg.append(svg('text', { x: W - M.r - 4, y: H - M.b - 14, 'text-anchor': 'end', class: 'lg centric' }, 'centric'));
  lg.append(svg('text', { x: W - M.r - 4, y: H - M.b - 2, 'text-anchor': 'end', class: 'lg observed' }, 'data'));
  plot.append(lg);
  return root;
}

/** I/sigma histograms: forbidden by the selected rules versus allowed. Forbidden ones should pile up near zero. */
export function iOverSigmaPlot(ds: Dataset | undefined, rules: readonly Rule[], label: string): SVGSVGElement {
  const { root, plot } = frame('I/\u03c3 histogram', 'I/\u03c3', 'share');
  if (!ds) return root;
  const edges = [-5, -3, -1, 0, 1, 2, 3, 5, 10, 20, 50, 1e9];
  const nb = edges.length - 1;
  const fb = new Float64Array(nb), al = new Float64Array(nb);
  let nf = 0, na = 0;
  const { h, k, l } = ds.table;
  for (let r = 0; r < ds.table.n; r++) {
    const v = ds.iOverSigma[r];
    if (!Number.isFinite(v)) continue;
    let b = 0;
    while (b < nb - 1 && v >= edges[b + 1]) b++;
    if (rules.length > 0 && anyRuleForbids(rules, h[r], k[r], l[r])) { fb[b]++; nf++; } else { al[b]++; na++; }
  }
  const x = scaleLinear().domain([0, nb]).range([M.l, W - M.r]);
  const maxShare = Math.max(...Array.from(fb, (c) => (nf ? c / nf : 0)), ...Array.from(al, (c) => (na ? c / na : 0)), 0.05);
  const y = scaleLinear().domain([0, maxShare]).range([H - M.b, M.t]).nice();
  plot.append(svg('line', { x1: M.l, y1: H - M.b, x2: W - M.r, y2: H - M.b, class: 'plot-axis' }));
  for (const t of y.ticks(3)) plot.append(svg('text', { x: M.l - 5, y: y(t) + 3, class: 'plot-tick', 'text-anchor': 'end' }, fmt(t, 2)));
  const bw = (W - M.l - M.r) / nb;
  for (let b = 0; b < nb; b++) {
    const a = na ? al[b] / na : 0, f = nf ? fb[b] / nf : 0;
    plot.append(svg('rect', { x: x(b) + 1, y: y(a), width: bw / 2 - 1, height: H - M.b - y(a), class: 'bar allowed' }));
    plot.append(svg('rect', { x: x(b) + bw / 2, y: y(f), width: bw / 2 - 1, height: H - M.b - y(f), class: 'bar forbidden' }));
    if (b % 2 === 0 || b === nb - 1) plot.append(svg('text', { x: x(b), y: H - M.b + 12, class: 'plot-tick', 'text-anchor': 'middle' }, b === 0 ? '' : String(edges[b])));
  }
  // The I/sigma = 3 line: forbidden reflections right of it are violations.
  const b3 = edges.indexOf(3);
  plot.append(svg('line', { x1: x(b3), y1: M.t, x2: x(b3), y2: H - M.b, class: 'threshold' }));
  root.append(svg('text', { x: W - M.r, y: 22, class: 'plot-note', 'text-anchor': 'end' }, rules.length ? `${label}: ${nf} forbidden (teal), ${na} allowed (grey)` : 'select a candidate or a condition'));
  return root;
}

function erf(x: number): number {
  // Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7).
  const t = 1 / (1 + 0.3275911 * Math.abs(x));
  const y = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-x * x);
  return x >= 0 ? y : -y;
}

export function renderStats(host: HTMLElement, ds: Dataset | undefined, s: StatisticsView | undefined, rules: readonly Rule[], ruleLabel: string): void {
  clear(host);
  host.append(el('div', { class: 'plot-cell' }, [wilsonPlot(s)]), el('div', { class: 'plot-cell' }, [nzPlot(s)]), el('div', { class: 'plot-cell' }, [iOverSigmaPlot(ds, rules, ruleLabel)]));
}
