import { clear, el, fmt } from '../dom';
import type { Dataset } from '../dataset';

/** The data-set summary: where the data came from and what they hold. All strings as text. */
export function renderSummary(host: HTMLElement, ds: Dataset | undefined): void {
  clear(host);
  if (!ds) { host.append(el('p', { class: 'muted', text: 'No data loaded yet. Open a reflection file (CIF, mmCIF or a table of h k l I sigma), or drop one on the page.' })); return; }
  const m = ds.table.meta;
  let sumIos = 0, nIos = 0;
  for (let r = 0; r < ds.table.n; r++) { const v = ds.iOverSigma[r]; if (Number.isFinite(v)) { sumIos += v; nIos++; } }
  const c = ds.cell;
  const rows: Array<[string, string]> = [
    ['file', m.source],
    ['data block', m.block ?? '(none)'],
    ['reflections', `${ds.table.n.toLocaleString('en')}${m.unmerged ? ' observations (unmerged)' : ''}`],
    ['rows rejected', m.rejectedCount === 0 ? 'none' : `${m.rejectedCount.toLocaleString('en')}: ${Object.entries(m.rejectedByReason).map(([r, k]) => `${k} ${r}`).join('; ')}`],
    ['cell', ds.cellAssumed ? 'not given (drawn on a unit cube)' : `${fmt(c.a, 3)} ${fmt(c.b, 3)} ${fmt(c.c, 3)} \u00c5, ${fmt(c.alpha, 2)} ${fmt(c.beta, 2)} ${fmt(c.gamma, 2)}\u00b0`],
    ['resolution', ds.cellAssumed ? 'needs a cell' : `${fmt(ds.dMax, 2)} to ${fmt(ds.dMin, 2)} \u00c5 (d)`],
    ['mean I/\u03c3', nIos ? fmt(sumIos / nIos, 1) : 'n/a'],
  ];
  if (m.wavelength) rows.push(['wavelength', `${fmt(m.wavelength, 5)} \u00c5`]);
  if (m.origin === 'amplitude') rows.push(['values', 'amplitudes F squared to intensities (I = F\u00b2, \u03c3(I) = 2|F|\u03c3(F))']);
  const dl = el('dl', { class: 'summary' });
  for (const [k, v] of rows) dl.append(el('dt', { text: k }), el('dd', { text: v }));
  host.append(dl);
  for (const w of m.warnings) host.append(el('p', { class: 'warning', text: w }));
  if (m.rejectedExamples.length > 0) {
    const det = el('details', { class: 'rejected' }, [el('summary', { text: `first rejected rows (${m.rejectedExamples.length})` })]);
    const ul = el('ul');
    for (const r of m.rejectedExamples.slice(0, 12)) ul.append(el('li', { text: `line ${r.line}: ${r.reason}` }));
    det.append(ul);
    host.append(det);
  }
}
