import type { CellParams, ReflectionTable } from '../../core';
import { findBravaisCandidates, formatChangeOfBasis, makeCell } from '../../lattice';
import { DEFAULT_PROFILE, describeProfile, isObserved, type LabProfile } from '../../profile';
import { parseLayerPlane, type LayerPlane } from '../../../shaders-free-render';
import { inZone, layerForRule, ruleForbids, type Rule } from '../rules';

/**
 * The conventions guide, as data: sections of paragraphs, lists and small
 * tables, written for someone in their first weeks in a lab and filled in from
 * the loaded data, the layer on screen, the selected space-group candidate and
 * the lab profile. Pure (no DOM): guide-panel.ts turns it into elements with
 * textContent only, and tests read it directly.
 */
export type AxisName = 'a*' | 'b*' | 'c*' | 'a' | 'b' | 'c';

/** A run of text; runs naming an axis are highlighted in the 3D view on hover. */
export type GuidePart = string | { readonly text: string; readonly axis: AxisName };

export type GuideBlock =
  | { readonly kind: 'p'; readonly parts: readonly GuidePart[] }
  | { readonly kind: 'list'; readonly items: readonly (readonly GuidePart[])[] }
  | { readonly kind: 'table'; readonly head: readonly string[]; readonly rows: readonly (readonly string[])[] };

export interface GuideSection {
  readonly id: 'axes' | 'lattice' | 'zones' | 'conditions' | 'settings' | 'house-rules' | 'caution';
  readonly title: string;
  readonly blocks: readonly GuideBlock[];
}

/** One space-group setting as the guide needs it (the ranking's candidate rows fit). */
export interface GuideSetting {
  readonly hm: string;
  readonly rules: readonly Rule[];
  /** Change of basis from the selected setting to this one (`a,b,a+c`), when known. */
  readonly transformFromSelected?: string;
}

export interface GuideState {
  /** The loaded reflections (cell from table.meta.cell unless `cell` is given). */
  readonly table?: ReflectionTable;
  readonly cell?: CellParams;
  /** The layer on screen: a name such as 'hk0', 'h1l', 'hhl' or 'u,v,w,n', or a parsed plane. */
  readonly layer?: string | LayerPlane;
  /** The selected space-group candidate. */
  readonly candidate?: GuideSetting;
  /** Other settings of the same space group, to compare with the candidate. */
  readonly settings?: readonly GuideSetting[];
  readonly profile?: LabProfile;
}

const p = (...parts: GuidePart[]): GuideBlock => ({ kind: 'p', parts });
const ax = (axis: AxisName, text: string = axis): GuidePart => ({ text, axis });

function f(x: number, digits: number): string {
  return Number.isFinite(x) ? x.toFixed(digits) : '?';
}

/** `h+k`, `l`, `2h-l`: the linear form coeffs . (h,k,l) as International Tables writes it. */
export function formatIndexSum(coeffs: readonly number[]): string {
  let s = '';
  ['h', 'k', 'l'].forEach((name, j) => {
    const c = coeffs[j];
    if (!c) return;
    const mag = Math.abs(c) === 1 ? '' : String(Math.abs(c));
    s += (c < 0 ? '-' : s ? '+' : '') + mag + name;
  });
  return s || '0';
}

