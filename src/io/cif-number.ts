/**
 * CIF numbers: `12`, `-0.5`, `1.2e-3`, `.5`, optionally followed by a standard
 * uncertainty in parentheses, `0.1234(5)` meaning 0.1234 +- 0.0005 (CIF 1.1
 * specification, "numeric values": the su applies to the last digits of the mantissa).
 */
export interface CifNumber {
  readonly value: number;
  /** Standard uncertainty, when the text gave one in parentheses. */
  readonly su?: number;
}

const NUMBER_WITH_SU = /^([+-]?)(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?(?:\((\d+)\))?$/;

/** Parse a CIF numeric value; undefined for anything else (including `?` and `.`). */
export function parseCifNumber(text: string): CifNumber | undefined {
  const m = NUMBER_WITH_SU.exec(text.trim());
  if (!m) return undefined;
  const [, sign, intPart, fracPart, exp, suDigits] = m;
  if (intPart === '' && (fracPart === undefined || fracPart === '')) return undefined;
  const mantissa = `${sign}${intPart || '0'}.${fracPart ?? ''}`;
  const e = exp === undefined ? 0 : Number(exp);
  const value = Number(`${mantissa}e${e}`);
  if (!Number.isFinite(value)) return undefined;
  if (suDigits === undefined) return { value };
  const decimals = fracPart?.length ?? 0;
  const su = Number(`${suDigits}e${e - decimals}`);
  return { value, su };
}
