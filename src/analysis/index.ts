/**
 * Analysis: normalisation and Wilson statistics, intensity statistics (N(z), moments,
 * L-test), Laue-class evidence, absence evidence and space-group ranking.
 * Pure computation on columnar data; no files, DOM or Node APIs.
 */
export {
  rankSpaceGroups, RANK_CAUTION,
  type RankOptions, type RankProgress, type RankResult, type CandidateReport, type ConditionReport, type ClassReport, type LaueClassReport,
} from './rank-space-groups';
export { DEFAULT_TOLERANCE, metricFit, candidateSettings, type MetricTolerance, type MetricFit } from './candidates';
export { buildShells, expectedIntensity, expectedIntensityColumn, wilsonPlot, type ResolutionShells, type WilsonPlot } from './normalisation';
export { intensityStatistics, nzAcentric, nzCentric, THEORY, NZ_GRID, CENTRIC_LOG_ODDS_CAP, type IntensityStatistics } from './intensity-statistics';
export { mergeIdentical, type MergeResult } from './merge';
export { reflectionLogOdds, absenceEvidence, forbids, type ConditionLike, type ConditionEvidence, type AbsenceEvidence } from './absence-evidence';
export { rotationAgreements, type RotationAgreement } from './laue-evidence';
export { sigmaScaleFromPairs, sigmaScaleFromNegatives } from './sigma-scale';
export { HklIndex } from './hkl-index';
