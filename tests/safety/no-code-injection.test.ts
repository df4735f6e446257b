import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { REPO_ROOT } from '../helpers/paths';
import { scanHtml, scanSource, stripComments } from './code-scan';

/**
 * No file content may ever run as code or land in the page as HTML: the test fails
 * on eval, the Function constructor, innerHTML/outerHTML assignment,
 * insertAdjacentHTML, document.write (and their close relatives) anywhere under
 * src/ and shaders-free-render/. The page's Content-Security-Policy and markup in a
 * data-block name are checked in the browser (tests/browser/app.test.ts).
 */

const ROOTS = ['src', 'shaders-free-render'];
const CODE = /\.(ts|tsx|js|mjs|cjs|mts|cts)$/;

function walk(dir: string, out: string[]): string[] {
  for (const name of readdirSync(dir)) {
    if (name === 'node_modules') continue;
    const p = join(dir, name);
    if (statSync(p).isDirectory()) walk(p, out);
    else out.push(p);
  }
  return out;
}

describe('the scanner finds what it must (so the tree check below can fail)', () => {
  const bad: [string, string][] = [
    ['eval', 'const x = eval(text);'],
    ['eval', 'globalThis.eval(code)'],
    ['Function constructor', 'const f = new Function("a", body);'],
    ['Function constructor', "const g = Function('return 1');"],
    ['innerHTML/outerHTML assignment', 'node.innerHTML = name;'],
    ['innerHTML/outerHTML assignment', 'node.innerHTML += name;'],
    ['innerHTML/outerHTML assignment', "panel['outerHTML'] = html"],
    ['insertAdjacentHTML', "el.insertAdjacentHTML('beforeend', x)"],
    ['document.write', 'document.write(block)'],
    ['document.write', 'document.writeln(block)'],
    ['createContextualFragment', 'range.createContextualFragment(s)'],
    ['srcdoc', 'frame.srcdoc = s'],
    ['event-handler attribute', "img.setAttribute('onerror', s)"],
    ['string timer', "setTimeout('go()', 10)"],
  ];
  for (const [rule, text] of bad)
    it(`flags ${rule}: ${text}`, () => {
      expect(scanSource('x.ts', text).map((f) => f.rule)).toContain(rule);
    });

  const fine = [
    'evaluateConditions(table, plan)',
    'const retrieval = 1; x.medieval(2)',
    'if (node.innerHTML === "") clear(node)',
    'el.textContent = name;',
    '// node.innerHTML = name (a comment)',
    '/* eval(x) in a block comment */',
    "const url = 'http://example.org'; node.textContent = url;",
    'setTimeout(() => go(), 10)',
    'const f: Function = g;',
  ];
  for (const text of fine)
    it(`leaves alone: ${text}`, () => {
      expect(scanSource('x.ts', text)).toEqual([]);
    });

  it('keeps line numbers when blanking comments', () => {
    const src = '/* one\n two */\nnode.innerHTML = s;\n';
    expect(stripComments(src).split('\n').length).toBe(src.split('\n').length);
    expect(scanSource('x.ts', src)).toEqual([{ file: 'x.ts', line: 3, rule: 'innerHTML/outerHTML assignment', text: 'node.innerHTML = s;' }]);
  });

  it('flags inline scripts and inline handlers in HTML', () => {
    expect(scanHtml('p.html', '<script>alert(1)</script>').map((f) => f.rule)).toEqual(['inline script']);
    expect(scanHtml('p.html', '<img src="a.png" onerror="go()">').map((f) => f.rule)).toEqual(['inline event handler']);
    expect(scanHtml('p.html', '<script type="module" src="./main.ts"></script>')).toEqual([]);
  });
});

describe('the source tree', () => {
  const files = ROOTS.flatMap((r) => walk(join(REPO_ROOT, r), []));

  it('has files to check (the walk found the layers)', () => {
    expect(files.filter((f) => CODE.test(f)).length).toBeGreaterThan(50);
    expect(files.some((f) => f.endsWith('.html'))).toBe(true);
  });

  it('has no eval, Function constructor, HTML injection or string timers under src/ and shaders-free-render/', () => {
    const findings = files.flatMap((f) => {
      const rel = relative(REPO_ROOT, f);
      const text = readFileSync(f, 'utf8');
      if (CODE.test(f)) return scanSource(rel, text);
      if (f.endsWith('.html')) return scanHtml(rel, text);
      return [];
    });
    // one list of every finding, so a failure names them all
    expect(findings.map((x) => `${x.file}:${x.line}: ${x.rule}: ${x.text}`)).toEqual([]);
  });
});
