/**
 * Trial structures: CIF model reader, X-ray form factors (International Tables Vol. C Table 6.1.1.4; ions Waasmaier & Kirfel 1995),
 * structure factors, model-against-data comparison and simulated data.
 */
export * from './crystal-model';
export {
  FORM_FACTOR_S_MAX, formFactorRangeWarning, findFormFactor, findIonFormFactor, formatTypeSymbol, formFactorAt, formFactorAtStol2,
  formFactorElements, formFactorIons, parseTypeSymbol,
} from './form-factors';
export type { FormFactorCoefficients, FormFactorSource, TypeSymbol } from './form-factors';
export { cosSinTurns } from './trig-turns';
export * from './structure-factors';
export { SPECIAL_POSITION_TOLERANCE, siteSymmetryOrder, closestDistinctImage, imageDistance } from './site-symmetry';
export { parseModelCif } from './model-cif';
export type { ModelReadOptions } from './model-cif';
export * from './compare-data';
export { simulateData, isAbsentByOps } from './simulate-data';
export { hemisphereIndices, MAX_GENERATED_REFLECTIONS } from './hemisphere';
export type { SimulationOptions, SimulationResult } from './simulate-data';
export { SeededRandom } from './seeded-random';
