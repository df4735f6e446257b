/**
 * Trial structures: CIF model reader, X-ray form factors (International Tables Vol. C Table 6.1.1.4),
 * structure factors, model-against-data comparison and simulated data.
 */
export * from './crystal-model';
export { findFormFactor, formFactorAt, formFactorAtStol2, formFactorElements, parseTypeSymbol } from './form-factors';
export type { FormFactorCoefficients, TypeSymbol } from './form-factors';
export { reciprocalGeometry, stol2Of } from './reciprocal-geometry';
export type { ReciprocalGeometry } from './reciprocal-geometry';
export { cosSinTurns } from './trig-turns';
export * from './structure-factors';
