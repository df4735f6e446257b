/** Unit cell parameters: lengths in angstrom, angles in degrees (every interface). */
export interface CellParams {
  readonly a: number;
  readonly b: number;
  readonly c: number;
  readonly alpha: number;
  readonly beta: number;
  readonly gamma: number;
}
