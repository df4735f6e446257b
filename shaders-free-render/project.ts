/**
 * Point projection with the same matrices three.js uses: column-major 4x4
 * (`Matrix4.elements` order), clip = P * V * world, NDC = clip.xyz / clip.w.
 * No three.js import here, so the renderer runs in Node as well as in a page.
 */

/** out = a * b for column-major 4x4 matrices. `out` may not alias `a` or `b`. */
export function multiplyMat4(out: Float64Array | number[], a: ArrayLike<number>, b: ArrayLike<number>): void {
  for (let col = 0; col < 4; col++) {
    for (let row = 0; row < 4; row++) {
      let s = 0;
      for (let k = 0; k < 4; k++) s += a[k * 4 + row] * b[col * 4 + k];
      out[col * 4 + row] = s;
    }
  }
}

/**
 * Projects one point to normalised device coordinates, as `Vector3.project`
 * does: writes [x, y, z] to out (each in -1..1 when inside the view volume).
 * Returns the clip-space w (<= 0 means behind the camera).
 */
export function projectPoint(viewProj: ArrayLike<number>, x: number, y: number, z: number, out: Float64Array | number[]): number {
  const m = viewProj;
  const w = m[3] * x + m[7] * y + m[11] * z + m[15];
  const iw = 1 / w;
  out[0] = (m[0] * x + m[4] * y + m[8] * z + m[12]) * iw;
  out[1] = (m[1] * x + m[5] * y + m[9] * z + m[13]) * iw;
  out[2] = (m[2] * x + m[6] * y + m[10] * z + m[14]) * iw;
  return w;
}

/** NDC x,y to pixel coordinates (origin top left, y down), pixel centres at +0.5. */
export function ndcToPixel(ndcX: number, ndcY: number, width: number, height: number, out: Float64Array | number[]): void {
  out[0] = (ndcX + 1) * 0.5 * width;
  out[1] = (1 - ndcY) * 0.5 * height;
}
