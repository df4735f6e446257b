import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readReflections } from '../../src/io';
import { getSetting } from '../../src/symmetry';
import { parseProfile } from '../../src/profile';
import { buildGuideSections, guideText, buildGuidePanel, formatIndexSum, type GuideState } from '../../src/view';
import { realdata, REPO_ROOT } from '../helpers/paths';

const path = realdata('cod-1560875.cif');
const read = readReflections(new Uint8Array(readFileSync(path)), { source: 'cod-1560875.cif' });
if (!read.ok) throw read.error;
const table = read.value;
const profileR = parseProfile(readFileSync(`${REPO_ROOT}/public/profiles/fernbrook-copper-source.json`, 'utf8'), 'fernbrook-copper-source.json');
if (!profileR.ok) throw profileR.error;
const profile = profileR.value;
const rules = (hm: string) => getSetting(hm).conditions;

describe('conventions guide content', () => {
  it('explains a*, b*, c* on the loaded cell (monoclinic: a* = 1/(a sin beta), tilted by beta - 90 from a)', () => {
    const text = guideText(buildGuideSections({ table }));
    // textbook relation for alpha = gamma = 90: |a*| = 1 / (a sin beta)
    const aStar = 1 / (8.72 * Math.sin((90.32 * Math.PI) / 180));
    expect(text).toContain(`a* | ${aStar.toFixed(5)} 1/A (a = 8.7200 A) | 0.32 deg`);
    expect(text).toContain('b* | 0.11198 1/A (b = 8.9300 A) | 0.00 deg'); // 1/8.93
    let best = 0;
    for (let j = 1; j < table.n; j++) if (table.i[j] > table.i[best]) best = j;
    expect(text).toContain(`the strongest reflection is ${table.h[best]} ${table.k[best]} ${table.l[best]}.`);
    expect(text).toContain('Indices measured: h -12 to 12, k 0 to 12, l 0 to 18 (2551 reflections).'); // ranges counted with awk over the data loop of the file
  });

  it('counts the zones and the layer shown with the profile\'s observed threshold', () => {
    let hk0 = 0, hk0obs = 0;
    for (let j = 0; j < table.n; j++) if (table.l[j] === 0) { hk0++; if (table.i[j] > 3 * table.sigma[j]) hk0obs++; }
    const sections = buildGuideSections({ table, layer: 'hk0', profile });
    const zones = sections.find((s) => s.id === 'zones')!;
    const tbl = zones.blocks.find((b) => b.kind === 'table');
    expect(tbl && tbl.kind === 'table' && tbl.rows[0]).toEqual(['hk0', String(hk0), String(hk0obs)]);
    expect(guideText([zones])).toContain(`The layer on screen is hk0: the reflections with l = 0. ${hk0} measured reflections lie on it.`);
  });

  it('explains each condition of the selected candidate on the layer shown, with evidence from the data', () => {
    const state: GuideState = { table, layer: 'h0l', profile, candidate: { hm: 'P 1 21/c 1', rules: rules('P 1 21/c 1') } };
    const text = guideText(buildGuideSections(state));
    let inZone = 0, odd = 0, oddObs = 0;
    for (let j = 0; j < table.n; j++) {
      if (table.k[j] !== 0) continue;
      inZone++;
      if (Math.abs(table.l[j]) % 2 === 1) { odd++; if (table.i[j] > 3 * table.sigma[j]) oddObs++; }
    }
    expect(text).toContain('h0l: l = 2n');
    expect(text).toContain('among the reflections with k = 0 (a layer through the origin), those where l is not a multiple of 2 are absent');
    expect(text).toContain(`On the layer h0l: ${inZone} measured reflections fall under it, ${odd} of them should be absent, and ${oddObs} of those are observed (I > 3 sigma(I))`);
    expect(text).toMatch(/zonal condition: it comes from a glide plane/);
    expect(text).toMatch(/serial condition: it comes from a screw axis/);
  });

  it('compares settings of one group and marks the conditions that differ', () => {
    const state: GuideState = {
      table,
      candidate: { hm: 'P 1 21/c 1', rules: rules('P 1 21/c 1') },
      settings: [{ hm: 'P 1 21/n 1', rules: rules('P 1 21/n 1'), transformFromSelected: 'a,b,a+c' }],
    };
    const text = guideText(buildGuideSections(state));
    expect(text).toMatch(/P 1 21\/c 1 \| .*h0l: l = 2n \*/);
    expect(text).toMatch(/P 1 21\/n 1 \| .*h0l: h\+l = 2n \*.* \| a,b,a\+c/);
    expect(text).toContain('among the reflections on the row 0k0 through the origin along 0 1 0');
    expect(text).toMatch(/0k0: k = 2n(;|$| \|)/m); // shared by both settings, so unmarked
  });

  it('shows the house rules of the profile in force, and works with no data at all', () => {
    const text = guideText(buildGuideSections({ profile }));
    expect(text).toContain('Profile in force: Fernbrook copper-source instrument (fernbrook-copper-source.json).');
    expect(text).toContain('observed reflection: I > 3 sigma(I)');
    expect(text).toContain('house rule: Observed means I > 3 sigma(I) on this instrument');
    const empty = guideText(buildGuideSections());
    expect(empty).toContain('Load a data set with a cell');
    expect(empty).toContain('Select a space-group candidate');
    expect(empty).toContain('hypothesis');
  });

  it('lists the lattices the loaded cell allows, with the near-orthorhombic case shown with its deviation', () => {
    const sections = buildGuideSections({ table });
    const lattice = sections.find((s) => s.id === 'lattice')!;
    const tbl = lattice.blocks.find((b) => b.kind === 'table');
    if (!tbl || tbl.kind !== 'table') throw new Error('no table');
    const oP = tbl.rows.find((r) => r[0] === 'oP')!;
    expect(oP[1]).toBe('0.32 deg'); // beta - 90 of the cell
    expect(tbl.rows[tbl.rows.length - 1][0]).toBe('aP');
    const strict = buildGuideSections({ table, profile: { ...profile, tolerances: { ...profile.tolerances, latticeDeg: 0.1 } } });
    const t2 = strict.find((s) => s.id === 'lattice')!.blocks.find((b) => b.kind === 'table');
    expect(t2 && t2.kind === 'table' && t2.rows.map((r) => r[0])).toEqual(['mP', 'aP']);
  });

  it('writes index sums as International Tables does', () => {
    expect(formatIndexSum([1, 1, 0])).toBe('h+k');
    expect(formatIndexSum([0, 0, 1])).toBe('l');
    expect(formatIndexSum([2, 0, -1])).toBe('2h-l');
    expect(formatIndexSum([0, 0, 0])).toBe('0');
  });
});

