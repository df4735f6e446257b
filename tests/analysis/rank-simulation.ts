/**
 * Data for the ranking accuracy suite: a random structure in a given space-group setting
 * (a few light atoms and one heavier one at random general positions), its cell drawn at
 * random and made to fit the setting's metric exactly (group average of R^T G R), then
 * measured-looking data from the project's seeded simulator (src/model): merged in P-1
 * (a hemisphere), counting and proportional noise, random incompleteness and a few weak
 * violations of the absences (2-6 sigma, as multiple diffraction gives, on a few percent of
 * the absent reflections at most).
 */
import { makeCell } from '../../src/lattice';
import { atomSitesFromList, simulateData, SeededRandom, type CrystalModel } from '../../src/model';
import { isSystematicallyAbsent, type SpaceGroupSetting } from '../../src/symmetry';
import type { ReflectionTable } from '../../src/core';

function metricFromParams(a: number, b: number, c: number, al: number, be: number, ga: number): number[] {
  const r = Math.PI / 180;
  const ab = a * b * Math.cos(ga * r), ac = a * c * Math.cos(be * r), bc = b * c * Math.cos(al * r);
  return [a * a, ab, ac, ab, b * b, bc, ac, bc, c * c];
}

export function randomCellFor(setting: SpaceGroupSetting, rng: SeededRandom, volumeTarget: number) {
  const g = metricFromParams(
    5 + 10 * rng.uniform(), 5 + 10 * rng.uniform(), 5 + 10 * rng.uniform(),
    80 + 25 * rng.uniform(), 80 + 25 * rng.uniform(), 80 + 25 * rng.uniform(),
  );
  const avg = new Array<number>(9).fill(0);
  for (const R of setting.rotations)
    for (let i = 0; i < 3; i++)
      for (let j = 0; j < 3; j++) {
        let s = 0;
        for (let k = 0; k < 3; k++) for (let l = 0; l < 3; l++) s += R[k * 3 + i] * g[k * 3 + l] * R[l * 3 + j];
        avg[i * 3 + j] += s / setting.rotations.length;
      }
  const a = Math.sqrt(avg[0]), b = Math.sqrt(avg[4]), c = Math.sqrt(avg[8]);
  const d = 180 / Math.PI;
  let p = { a, b, c, alpha: Math.acos(avg[5] / (b * c)) * d, beta: Math.acos(avg[2] / (a * c)) * d, gamma: Math.acos(avg[1] / (a * b)) * d };
  const cell0 = makeCell(p);
  if (!cell0.ok) throw cell0.error;
  const f = Math.cbrt(volumeTarget / cell0.value.volume);
  p = { ...p, a: a * f, b: b * f, c: c * f };
  const cell = makeCell(p);
  if (!cell.ok) throw cell.error;
  return cell.value;
}

export interface SimulatedCase {
  readonly setting: SpaceGroupSetting;
  readonly table: ReflectionTable;
}

/**
 * `deposited`: as a deposited file usually is: merged to one asymmetric unit of the Laue
 * class, and the reflections the space group forbids removed.
 * `weak`: a tenth of the intensity (high-resolution shells near the noise), 25-40 % of the
 * reflections missing, as in a poorly diffracting or partly measured crystal.
 */
export type CaseQuality = 'normal' | 'weak' | 'deposited';

export function simulateCase(setting: SpaceGroupSetting, seed: number, targetReflections = 3000, quality: CaseQuality = 'normal'): SimulatedCase {
  const rng = new SeededRandom(seed);
  const nAsu = 4 + rng.below(5);
  const order = setting.ops.length;
  const cell = randomCellFor(setting, rng, Math.max(400, 18 * nAsu * order));
  // resolution giving about targetReflections in the hemisphere: N = (2/3) pi V / d^3
  const dmin = Math.max(0.6, Math.cbrt(((2 / 3) * Math.PI * cell.volume) / targetReflections));
  const atoms = Array.from({ length: nAsu }, (_, j) => ({
    label: `A${j + 1}`,
    element: j === 0 && rng.uniform() < 0.5 ? 'S' : ['C', 'N', 'O'][rng.below(3)],
    x: rng.uniform(), y: rng.uniform(), z: rng.uniform(),
    uiso: 0.02 + 0.03 * rng.uniform(),
  }));
  const model: CrystalModel = { source: `random ${setting.hm}`, cell, ops: setting.ops, atoms: atomSitesFromList(atoms), warnings: [] };
  const options = {
    dmin,
    seed: seed + 1,
    meanIntensity: (200 + 3000 * rng.uniform()) * (quality === 'weak' ? 0.1 : 1),
    background: 20,
    p: 0.03,
    incompleteness: quality === 'weak' ? 0.25 + 0.15 * rng.uniform() : 0.05 + 0.1 * rng.uniform(),
    violations: 0,
    source: `simulated ${setting.hm} seed ${seed}`,
  };
  let r = simulateData(model, options);
  if (!r.ok) throw r.error;
  // Weak violations (multiple diffraction) touch a few percent of the absent reflections at
  // most: 0-3 of them, and none when fewer than 20 reflections are absent (e.g. a lone screw axis).
  const violations = Math.min(rng.below(4), Math.floor(r.value.absent / 20));
  if (violations > 0) {
    r = simulateData(model, { ...options, violations });
    if (!r.ok) throw r.error;
  }
  const table = r.value.table;
  if (quality !== 'deposited') return { setting, table };
  // keep one measured reflection per Laue orbit (Friedel mates included), and drop the
  // systematically absent ones
  const rots = setting.laueRotations;
  const key = (h: number, k: number, l: number) => ((h + 512) * 1024 + (k + 512)) * 1024 + (l + 512);
  const seenOrbit = new Set<number>();
  const keep: number[] = [];
  for (let j = 0; j < table.n; j++) {
    const h = table.h[j], k = table.k[j], l = table.l[j];
    if (isSystematicallyAbsent(setting, h, k, l)) continue;
    let canon = -1;
    for (const R of rots) {
      const q = key(h * R[0] + k * R[3] + l * R[6], h * R[1] + k * R[4] + l * R[7], h * R[2] + k * R[5] + l * R[8]);
      if (q > canon) canon = q;
    }
    if (seenOrbit.has(canon)) continue;
    seenOrbit.add(canon);
    keep.push(j);
  }
  const pick16 = (x: Int16Array) => Int16Array.from(keep, (j) => x[j]);
  const pick32 = (x: Float32Array) => Float32Array.from(keep, (j) => x[j]);
  return {
    setting,
    table: { ...table, n: keep.length, h: pick16(table.h), k: pick16(table.k), l: pick16(table.l), i: pick32(table.i), sigma: pick32(table.sigma) },
  };
}
