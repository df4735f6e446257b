import { clear, el } from '../dom';
import type { AnalysisView } from '../analysis-view';

export const CAUTION = 'A space group chosen from absences and statistics is a hypothesis: structure solution and refinement must confirm it.';

/** Ranked candidates with probability bars; clicking one selects it (its forbidden reflections get marked). */
/** How many candidates show before "show all". */
export const CANDIDATES_SHOWN = 10;
let showAll = false;

export function renderCandidates(host: HTMLElement, a: AnalysisView | undefined, selected: number, onSelect: (index: number) => void): void {
  clear(host);
  if (!a) { host.append(el('p', { class: 'muted', text: 'Ranking runs after loading.' })); return; }
  for (const note of a.notes) host.append(el('p', { class: 'note', text: note }));
  if (!a.available || a.candidates.length === 0) return;
  if (a.laue) host.append(el('p', { class: 'laue', text: `Laue class from equivalent intensities: ${a.laue}` }));
  const list = el('ol', { class: 'candidates', attrs: { role: 'listbox', 'aria-label': 'space-group candidates' } });
  const limit = showAll ? a.candidates.length : Math.max(CANDIDATES_SHOWN, selected + 1);
  a.candidates.slice(0, limit).forEach((c, j) => {
    const pct = c.probability * 100;
    const li = el('li', { class: 'candidate' + (j === selected ? ' selected' : ''), attrs: { role: 'option', 'aria-selected': String(j === selected), tabindex: '0', 'data-index': String(j) } });
    const bar = el('span', { class: 'pbar' }, [el('span', { class: 'pfill' })]);
    (bar.firstChild as HTMLElement).style.width = `${Math.max(0.5, Math.min(100, pct)).toFixed(1)}%`;
    li.append(
      el('span', { class: 'rank', text: String(j + 1) }),
      el('span', { class: 'hm', text: c.hm }),
      el('span', { class: 'num', text: `No. ${c.number}` }),
      bar,
      el('span', { class: 'pct', text: pct >= 0.1 ? `${pct.toFixed(1)}%` : '<0.1%' }),
    );
    if (j === selected) {
      const why = el('ul', { class: 'why' });
      for (const line of c.explanation) why.append(el('li', { text: line }));
      if (c.rules.length === 0) why.append(el('li', { text: 'No reflection conditions: nothing is forbidden.' }));
      else why.append(el('li', { class: 'rules', text: `Forbids: ${c.rules.map((r) => r.text).join(', ')}` }));
      li.append(why);
    }
    li.addEventListener('click', () => onSelect(j === selected ? -1 : j));
    li.addEventListener('keydown', (e) => { if (e.key === 'Enter' || e.key === ' ') { e.preventDefault(); onSelect(j === selected ? -1 : j); } });
    list.append(li);
  });
  host.append(list);
  if (a.candidates.length > CANDIDATES_SHOWN) {
    const more = el('button', { class: 'more', text: showAll ? 'show the first ten' : `show all ${a.candidates.length}`, attrs: { type: 'button' } });
    more.addEventListener('click', () => { showAll = !showAll; renderCandidates(host, a, selected, onSelect); });
    host.append(more);
  }
}
