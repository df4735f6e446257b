import type { Rule } from './rules';

/**
 * What the evidence panels show, in plain structured-clone data (it crosses
 * from the worker). analysis-bridge.ts fills it from the ranking engine.
 */
export interface ConditionRow extends Rule {
  /** Reflections tested (in the zone and forbidden by the rule). */
  readonly n: number;
  readonly meanIOverSigma: number;
  /** Of them, how many have I/sigma >= 3. */
  readonly nStrong: number;
  /** Probability that the rule holds (the forbidden reflections are truly absent). */
  readonly probabilityAbsent: number;
}

export interface CandidateRow {
  readonly number: number;
  readonly hm: string;
  readonly hall: string;
  readonly probability: number;
  /** Plain-English reasons, one per line. */
  readonly explanation: readonly string[];
  /** The reflection conditions of this setting. */
  readonly rules: readonly Rule[];
  readonly centrosymmetric?: boolean;
  readonly sohncke?: boolean;
}

export interface WilsonPoint { readonly s2: number; readonly lnMeanI: number; readonly count: number }

export interface StatisticsView {
  readonly wilson: readonly WilsonPoint[];
  /** Wilson fit: ln<I> = lnK - 2 B s^2 (s = sin(theta)/lambda). */
  readonly wilsonB?: number;
  readonly wilsonLnK?: number;
  readonly nz?: { readonly z: readonly number[]; readonly observed: readonly number[]; readonly acentric: readonly number[]; readonly centric: readonly number[] };
  readonly probabilityCentric?: number;
}

export interface AnalysisView {
  readonly available: boolean;
  /** Why there is no ranking, or notes from the engine. */
  readonly notes: readonly string[];
  readonly laue?: string;
  readonly candidates: readonly CandidateRow[];
  readonly conditions: readonly ConditionRow[];
  readonly statistics?: StatisticsView;
}
