/**
 * Exact space-group symmetry: operations in integers (translations over DEN = 24), a Hall-symbol
 * interpreter, every setting of International Tables Vol. A Table 4.3.2.1, reflection
 * conditions derived from the operations, per-reflection absences, epsilon factors and
 * centric flags, and a fast whole-table absence test.
 */
export {
  DEN,
  type SymOp,
  parseTriplet,
  formatTriplet,
  tripletOp,
  composeOps,
  invertOp,
  changeBasisOp,
  makeOp,
  identityOp,
  translationOp,
  opsEqual,
  opKey,
  rotationKey,
  rotationOrder,
  rotationType,
  det3,
  adjugate3,
  mul3,
  isIdentityRotation,
} from './ops';
export { parseHall, type HallGenerators } from './hall';
export {
  closeGroup,
  splitCentring,
  distinctRotations,
  classifyPointGroup,
  laueClassesForLattice,
  LAUE_CLASSES,
  POINT_GROUP_CLASSES,
  type CrystalSystem,
} from './group';
export {
  type Condition,
  type Zone,
  conditionOfOp,
  conditionKey,
  conditionZoneDim,
  parseConditionText,
  deriveConditions,
  breaksCondition,
  combinedConditionText,
  zoneOfRotation,
} from './conditions';
export {
  type SpaceGroupSetting,
  allSettings,
  findSetting,
  getSetting,
  settingFromOps,
  shortSymbol,
  opSetKey,
} from './settings';
export {
  isSystematicallyAbsent,
  epsilonFactor,
  isCentric,
  rotatedIndices,
  equivalentIndices,
  phaseShiftNumerator,
  absentFlags,
  epsilonColumn,
  centricColumn,
} from './reflection';
export {
  type ConditionCatalogue,
  buildConditionCatalogue,
  evaluateConditions,
  absenceBits,
  absentColumn,
  countAbsentPerSetting,
  countBrokenPerCondition,
  classCounts,
  classifyReflections,
  type AbsenceClasses,
  testBit,
} from './catalogue';
