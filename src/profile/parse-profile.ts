import { fail, ok, type Result } from '../core';
import { DEFAULT_PROFILE, WAVELENGTHS, type ExportDelimiter, type LabProfile, type MonoclinicSetting } from './lab-profile';

/**
 * Read and check a lab profile (JSON). Every problem is reported with the JSON
 * path of the value (`$.tolerances.lattice_deg`) and, where it can be found, the
 * line in the file; unknown keys are errors (a misspelt rule must not be
 * ignored silently). Missing keys take the defaults.
 *
 * {
 *   "lacuna_profile": 1,                       required, the format version
 *   "name": "...", "description": "...",
 *   "monoclinic_setting": "reduced" | "beta-closest-to-90",
 *   "observed_i_over_sigma": 2,                I > n sigma(I) counts as observed
 *   "wavelength": "Mo K-alpha" | "Cu K-alpha" | 0.71073,
 *   "text_export": { "columns": { "h","k","l","intensity","sigma": names }, "delimiter": "space" | "comma" | "tab" },
 *   "tolerances": { "lattice_deg": 3, "niggli_relative_epsilon": 1e-5 },
 *   "notes": ["free-text house rules"]
 * }
 */
export const PROFILE_FORMAT_VERSION = 1;

const TOP_KEYS = ['lacuna_profile', 'name', 'description', 'monoclinic_setting', 'observed_i_over_sigma', 'wavelength', 'text_export', 'tolerances', 'notes'];
const EXPORT_KEYS = ['columns', 'delimiter'];
const COLUMN_KEYS = ['h', 'k', 'l', 'intensity', 'sigma'];
const TOLERANCE_KEYS = ['lattice_deg', 'niggli_relative_epsilon'];

class ProfileError {
  constructor(readonly path: string, readonly message: string) {}
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function show(v: unknown): string {
  const s = JSON.stringify(v);
  return s === undefined ? String(v) : s.length > 40 ? s.slice(0, 37) + '...' : s;
}

function editDistance(a: string, b: string): number {
  const d = Array.from({ length: a.length + 1 }, (_, i) => [i, ...new Array<number>(b.length).fill(0)]);
  for (let j = 1; j <= b.length; j++) d[0][j] = j;
  for (let i = 1; i <= a.length; i++)
    for (let j = 1; j <= b.length; j++)
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
  return d[a.length][b.length];
}

function checkKeys(obj: Record<string, unknown>, allowed: string[], path: string): void {
  for (const k of Object.keys(obj)) {
    if (allowed.includes(k)) continue;
    const near = allowed.find((a) => editDistance(a, k) <= 2);
    throw new ProfileError(`${path}.${k}`, `unknown key${near ? ` (did you mean "${near}"?)` : `; known keys here: ${allowed.join(', ')}`}`);
  }
}

function str(v: unknown, path: string, maxLen = 200): string {
  if (typeof v !== 'string') throw new ProfileError(path, `expected a string, got ${show(v)}`);
  if (v.length > maxLen) throw new ProfileError(path, `longer than ${maxLen} characters`);
  return v;
}

function num(v: unknown, path: string, min: number, max: number, unit: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v)) throw new ProfileError(path, `expected a number (${unit}), got ${show(v)}`);
  if (v < min || v > max) throw new ProfileError(path, `${v} is outside the accepted range ${min} to ${max} (${unit})`);
  return v;
}

function oneOf<T extends string>(v: unknown, path: string, options: readonly T[]): T {
  if (typeof v !== 'string' || !options.includes(v as T)) throw new ProfileError(path, `expected one of ${options.map((o) => `"${o}"`).join(', ')}, got ${show(v)}`);
  return v as T;
}

