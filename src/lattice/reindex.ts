import { fail, ok, type ReflectionMeta, type ReflectionTable, type Result } from '../core';
import { basisDeterminant, formatChangeOfBasis, transformCell, transformHkl, type ChangeOfBasis } from './change-of-basis';

/**
 * Reindex a reflection table: h' = h P for every row (Miller indices are rows,
 * International Tables Vol. A, Part 5), and the cell G' = P^T G P. Intensities
 * and sigmas are copied bit for bit, so a transformation followed by its inverse
 * gives back the original table exactly. Pure: the input is not changed.
 *
 * A P with fractions (a smaller cell) maps some reflections to non-integer
 * indices. They are either an error (default, with the count and the first
 * example) or, with `dropNonIntegral`, left out and counted in the metadata as
 * rejected rows and in a warning: nothing goes silently.
 */
export interface ReindexOptions {
  readonly dropNonIntegral?: boolean;
}

export const NON_INTEGRAL_REASON = 'indices not integral after the change of basis';

export function reindexTable(table: ReflectionTable, cob: ChangeOfBasis, options: ReindexOptions = {}): Result<ReflectionTable> {
  const det = basisDeterminant(cob);
  const text = formatChangeOfBasis(cob);
  if (det.num === 0) return fail(`the change of basis ${text} is singular`);
  const n = table.n;
  const H = new Int16Array(n), K = new Int16Array(n), L = new Int16Array(n);
  const I = new Float32Array(n), S = new Float32Array(n);
  const out = new Int32Array(3);
  let kept = 0, nonIntegral = 0, outOfRange = 0;
  let firstBad = '';
  for (let j = 0; j < n; j++) {
    const h = table.h[j], k = table.k[j], l = table.l[j];
    if (!transformHkl(cob, h, k, l, out)) {
      if (nonIntegral++ === 0) firstBad = `${h} ${k} ${l}`;
      continue;
    }
    const hx = out[0], ky = out[1], lz = out[2];
    if (Math.abs(hx) > 32767 || Math.abs(ky) > 32767 || Math.abs(lz) > 32767) {
      outOfRange++;
      continue;
    }
    H[kept] = hx; K[kept] = ky; L[kept] = lz;
    I[kept] = table.i[j]; S[kept] = table.sigma[j];
    kept++;
  }
  if (nonIntegral && !options.dropNonIntegral)
    return fail(
      `${nonIntegral} of ${n} reflections get non-integer indices under ${text} (first: ${firstBad}); the new cell is smaller than the lattice of the data`,
      { file: table.meta.source },
      'Check the transformation, or leave those reflections out on purpose (they should be systematically absent in the new cell).',
    );
  if (outOfRange) return fail(`${outOfRange} reflections get indices beyond +-32767 under ${text}`, { file: table.meta.source });
  const src = table.meta;
  const meta: ReflectionMeta = {
    ...src,
    cell: src.cell ? transformCell(src.cell, cob) : undefined,
    rejectedCount: src.rejectedCount + nonIntegral,
    rejectedExamples: [...src.rejectedExamples],
    rejectedByReason: { ...src.rejectedByReason },
    warnings: [...src.warnings],
  };
  if (det.num < 0) {
    // allowed (intensities do not care) but never silent: the hand of the axes changes
    const flipped = formatChangeOfBasis({ ...cob, num: cob.num.map((x) => -x) });
    meta.warnings.push(
      `the change of basis ${text} has determinant ${det.den === 1 ? det.num : `${det.num}/${det.den}`}: the new axes are left-handed, so Friedel mates trade places ` +
        `(anomalous differences and the absolute structure flip); ${flipped} describes the same cell right-handed`,
    );
  }
  if (Math.abs(det.num) > det.den) {
    const v = det.den === 1 ? String(Math.abs(det.num)) : `${Math.abs(det.num)}/${det.den}`;
    meta.warnings.push(`the new cell has ${v} times the volume of the old: only part of its reciprocal-lattice points can hold data, the others are absent by construction (as for a centred cell)`);
  }
  if (nonIntegral) {
    meta.rejectedByReason[NON_INTEGRAL_REASON] = (meta.rejectedByReason[NON_INTEGRAL_REASON] ?? 0) + nonIntegral;
    meta.warnings.push(`${nonIntegral} reflections left out: ${NON_INTEGRAL_REASON} ${text} (first: ${firstBad})`);
  }
  const trim = <T extends Int16Array | Float32Array>(a: T): T => a.slice(0, kept) as T;
  return ok({ n: kept, h: trim(H), k: trim(K), l: trim(L), i: trim(I), sigma: trim(S), meta });
}
