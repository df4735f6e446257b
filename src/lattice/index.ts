/** Cell geometry (metric tensors, reciprocal basis, d, 2-theta) and lattice analysis. */
export { UnitCell, makeCell, parseCellText, stolSquaredColumn } from './cell';
