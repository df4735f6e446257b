/**
 * A small source scanner for the safety test: finds code that runs text as code
 * (eval, the Function constructor, string timers) or writes text into the page
 * as HTML (innerHTML/outerHTML assignment, insertAdjacentHTML, document.write,
 * createContextualFragment, srcdoc, inline event-handler attributes).
 * File content must only ever reach the page through textContent.
 *
 * Comments are blanked first (string and template literals are kept, so a URL
 * such as 'http://..' does not start a comment); a pattern inside a string is
 * still reported, which errs on the safe side.
 */
export interface Finding {
  readonly file: string;
  readonly line: number;
  readonly rule: string;
  readonly text: string;
}

const RULES: readonly { rule: string; re: RegExp }[] = [
  { rule: 'eval', re: /(^|[^\w$.])eval\s*\(|\.eval\s*\(|\[\s*['"`]eval['"`]\s*\]/ },
  { rule: 'Function constructor', re: /\bnew\s+Function\s*\(|(^|[^\w$.])Function\s*\(\s*['"`]/ },
  { rule: 'innerHTML/outerHTML assignment', re: /\.(innerHTML|outerHTML)\s*(\+?=)(?!=)|\[\s*['"`](innerHTML|outerHTML)['"`]\s*\]\s*\+?=(?!=)/ },
  { rule: 'insertAdjacentHTML', re: /\binsertAdjacentHTML\b/ },
  { rule: 'document.write', re: /\bdocument\s*\.\s*write(ln)?\s*\(/ },
  { rule: 'createContextualFragment', re: /\bcreateContextualFragment\b/ },
  { rule: 'srcdoc', re: /\.srcdoc\s*=(?!=)|setAttribute\s*\(\s*['"`]srcdoc['"`]/ },
  { rule: 'event-handler attribute', re: /setAttribute\s*\(\s*['"`]on[a-z]+['"`]/i },
  { rule: 'string timer', re: /\bset(Timeout|Interval)\s*\(\s*['"`]/ },
];

/** Blank out // and /* *\/ comments, keeping line breaks and string/template literals. */
export function stripComments(src: string): string {
  let out = '';
  let j = 0;
  const n = src.length;
  while (j < n) {
    const c = src[j];
    const d = src[j + 1];
    if (c === '/' && d === '/') {
      while (j < n && src[j] !== '\n') { out += ' '; j++; }
    } else if (c === '/' && d === '*') {
      out += '  ';
      j += 2;
      while (j < n && !(src[j] === '*' && src[j + 1] === '/')) { out += src[j] === '\n' ? '\n' : ' '; j++; }
      if (j < n) { out += '  '; j += 2; }
    } else if (c === '"' || c === "'" || c === '`') {
      out += c;
      j++;
      while (j < n && src[j] !== c) {
        if (src[j] === '\\' && j + 1 < n) { out += src[j] + src[j + 1]; j += 2; continue; }
        if (src[j] === '\n' && c !== '`') break; // unterminated: stop at the line end
        out += src[j];
        j++;
      }
      if (j < n && src[j] === c) { out += c; j++; }
    } else {
      out += c;
      j++;
    }
  }
  return out;
}

/** Findings in one source text (`file` is only used in the result). */
export function scanSource(file: string, src: string): Finding[] {
  const found: Finding[] = [];
  const lines = stripComments(src).split('\n');
  lines.forEach((text, k) => {
    for (const { rule, re } of RULES) if (re.test(text)) found.push({ file, line: k + 1, rule, text: text.trim() });
  });
  return found;
}

/** Inline scripts and inline event handlers in an HTML page. */
export function scanHtml(file: string, src: string): Finding[] {
  const found: Finding[] = [];
  src.split('\n').forEach((text, k) => {
    if (/<script\b(?![^>]*\bsrc=)[^>]*>/i.test(text)) found.push({ file, line: k + 1, rule: 'inline script', text: text.trim() });
    if (/<[a-z][^>]*\son[a-z]+\s*=/i.test(text)) found.push({ file, line: k + 1, rule: 'inline event handler', text: text.trim() });
  });
  return found;
}
