/** Readers and writers: CIF 1.1 / mmCIF documents, reflection files (CIF, delimited text), gzip detection. */
export { parseCifNumber, type CifNumber } from './cif-number';
export {
  parseCifDocument, findCifBlock, isMissingValue, cifValueNumber,
  CifBlock, CifLoop, type CifDocument, type CifItem, type CifValue, type CifValueKind,
} from './cif-document';
export { readReflections, detectReflectionFormat, type ReflectionFormat } from './reflection-reader';
export type { ReadReflectionsOptions } from './read-options';
export { isGzip } from './gzip';
export { parseByteNumber } from './byte-number';
export { summarizeReflections, countUniqueHkl, type ReflectionSummary } from './reflection-summary';
export { writeReflectionCif, formatFloat32, type WriteReflectionCifOptions } from './reflection-cif-writer';