function buildProfile(doc: unknown, source: string): LabProfile {
  if (!isObject(doc)) throw new ProfileError('$', `expected a JSON object, got ${show(doc)}`);
  checkKeys(doc, TOP_KEYS, '$');
  if (!('lacuna_profile' in doc)) throw new ProfileError('$.lacuna_profile', `missing; write "lacuna_profile": ${PROFILE_FORMAT_VERSION} to mark the file as a lab profile`);
  if (doc.lacuna_profile !== PROFILE_FORMAT_VERSION) throw new ProfileError('$.lacuna_profile', `this version of Lacuna reads profile format ${PROFILE_FORMAT_VERSION}, got ${show(doc.lacuna_profile)}`);
  const d = DEFAULT_PROFILE;
  const name = doc.name === undefined ? source : str(doc.name, '$.name', 120);
  if (name.trim() === '') throw new ProfileError('$.name', 'is empty');
  const description = doc.description === undefined ? '' : str(doc.description, '$.description', 2000);
  const monoclinicSetting = doc.monoclinic_setting === undefined ? d.monoclinicSetting : oneOf<MonoclinicSetting>(doc.monoclinic_setting, '$.monoclinic_setting', ['reduced', 'beta-closest-to-90']);
  const observedIOverSigma = doc.observed_i_over_sigma === undefined ? d.observedIOverSigma : num(doc.observed_i_over_sigma, '$.observed_i_over_sigma', 0, 100, 'multiples of sigma(I)');

  let wavelength = d.wavelength;
  if (doc.wavelength !== undefined) {
    const w = doc.wavelength;
    if (typeof w === 'string') wavelength = { label: oneOf(w, '$.wavelength', Object.keys(WAVELENGTHS)), angstrom: WAVELENGTHS[w] };
    else wavelength = { label: 'custom', angstrom: num(w, '$.wavelength', 0.1, 5, 'angstrom, or "Mo K-alpha" / "Cu K-alpha"') };
  }

  let textExport = d.textExport;
  if (doc.text_export !== undefined) {
    const t = doc.text_export;
    if (!isObject(t)) throw new ProfileError('$.text_export', `expected an object, got ${show(t)}`);
    checkKeys(t, EXPORT_KEYS, '$.text_export');
    let columns = d.textExport.columns;
    if (t.columns !== undefined) {
      if (!isObject(t.columns)) throw new ProfileError('$.text_export.columns', `expected an object naming the columns h, k, l, intensity, sigma, got ${show(t.columns)}`);
      checkKeys(t.columns, COLUMN_KEYS, '$.text_export.columns');
      const c: Record<string, string> = { ...d.textExport.columns };
      for (const k of COLUMN_KEYS) {
        if (t.columns[k] === undefined) continue;
        const v = str(t.columns[k], `$.text_export.columns.${k}`, 40);
        if (!/^[A-Za-z_][A-Za-z0-9_.()\-]*$/.test(v)) throw new ProfileError(`$.text_export.columns.${k}`, `"${v}" is not usable as a column name (letters, digits, _ . - ( ), starting with a letter)`);
        c[k] = v;
      }
      const names = COLUMN_KEYS.map((k) => c[k]);
      const dup = names.find((n, j) => names.indexOf(n) !== j);
      if (dup) throw new ProfileError('$.text_export.columns', `the name "${dup}" is used for two columns`);
      columns = c as unknown as LabProfile['textExport']['columns'];
    }
    const delimiter = t.delimiter === undefined ? d.textExport.delimiter : oneOf<ExportDelimiter>(t.delimiter, '$.text_export.delimiter', ['space', 'comma', 'tab']);
    textExport = { columns, delimiter };
  }

  let tolerances = d.tolerances;
  if (doc.tolerances !== undefined) {
    const t = doc.tolerances;
    if (!isObject(t)) throw new ProfileError('$.tolerances', `expected an object, got ${show(t)}`);
    checkKeys(t, TOLERANCE_KEYS, '$.tolerances');
    tolerances = {
      latticeDeg: t.lattice_deg === undefined ? d.tolerances.latticeDeg : num(t.lattice_deg, '$.tolerances.lattice_deg', 0.001, 10, 'degrees'),
      niggliRelativeEpsilon: t.niggli_relative_epsilon === undefined ? d.tolerances.niggliRelativeEpsilon : num(t.niggli_relative_epsilon, '$.tolerances.niggli_relative_epsilon', 1e-12, 1e-2, 'relative'),
    };
  }

  let notes: string[] = [];
  if (doc.notes !== undefined) {
    if (!Array.isArray(doc.notes)) throw new ProfileError('$.notes', `expected an array of strings, got ${show(doc.notes)}`);
    notes = doc.notes.map((n, j) => str(n, `$.notes[${j}]`, 500));
  }
  return { name, description, source, monoclinicSetting, observedIOverSigma, wavelength, textExport, tolerances, notes };
}

/** 1-based line and column of a character offset. */
function lineColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1, col = 1;
  for (let j = 0; j < offset && j < text.length; j++) {
    if (text[j] === '\n') { line++; col = 1; } else col++;
  }
  return { line, column: col };
}

/** Line of the last key of a JSON path, when that key occurs exactly once in the text. */
function lineOfPath(text: string, path: string): number | undefined {
  const m = /\.([A-Za-z_]+)(?:\[\d+\])?$/.exec(path);
  if (!m) return undefined;
  const needle = `"${m[1]}"`;
  const first = text.indexOf(needle);
  if (first < 0 || text.indexOf(needle, first + 1) >= 0) return undefined;
  return lineColumn(text, first).line;
}

/** Parse and validate a profile; `source` names the file in messages. */
export function parseProfile(text: string, source: string): Result<LabProfile> {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (e) {
    const msg = (e as Error).message;
    const pos = /position (\d+)/.exec(msg);
    const lc = /line (\d+) column (\d+)/.exec(msg);
    const where = lc ? { line: Number(lc[1]), column: Number(lc[2]) } : pos ? lineColumn(text, Number(pos[1])) : {};
    return fail(`not valid JSON: ${msg.replace(/^JSON\.parse: /, '')}`, { file: source, ...where }, 'A lab profile is a JSON object; see public/profiles/ for examples.');
  }
  try {
    return ok(buildProfile(doc, source));
  } catch (e) {
    if (e instanceof ProfileError) return fail(`${e.path}: ${e.message}`, { file: source, line: lineOfPath(text, e.path) });
    throw e;
  }
}