/** Plain-words description of the set of reflections a condition's zone selects. */
export function describeZone(rule: Rule): string {
  if (rule.zone.length === 0) return 'every reflection h k l';
  if (rule.zone.length === 1) {
    const e = rule.zone[0];
    return `the reflections with ${formatIndexSum(e)} = 0 (a layer through the origin)`;
  }
  const [a, b] = rule.zone;
  let axis = [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
  if ((axis.find((x) => x !== 0) ?? 0) < 0) axis = axis.map((x) => -x);
  const named: Record<string, string> = { '1,0,0': 'h00', '0,1,0': '0k0', '0,0,1': '00l', '1,1,0': 'hh0', '1,-1,0': 'h-h0', '1,1,1': 'hhh' };
  const name = named[axis.join(',')];
  return `the reflections on the row ${name ? `${name} ` : ''}through the origin along ${axis.join(' ')} (a line of the reciprocal lattice)`;
}

/** What kind of symmetry element a condition comes from, in words (International Tables: integral, zonal, serial). */
export function describeConditionKind(rule: Rule): string {
  switch (rule.zone.length) {
    case 0:
      return 'integral condition: it comes from a centred lattice (extra lattice points inside the cell), and applies to all reflections';
    case 1:
      return 'zonal condition: it comes from a glide plane (a reflection followed by a half or quarter translation within the plane), and applies to one layer through the origin';
    default:
      return 'serial condition: it comes from a screw axis (a rotation followed by a translation along the axis), and applies to one row of reflections through the origin';
  }
}

function layerLabel(plane: LayerPlane): string {
  return plane.name;
}

function resolveLayer(layer: string | LayerPlane | undefined): LayerPlane | undefined {
  if (layer === undefined) return undefined;
  if (typeof layer !== 'string') return layer;
  const r = parseLayerPlane(layer);
  return typeof r === 'string' ? undefined : r;
}

const onPlane = (pl: LayerPlane, h: number, k: number, l: number) => pl.u * h + pl.v * k + pl.w * l === pl.n;

function axesSection(cell: CellParams | undefined, table: ReflectionTable | undefined): GuideSection {
  const blocks: GuideBlock[] = [
    p('Every reflection carries three whole numbers h, k, l. They say where it sits in the reciprocal lattice: at the point h ', ax('a*'), ' + k ', ax('b*'), ' + l ', ax('c*'), ', counted from the origin 0 0 0 (the undiffracted beam).'),
    p('The reciprocal axes are built from the cell: ', ax('a*'), ' is perpendicular to both ', ax('b'), ' and ', ax('c'), ', ', ax('b*'), ' to ', ax('a'), ' and ', ax('c'), ', ', ax('c*'), ' to ', ax('a'), ' and ', ax('b'), '. Only when the cell angles are 90 degrees does a* point along a. The distance of a reflection from the origin is 1/d, where d is the spacing of the lattice planes (h k l) that diffract it.'),
    p('In the 3D view ', ax('a'), ' lies along x, ', ax('b'), ' in the xy plane and ', ax('c*'), ' along z (the project\'s one Cartesian frame). Point at an axis name here to see it highlighted there.'),
  ];
  if (cell) {
    const c = makeCell(cell);
    if (c.ok) {
      const u = c.value;
      const r = u.reciprocal;
      const tilt = (len: number, lenStar: number) => (Math.acos(Math.min(1, 1 / (len * lenStar))) * 180) / Math.PI;
      blocks.push({
        kind: 'table',
        head: ['axis', 'length', 'angle to its direct axis'],
        rows: [
          ['a*', `${f(r.a, 5)} 1/A (a = ${f(u.a, 4)} A)`, `${f(tilt(u.a, r.a), 2)} deg`],
          ['b*', `${f(r.b, 5)} 1/A (b = ${f(u.b, 4)} A)`, `${f(tilt(u.b, r.b), 2)} deg`],
          ['c*', `${f(r.c, 5)} 1/A (c = ${f(u.c, 4)} A)`, `${f(tilt(u.c, r.c), 2)} deg`],
        ],
      });
      blocks.push(p(`Reciprocal angles of this cell: alpha* ${f(r.alpha, 3)}, beta* ${f(r.beta, 3)}, gamma* ${f(r.gamma, 3)} degrees. One step in h moves ${f(r.a, 4)} 1/A along `, ax('a*'), '.'));
      if (table && table.n > 0) {
        let best = 0;
        for (let j = 1; j < table.n; j++) if (table.i[j] > table.i[best]) best = j;
        const h = table.h[best], k = table.k[best], l = table.l[best];
        const d = u.dSpacing(h, k, l);
        blocks.push(p(`On your data: the strongest reflection is ${h} ${k} ${l}. It lies ${f(1 / d, 4)} 1/A from the origin, so the planes (${h} ${k} ${l}) are ${f(d, 3)} A apart.`));
      }
    }
  } else {
    blocks.push(p('Load a data set with a cell to see the reciprocal axes of your crystal here.'));
  }
  if (table && table.n > 0) {
    const range = (a: Int16Array) => { let lo = a[0], hi = a[0]; for (let j = 1; j < a.length; j++) { if (a[j] < lo) lo = a[j]; if (a[j] > hi) hi = a[j]; } return `${lo} to ${hi}`; };
    blocks.push(p(`Indices measured: h ${range(table.h)}, k ${range(table.k)}, l ${range(table.l)} (${table.n} reflections).`));
  }
  return { id: 'axes', title: 'h, k, l and the reciprocal axes', blocks };
}

function latticeSection(cell: CellParams | undefined, profile: LabProfile): GuideSection {
  const title = 'Lattices the cell allows';
  const blocks: GuideBlock[] = [
    p('Indexing gives some cell of the lattice, often a reduced or primitive one. The lattice can have more symmetry than that cell shows: a twofold axis needs a lattice row perpendicular to a lattice plane. The deviation below is the largest angle by which a needed row misses the normal of its plane (the method of Le Page, 1982); small deviations mean the metric allows the symmetry, and the intensities decide whether the crystal has it.'),
  ];
  if (!cell) {
    blocks.push(p('Load a data set with a cell to see the Bravais lattices it allows.'));
    return { id: 'lattice', title, blocks };
  }
  const r = findBravaisCandidates(cell, {
    toleranceDeg: profile.tolerances.latticeDeg,
    monoclinicRule: profile.monoclinicSetting,
    relativeEpsilon: profile.tolerances.niggliRelativeEpsilon,
  });
  if (!r.ok) {
    blocks.push(p(`The cell cannot be analysed: ${r.error.message}.`));
    return { id: 'lattice', title, blocks };
  }
  const cellText = (c: CellParams) => `${f(c.a, 3)} ${f(c.b, 3)} ${f(c.c, 3)}  ${f(c.alpha, 2)} ${f(c.beta, 2)} ${f(c.gamma, 2)}`;
  blocks.push(p(`Within ${profile.tolerances.latticeDeg} degrees (the profile's tolerance), highest symmetry first; cells carry the measured metric:`));
  blocks.push({
    kind: 'table',
    head: ['lattice', 'deviation', 'conventional cell (A, deg)', 'change of basis'],
    rows: r.value.candidates.map((c) => [c.bravais + (c.centring !== c.bravais[1] ? ` (${c.centring} cell)` : ''), `${f(c.deviationDeg, 2)} deg`, cellText(c.cell), formatChangeOfBasis(c.transform)]),
  });
  blocks.push(p('To work in one of these cells, reindex the data with its change of basis: lacuna reindex FILE --transform (change of basis) --out NEW.cif.'));
  return { id: 'lattice', title, blocks };
}

function zonesSection(table: ReflectionTable | undefined, plane: LayerPlane | undefined, profile: LabProfile): GuideSection {
  const blocks: GuideBlock[] = [
    p('A layer is a flat slice of the reciprocal lattice in which one index combination is fixed: hk0 holds every reflection with l = 0 (it contains ', ax('a*'), ' and ', ax('b*'), '), hk1 the next slice up along ', ax('c*'), ', h0l every reflection with k = 0.'),
    p('A zone is a set of reflections whose lattice planes all contain one direction [u v w] of the crystal, the zone axis; they are exactly the reflections with h u + k v + l w = 0, a layer through the origin. hk0 is the zone of the c axis [0 0 1]. Glide planes leave their mark on such zero layers, screw axes on single rows through the origin (h00, 0k0, 00l).'),
  ];
  if (table && table.n > 0) {
    const rows: string[][] = [];
    for (const name of ['hk0', 'h0l', '0kl']) {
      const pl = resolveLayer(name)!;
      let n = 0, obs = 0;
      for (let j = 0; j < table.n; j++)
        if (onPlane(pl, table.h[j], table.k[j], table.l[j])) { n++; if (isObserved(profile, table.i[j], table.sigma[j])) obs++; }
      rows.push([name, String(n), String(obs)]);
    }
    blocks.push(p(`On your data (observed means I > ${profile.observedIOverSigma} sigma(I), the profile's rule):`));
    blocks.push({ kind: 'table', head: ['zone', 'reflections', 'observed'], rows });
  }
  if (plane) {
    let text = `The layer on screen is ${layerLabel(plane)}: the reflections with ${formatIndexSum([plane.u, plane.v, plane.w])} = ${plane.n}.`;
    if (table) {
      let n = 0;
      for (let j = 0; j < table.n; j++) if (onPlane(plane, table.h[j], table.k[j], table.l[j])) n++;
      text += ` ${n} measured reflections lie on it.`;
    }
    blocks.push(p(text));
  }
  return { id: 'zones', title: 'Zones and layers', blocks };
}

interface RuleOnLayer {
  tested: number;
  forbidden: number;
  forbiddenObserved: number;
  examples: string[];
}

function ruleOnLayer(rule: Rule, table: ReflectionTable, plane: LayerPlane | undefined, profile: LabProfile): RuleOnLayer {
  const out: RuleOnLayer = { tested: 0, forbidden: 0, forbiddenObserved: 0, examples: [] };
  for (let j = 0; j < table.n; j++) {
    const h = table.h[j], k = table.k[j], l = table.l[j];
    if (plane && !onPlane(plane, h, k, l)) continue;
    if (!inZone(rule, h, k, l)) continue;
    out.tested++;
    if (!ruleForbids(rule, h, k, l)) continue;
    out.forbidden++;
    const s = table.sigma[j];
    if (isObserved(profile, table.i[j], s)) out.forbiddenObserved++;
    if (out.examples.length < 3) out.examples.push(`${h} ${k} ${l} (I/sigma ${s > 0 ? f(table.i[j] / s, 1) : '?'})`);
  }
  return out;
}

function conditionsSection(candidate: GuideSetting | undefined, table: ReflectionTable | undefined, plane: LayerPlane | undefined, profile: LabProfile): GuideSection {
  const title = candidate ? `Reflection conditions of ${candidate.hm}` : 'Reflection conditions';
  if (!candidate) {
    return { id: 'conditions', title, blocks: [p('Select a space-group candidate to see each of its reflection conditions explained here, on the layer shown.')] };
  }
  const blocks: GuideBlock[] = [];
  if (candidate.rules.length === 0) {
    blocks.push(p(`${candidate.hm} forbids no reflection: its lattice is primitive and it has no glide plane or screw axis, so absences cannot tell it from the other groups of its Laue class.`));
    return { id: 'conditions', title, blocks };
  }
  blocks.push(p(`A reflection condition names a set of reflections and a rule; reflections in the set that break the rule must be systematically absent (zero intensity, apart from noise) if the crystal has ${candidate.hm} symmetry.`));
  const where = plane ? `on the layer ${layerLabel(plane)}` : 'in the whole data set';
  for (const rule of candidate.rules) {
    const items: GuidePart[][] = [
      [`Meaning: among ${describeZone(rule)}, those where ${formatIndexSum(rule.coeffs)} is not a multiple of ${rule.modulus} are absent.`],
      [`Kind: ${describeConditionKind(rule)}.`],
    ];
    if (table) {
      const e = ruleOnLayer(rule, table, plane, profile);
      if (e.tested === 0) {
        const better = layerForRule(rule);
        items.push([`No measured reflection ${where} falls under this condition${better ? `; the layer ${better} shows it` : ''}.`]);
      } else {
        items.push([`${where[0].toUpperCase()}${where.slice(1)}: ${e.tested} measured reflections fall under it, ${e.forbidden} of them should be absent, and ${e.forbiddenObserved} of those are observed (I > ${profile.observedIOverSigma} sigma(I)).` +
          (e.forbiddenObserved > 0 ? ' Observed reflections that should be absent are evidence against this rule (or against the indexing).' : '')]);
        if (e.examples.length) items.push([`For example: ${e.examples.join(', ')}.`]);
      }
    }
    blocks.push(p(rule.text));
    blocks.push({ kind: 'list', items });
  }
  return { id: 'conditions', title, blocks };
}

function settingsSection(candidate: GuideSetting | undefined, settings: readonly GuideSetting[] | undefined): GuideSection {
  const blocks: GuideBlock[] = [
    p('One space group can be written in several settings: the same symmetry described with a different choice of axes. Relabelling the axes changes the letters in the symbol and the reflection conditions, not the crystal. For example the glide plane of P 1 21/c 1 translates by c/2; with the new axes a\' = a, b\' = b, c\' = a + c the same glide translates by (a\' + c\')/2 and the group is written P 1 21/n 1, with h0l: h + l = 2n instead of h0l: l = 2n.'),
    p('Data can be moved from one setting to another with a change of basis such as a,b,a+c (new axes in terms of the old), for example with lacuna reindex FILE --transform a,b,a+c --out NEW.cif.'),
  ];
  const all = [...(candidate ? [candidate] : []), ...(settings ?? []).filter((s) => s.hm !== candidate?.hm)];
  if (all.length >= 2) {
    const texts = all.map((s) => new Set(s.rules.map((r) => r.text)));
    blocks.push({
      kind: 'table',
      head: ['setting', 'reflection conditions', 'change of basis from the selected'],
      rows: all.map((s, j) => [
        s.hm,
        s.rules.map((r) => r.text + (texts.every((t) => t.has(r.text)) ? '' : ' *')).join('; ') || 'none',
        j === 0 && candidate ? '(selected)' : s.transformFromSelected ?? '',
      ]),
    });
    blocks.push(p('Conditions marked * differ between the settings listed.'));
  }
  return { id: 'settings', title: 'Settings of one space group', blocks };
}

function houseRulesSection(profile: LabProfile): GuideSection {
  const blocks: GuideBlock[] = [p(`Profile in force: ${profile.name}${profile.source !== 'built-in' ? ` (${profile.source})` : ''}.`)];
  if (profile.description) blocks.push(p(profile.description));
  blocks.push({ kind: 'list', items: describeProfile(profile).map((line) => [line]) });
  return { id: 'house-rules', title: 'House rules', blocks };
}

/** The guide for a state; every field optional (an empty state gives the general explanations). */
export function buildGuideSections(state: GuideState = {}): GuideSection[] {
  const profile = state.profile ?? DEFAULT_PROFILE;
  const cell = state.cell ?? state.table?.meta.cell;
  const plane = resolveLayer(state.layer);
  return [
    axesSection(cell, state.table),
    latticeSection(cell, profile),
    zonesSection(state.table, plane, profile),
    conditionsSection(state.candidate, state.table, plane, profile),
    settingsSection(state.candidate, state.settings),
    houseRulesSection(profile),
    {
      id: 'caution',
      title: 'A caution',
      blocks: [p('A space group read from systematic absences is a hypothesis. Structure solution and refinement must confirm it.')],
    },
  ];
}

/** The guide as plain text (for tests and for copying into a notebook). */
export function guideText(sections: readonly GuideSection[]): string {
  const part = (x: GuidePart) => (typeof x === 'string' ? x : x.text);
  const out: string[] = [];
  for (const s of sections) {
    out.push(s.title.toUpperCase());
    for (const b of s.blocks) {
      if (b.kind === 'p') out.push(b.parts.map(part).join(''));
      else if (b.kind === 'list') for (const it of b.items) out.push('  - ' + it.map(part).join(''));
      else {
        out.push('  ' + b.head.join(' | '));
        for (const r of b.rows) out.push('  ' + r.join(' | '));
      }
    }
    out.push('');
  }
  return out.join('\n');
}
