/**
 * A lab profile: the house rules a group writes down once (JSON file, chosen
 * with `--profile FILE` or in the app) and every command and the app apply.
 * All numbers in the project's units: angstrom, degrees.
 */

/** Which monoclinic cell to report; same strings as the lattice layer's MonoclinicRule. */
export type MonoclinicSetting = 'reduced' | 'beta-closest-to-90';

export type ExportDelimiter = 'space' | 'comma' | 'tab';

export interface ExportColumns {
  readonly h: string;
  readonly k: string;
  readonly l: string;
  readonly intensity: string;
  readonly sigma: string;
}

export interface LabProfile {
  /** Shown wherever the profile is in force. */
  readonly name: string;
  readonly description: string;
  /** File it came from, or 'built-in'. */
  readonly source: string;
  /** Monoclinic cell choice (see MonoclinicRule in src/lattice). */
  readonly monoclinicSetting: MonoclinicSetting;
  /** A reflection is observed when I > threshold * sigma(I). */
  readonly observedIOverSigma: number;
  /** Default wavelength when a file gives none. */
  readonly wavelength: { readonly angstrom: number; readonly label: string };
  /** Column names and delimiter of the lab's text exports (h, k, l, I, sigma). */
  readonly textExport: { readonly columns: ExportColumns; readonly delimiter: ExportDelimiter };
  readonly tolerances: {
    /** Largest Le Page angle (degrees) for a Bravais lattice candidate. */
    readonly latticeDeg: number;
    /** Relative epsilon of the Niggli reduction (times V^(2/3)). */
    readonly niggliRelativeEpsilon: number;
  };
  /** Free-text house rules, shown in the conventions guide. */
  readonly notes: readonly string[];
}

/** Weighted K-alpha wavelengths in angstrom as commonly quoted (from memory of International Tables Vol. C, Table 4.2.2.1). */
export const WAVELENGTHS: Readonly<Record<string, number>> = {
  'Mo K-alpha': 0.71073,
  'Cu K-alpha': 1.54184,
};

/** The rules in force when no profile is given. */
export const DEFAULT_PROFILE: LabProfile = {
  name: 'built-in defaults',
  description: 'Lacuna defaults: International Tables cell conventions, I > 2 sigma(I) for observed (common practice), Mo K-alpha.',
  source: 'built-in',
  monoclinicSetting: 'reduced',
  observedIOverSigma: 2,
  wavelength: { angstrom: WAVELENGTHS['Mo K-alpha'], label: 'Mo K-alpha' },
  textExport: { columns: { h: 'h', k: 'k', l: 'l', intensity: 'I', sigma: 'sigI' }, delimiter: 'space' },
  tolerances: { latticeDeg: 3, niggliRelativeEpsilon: 1e-5 },
  notes: [],
};

/** True when the reflection counts as observed under the profile (sigma <= 0 never does). */
export function isObserved(profile: LabProfile, i: number, sigma: number): boolean {
  return sigma > 0 && i > profile.observedIOverSigma * sigma;
}

/** The house rules as short lines, for the CLI and the guide. */
export function describeProfile(p: LabProfile): string[] {
  const delim = { space: 'spaces', comma: 'commas', tab: 'tabs' }[p.textExport.delimiter];
  const c = p.textExport.columns;
  return [
    `monoclinic cell: ${p.monoclinicSetting === 'reduced' ? 'shortest a and c (C-centred for mC), beta >= 90' : 'the cell choice with beta closest to 90 degrees (may be I-centred for mC)'}`,
    `observed reflection: I > ${p.observedIOverSigma} sigma(I)`,
    `default wavelength: ${p.wavelength.label} (${p.wavelength.angstrom} A)`,
    `text export columns: ${[c.h, c.k, c.l, c.intensity, c.sigma].join(' ')} separated by ${delim}`,
    `lattice tolerance: ${p.tolerances.latticeDeg} degrees (largest angle between a twofold axis and its lattice-plane normal)`,
    ...p.notes.map((n) => `house rule: ${n}`),
  ];
}