/** A minimal stand-in for the DOM: enough for the panel, and it refuses innerHTML. */
class FakeNode {
  children: FakeNode[] = [];
  attrs = new Map<string, string>();
  listeners = new Map<string, (() => void)[]>();
  className = '';
  title = '';
  private text = '';
  constructor(readonly tagName: string) {}
  get textContent(): string { return this.tagName === '#text' ? this.text : this.children.map((c) => c.textContent).join(''); }
  set textContent(v: string) { if (this.tagName === '#text') this.text = v; else { this.children = []; const t = new FakeNode('#text'); t.text = v; this.children.push(t); } }
  set innerHTML(_v: string) { throw new Error('innerHTML must not be used'); }
  get firstChild(): FakeNode | null { return this.children[0] ?? null; }
  append(...nodes: FakeNode[]): void { this.children.push(...nodes); }
  removeChild(n: FakeNode): void { this.children = this.children.filter((c) => c !== n); }
  setAttribute(k: string, v: string): void { this.attrs.set(k, v); }
  addEventListener(t: string, f: () => void): void { this.listeners.set(t, [...(this.listeners.get(t) ?? []), f]); }
  fire(t: string): void { for (const f of this.listeners.get(t) ?? []) f(); }
  find(pred: (n: FakeNode) => boolean): FakeNode[] { return [...(pred(this) ? [this] : []), ...this.children.flatMap((c) => c.find(pred))]; }
}

describe('conventions guide panel (DOM)', () => {
  const g = globalThis as unknown as { document?: unknown };
  const saved = g.document;
  beforeAll(() => {
    g.document = {
      createElement: (tag: string) => new FakeNode(tag),
      createTextNode: (text: string) => { const t = new FakeNode('#text'); t.textContent = text; return t; },
    };
  });
  afterAll(() => { g.document = saved; });

  it('builds sections with textContent only, highlights axes on hover and updates in place', () => {
    const host = new FakeNode('div');
    const seen: (string | null)[] = [];
    const panel = buildGuidePanel(host as unknown as HTMLElement, { table }, { onAxisHighlight: (a) => seen.push(a) });
    expect(host.find((n) => n.tagName === 'details').length).toBe(7);
    expect(host.find((n) => n.tagName === 'details' && n.attrs.has('open')).map((n) => n.attrs.get('data-section'))).toEqual(['axes', 'lattice']);
    const axis = host.find((n) => n.attrs.get('data-axis') === 'c*')[0];
    axis.fire('mouseenter');
    axis.fire('mouseleave');
    expect(seen).toEqual(['c*', null]);
    // a hostile block name is shown as text (the fake DOM would throw on innerHTML)
    const evil = { ...table, meta: { ...table.meta, cell: table.meta.cell } };
    panel.update({ table: evil, candidate: { hm: '<img src=x onerror=alert(1)>', rules: [] } });
    expect(host.textContent).toContain('<img src=x onerror=alert(1)>');
    expect(host.find((n) => n.tagName === 'details').length).toBe(7);
    panel.dispose();
    expect(host.children.length).toBe(0);
  });
});
