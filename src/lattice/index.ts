/** Cell geometry (metric tensors, reciprocal basis, d, 2-theta) and lattice analysis. */
export { UnitCell, makeCell, parseCellText, stolSquaredColumn } from './cell';
export {
  type ChangeOfBasis, type Rational, IDENTITY_BASIS, parseChangeOfBasis, formatChangeOfBasis, changeOfBasisFromMatrix,
  basisMatrix, basisRows, basisDeterminant, isIntegralBasis, isUnimodularBasis, findInverseBasis, composeBasis,
  transformHkl, transformCell, transformMetric, cellFromMetric,
} from './change-of-basis';
export { type NiggliResult, NIGGLI_RELATIVE_EPSILON, niggliReduce, niggliReduceMetric } from './niggli';
export {
  type BravaisType, type BravaisCandidate, type BravaisSearch, type BravaisOptions, type MonoclinicRule,
  BRAVAIS_TYPES, HOLOHEDRY_ORDER, DEFAULT_LATTICE_TOLERANCE_DEG, findBravaisCandidates,
} from './bravais';
export { type ReindexOptions, NON_INTEGRAL_REASON, reindexTable } from './reindex';
