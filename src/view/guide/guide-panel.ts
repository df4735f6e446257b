import { clear, el } from '../dom';
import { buildGuideSections, type AxisName, type GuidePart, type GuideState } from './guide-content';

/**
 * Mount the conventions guide in `container`. Every string goes in through
 * textContent (via `el`), never innerHTML: data-block names and profile notes
 * are text, whatever they contain.
 *
 * `options.onAxisHighlight(axis)` is called with 'a*', 'b*', 'c*', 'a', 'b' or
 * 'c' while the pointer (or keyboard focus) rests on an axis name, and with
 * null when it leaves, so the page can highlight that axis in the 3D view.
 * Call `update(state)` when the data, layer, candidate or profile change, and
 * `dispose()` to empty the container.
 */
export interface GuidePanelOptions {
  readonly onAxisHighlight?: (axis: AxisName | null) => void;
  /** Sections shown unfolded (default: 'axes' and 'lattice'); the others are one click away. */
  readonly openSections?: readonly string[];
}

export interface GuidePanel {
  update(state: GuideState): void;
  dispose(): void;
}

function renderParts(parts: readonly GuidePart[], onAxis?: (axis: AxisName | null) => void): Array<Node | string> {
  return parts.map((x) => {
    if (typeof x === 'string') return x;
    const span = el('span', { class: 'guide-axis', text: x.text, title: `highlight ${x.axis} in the 3D view`, attrs: { tabindex: '0', 'data-axis': x.axis } });
    if (onAxis) {
      const on = () => onAxis(x.axis);
      const off = () => onAxis(null);
      span.addEventListener('mouseenter', on);
      span.addEventListener('focus', on);
      span.addEventListener('mouseleave', off);
      span.addEventListener('blur', off);
    }
    return span;
  });
}

export function buildGuidePanel(container: HTMLElement, state: GuideState = {}, options: GuidePanelOptions = {}): GuidePanel {
  const openIds = options.openSections ?? ['axes', 'lattice'];
  const render = (s: GuideState) => {
    clear(container);
    const root = el('div', { class: 'guide' }, [el('h2', { text: 'Conventions guide' })]);
    for (const section of buildGuideSections(s)) {
      // collapsible, the first two open: the panel is long for a side column
      const box = el('details', { class: 'guide-section', attrs: { 'data-section': section.id } }, [el('summary', { text: section.title })]);
      if (openIds.includes(section.id)) box.setAttribute('open', '');
      for (const b of section.blocks) {
        if (b.kind === 'p') box.append(el('p', {}, renderParts(b.parts, options.onAxisHighlight)));
        else if (b.kind === 'list') box.append(el('ul', {}, b.items.map((it) => el('li', {}, renderParts(it, options.onAxisHighlight)))));
        else {
          const head = el('tr', {}, b.head.map((h) => el('th', { text: h })));
          const body = el('tbody', {}, b.rows.map((r) => el('tr', {}, r.map((c) => el('td', { text: c })))));
          box.append(el('table', { class: 'guide-table' }, [el('thead', {}, [head]), body]));
        }
      }
      root.append(box);
    }
    container.append(root);
  };
  render(state);
  return {
    update: render,
    dispose: () => {
      options.onAxisHighlight?.(null);
      clear(container);
    },
  };
}
