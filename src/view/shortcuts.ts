import { byId, clear, el } from './dom';

/** What the keyboard does; the help overlay lists the same table. */
export const SHORTCUTS: ReadonlyArray<readonly [key: string, what: string]> = [
  ['1 .. 7', 'layer hk0, h0l, 0kl, hk1, h1l, 1kl, hhl'],
  ['a / b / c', 'look down a*, b*, c*'],
  ['r', 'reset the 3D view'],
  ['i', 'colour by intensity or by I/\u03c3'],
  ['[ / ]', 'previous / next space-group candidate'],
  ['Esc', 'clear the selection (candidate, condition, picked spot)'],
  ['o', 'open a reflection file'],
  ['p', 'save the layer as PNG'],
  ['?', 'show or hide this list'],
];

interface ShortcutTarget {
  layer: { setLayer(name: string): boolean; exportPng(): void };
  viewAlong(axis: 0 | 1 | 2): void;
  lattice: { resetView(): void };
  settings: { colour: 'intensity' | 'isigma' };
  gui: { controllersRecursive(): Array<{ updateDisplay(): unknown }> };
  restyle(): void;
  stepCandidate(d: number): void;
  selectCandidate(j: number): void;
  showPick(row: number): void;
}

const PRESET_KEYS = ['hk0', 'h0l', '0kl', 'hk1', 'h1l', '1kl', 'hhl'];

export function installShortcuts(app: ShortcutTarget): void {
  const help = byId('help');
  const fillHelp = () => {
    clear(help);
    const t = el('table');
    for (const [k, w] of SHORTCUTS) t.append(el('tr', {}, [el('td', { class: 'key', text: k }), el('td', { text: w })]));
    help.append(el('h2', { text: 'Keyboard' }), t, el('p', { class: 'muted', text: 'Esc or ? closes this list.' }));
  };
  const toggleHelp = () => { if (help.hidden) fillHelp(); help.hidden = !help.hidden; };
  byId('help-button').addEventListener('click', toggleHelp);
  window.addEventListener('keydown', (e) => {
    const t = e.target as HTMLElement | null;
    if (t && (t.tagName === 'INPUT' || t.tagName === 'TEXTAREA' || t.isContentEditable || t.tagName === 'SELECT')) return;
    if (e.ctrlKey || e.metaKey || e.altKey) return;
    const k = e.key;
    if (k >= '1' && k <= '7') { app.layer.setLayer(PRESET_KEYS[Number(k) - 1]); return; }
    switch (k) {
      case 'a': app.viewAlong(0); break;
      case 'b': app.viewAlong(1); break;
      case 'c': app.viewAlong(2); break;
      case 'r': app.lattice.resetView(); break;
      case 'i':
        app.settings.colour = app.settings.colour === 'intensity' ? 'isigma' : 'intensity';
        for (const c of app.gui.controllersRecursive()) c.updateDisplay();
        app.restyle();
        break;
      case '[': app.stepCandidate(-1); break;
      case ']': app.stepCandidate(1); break;
      case 'o': byId('file-input').click(); break;
      case 'p': app.layer.exportPng(); break;
      case '?': toggleHelp(); break;
      case 'Escape':
        if (!help.hidden) { help.hidden = true; break; }
        app.selectCandidate(-1);
        app.showPick(-1);
        break;
      default: return;
    }
    e.preventDefault();
  });
}
