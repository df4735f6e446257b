import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { REPO_ROOT } from '../helpers/paths';

/** The gemmi fixture written by tests/reference/symmetry-gemmi.py (see its header). */
export interface GemmiSetting {
  number: number;
  hm: string;
  hall: string;
  point_group: string;
  laue: string;
  crystal_system: string;
  centrosymmetric: boolean;
  sohncke: boolean;
  enantiomorphic: boolean;
  centring: string;
  order: number;
  n_absent: number;
  ops: number[][];
  absent: number;
  eps: number;
  centric: number;
}
export interface GemmiFixture {
  source: string;
  absent_grid: number;
  eps_grid: number;
  settings: GemmiSetting[];
  absent_patterns: string[];
  eps_patterns: string[];
  centric_patterns: string[];
}

let cached: GemmiFixture | undefined;
export function gemmiFixture(): GemmiFixture {
  cached ??= JSON.parse(readFileSync(resolve(REPO_ROOT, 'tests/reference/symmetry-gemmi.json'), 'utf8')) as GemmiFixture;
  return cached;
}

/** Grid of indices |h|,|k|,|l| <= n, h slowest, l fastest (the fixture's order). */
export function indexGrid(n: number, skipOrigin = false): { h: Int16Array; k: Int16Array; l: Int16Array; n: number } {
  const hs: number[] = [], ks: number[] = [], ls: number[] = [];
  for (let h = -n; h <= n; h++)
    for (let k = -n; k <= n; k++)
      for (let l = -n; l <= n; l++) {
        if (skipOrigin && h === 0 && k === 0 && l === 0) continue;
        hs.push(h); ks.push(k); ls.push(l);
      }
  return { h: Int16Array.from(hs), k: Int16Array.from(ks), l: Int16Array.from(ls), n: hs.length };
}

/** Decode a hex bitmask (numpy packbits, little bit order) into booleans. */
export function decodeBits(hex: string, n: number): boolean[] {
  const out: boolean[] = [];
  for (let i = 0; i < n; i++) {
    const byte = parseInt(hex.slice(2 * (i >> 3), 2 * (i >> 3) + 2), 16);
    out.push(((byte >> (i & 7)) & 1) === 1);
  }
  return out;
}
