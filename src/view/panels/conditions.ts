import { clear, el } from '../dom';
import type { AnalysisView } from '../analysis-view';

/** The condition table: each reflection condition, its evidence and the probability that it holds. */
export function renderConditions(host: HTMLElement, a: AnalysisView | undefined, selected: number, onSelect: (index: number) => void): void {
  clear(host);
  if (!a || a.conditions.length === 0) { host.append(el('p', { class: 'muted', text: a ? 'No conditions were tested.' : 'Conditions are tested after loading.' })); return; }
  const table = el('table', { class: 'conditions' });
  const head = el('tr');
  for (const [t, tip] of [['condition', 'reflection condition (International Tables notation)'], ['n', 'reflections the rule forbids that were measured'], ['I/\u03c3', 'mean I/sigma of those reflections'], ['strong', 'of them, I/sigma >= 3'], ['holds', 'probability that the rule holds']] as const) {
    head.append(el('th', { text: t, title: tip }));
  }
  table.append(el('thead', {}, [head]));
  const body = el('tbody');
  a.conditions.forEach((c, j) => {
    const tr = el('tr', { class: 'condition' + (j === selected ? ' selected' : ''), attrs: { tabindex: '0', 'data-index': String(j) } });
    const p = c.probabilityAbsent;
    const cell = el('td', { class: 'prob' }, [el('span', { class: 'pbar' }, [el('span', { class: 'pfill' })]), el('span', { class: 'pct', text: `${(p * 100).toFixed(0)}%` })]);
    ((cell.firstChild as HTMLElement).firstChild as HTMLElement).style.width = `${(p * 100).toFixed(1)}%`;
    tr.append(el('td', { class: 'text', text: c.text }), el('td', { text: String(c.n) }), el('td', { text: c.n && Number.isFinite(c.meanIOverSigma) ? c.meanIOverSigma.toFixed(1) : '-' }), el('td', { class: c.nStrong > 0 ? 'strong' : '', text: String(c.nStrong) }), cell);
    tr.addEventListener('click', () => onSelect(j === selected ? -1 : j));
    tr.addEventListener('keydown', (e) => { if (e.key === 'Enter' || e.key === ' ') { e.preventDefault(); onSelect(j === selected ? -1 : j); } });
    body.append(tr);
  });
  table.append(body);
  host.append(table);
}
