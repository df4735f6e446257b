/**
 * Number parsing straight from bytes (ASCII), without making a string per value.
 * Handles `-12`, `3.25`, `.5`, `1.5e-3`, `+2E4`, and a trailing standard
 * uncertainty `12.3(4)` (ignored here). Up to 15 significant digits the result
 * is exact to the last bit: an integer mantissa below 2^53 divided or multiplied
 * by an exact power of ten is one correctly rounded IEEE operation. Longer or
 * unusual numbers fall back to the built-in Number().
 */

/** Outcomes of a parse (numberScan.status). */
export const NUMBER_OK = 0;
export const NUMBER_BAD = 1;
/** `nan`, `inf`, `infinity` (any case, signed), or a value that overflows. */
export const NUMBER_NONFINITE = 2;

/**
 * Outcome of the last parse: `status` (NUMBER_*) and, for scanByteNumber, `end`
 * (where the token stopped). A constant object, not module-level `let`s, so
 * the hot loop reads plain properties.
 */
export const numberScan = { status: NUMBER_OK, end: 0 };

const POW10 = new Float64Array(23);
for (let j = 0, p = 1; j < 23; j++, p *= 10) POW10[j] = p;

const latin1Decoder = new TextDecoder('latin1');
function latin1(bytes: Uint8Array, start: number, end: number): string {
  return latin1Decoder.decode(bytes.subarray(start, end));
}

const NONFINITE_WORD = /^[+-]?(nan|inf|infinity)$/i;

function slowParse(bytes: Uint8Array, start: number, end: number): number {
  let text = latin1(bytes, start, end);
  const paren = text.indexOf('(');
  if (paren > 0 && text.endsWith(')') && /^\d+$/.test(text.slice(paren + 1, -1))) text = text.slice(0, paren);
  if (NONFINITE_WORD.test(text)) { numberScan.status = NUMBER_NONFINITE; return NaN; }
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text)) { numberScan.status = NUMBER_BAD; return NaN; }
  const v = Number(text);
  numberScan.status = Number.isFinite(v) ? NUMBER_OK : NUMBER_NONFINITE;
  return v;
}

/**
 * Parse the number that starts at bytes[start] and runs to the next blank
 * (space, tab, CR, LF) or `limit`, in one pass; sets `numberScan`.
 */
export function scanByteNumber(bytes: Uint8Array, start: number, limit: number): number {
  let j = start;
  let neg = false;
  let c = bytes[j];
  if (c === 45 /* - */) { neg = true; j++; } else if (c === 43 /* + */) j++;
  let mant = 0;
  let digits = 0;
  let frac = 0;
  while (j < limit) {
    c = bytes[j] - 48;
    if (c < 0 || c > 9) break;
    mant = mant * 10 + c; digits++; j++;
  }
  if (j < limit && bytes[j] === 46 /* . */) {
    j++;
    while (j < limit) {
      c = bytes[j] - 48;
      if (c < 0 || c > 9) break;
      mant = mant * 10 + c; digits++; frac++; j++;
    }
  }
  // the common case: plain decimal followed by a blank
  if (digits > 0 && digits <= 15 && (j >= limit || bytes[j] <= 32)) {
    numberScan.end = j;
    numberScan.status = NUMBER_OK;
    const v = frac === 0 ? mant : mant / POW10[frac];
    return neg ? -v : v;
  }
  let end = j;
  while (end < limit && bytes[end] > 32) end++;
  numberScan.end = end;
  if (digits === 0) return slowParse(bytes, start, end);
  let exp = 0;
  if (j < end && (bytes[j] | 32) === 101 /* e */) {
    j++;
    let eneg = false;
    if (bytes[j] === 45) { eneg = true; j++; } else if (bytes[j] === 43) j++;
    let edigits = 0;
    while (j < end) {
      c = bytes[j] - 48;
      if (c < 0 || c > 9) break;
      exp = exp * 10 + c; edigits++; j++;
    }
    if (edigits === 0) { numberScan.status = NUMBER_BAD; return NaN; }
    if (eneg) exp = -exp;
  }
  if (j < end) {
    // only a standard uncertainty `(digits)` may follow
    if (bytes[j] !== 40 /* ( */ || bytes[end - 1] !== 41 /* ) */ || end - j < 3) { numberScan.status = NUMBER_BAD; return NaN; }
    for (let q = j + 1; q < end - 1; q++) {
      c = bytes[q] - 48;
      if (c < 0 || c > 9) { numberScan.status = NUMBER_BAD; return NaN; }
    }
  }
  if (digits > 15) return slowParse(bytes, start, j);
  const e = exp - frac;
  let v: number;
  if (e === 0) v = mant;
  else if (e < 0 && e >= -22) v = mant / POW10[-e];
  else if (e > 0 && e <= 22) v = mant * POW10[e];
  else return slowParse(bytes, start, j);
  numberScan.status = Number.isFinite(v) ? NUMBER_OK : NUMBER_NONFINITE;
  return neg ? -v : v;
}

/** Parse exactly bytes[start, end) as a decimal number; check `numberScan.status` after the call. */
export function parseByteNumber(bytes: Uint8Array, start: number, end: number): number {
  const v = scanByteNumber(bytes, start, end);
  if (numberScan.end !== end) { numberScan.status = NUMBER_BAD; return NaN; }
  return v;
}
