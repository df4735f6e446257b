import { existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The repository root (tests run from any working directory). */
export const REPO_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

/**
 * The shared material beside the checkout (`../shared`): real data sets and the conventions.
 * CI clones the repository into another folder with a copy of shared/ beside it, so never
 * use an absolute path to it.
 */
export const SHARED_DIR = resolve(REPO_ROOT, '../shared');
export const REALDATA_DIR = resolve(SHARED_DIR, 'realdata');

/** True when running under CI: missing external tools must fail there, not skip. */
export const IN_CI = process.env.CI === 'true' || process.env.CI === '1';

export function realdata(name: string): string {
  const p = resolve(REALDATA_DIR, name);
  if (!existsSync(p)) throw new Error(`real data set ${name} not found at ${p} (shared/ must sit beside the checkout)`);
  return p;
}
