/**
 * Reading numbers that people type or files carry: plain decimal notation only. JavaScript's Number() also
 * reads hexadecimal, octal and binary ("0x10" is 16), "Infinity" and an empty string (0), none of which a
 * pixel size, a count or a coordinate is ever written as.
 */

/** A decimal number: optional sign, digits with an optional decimal point, an optional exponent. */
const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** A whole number in plain digits, with an optional leading + . */
const WHOLE = /^\+?\d+$/;

/**
 * The value of a decimal number written in text (surrounding spaces allowed), or NaN when the text is not
 * one: "0x10", "0b1", "Infinity", "", "1,5" and "1e400" (beyond the largest double) all give NaN.
 */
export function parseDecimal(text: string): number {
  const t = text.trim();
  if (!DECIMAL.test(t)) return Number.NaN;
  const v = Number(t);
  return Number.isFinite(v) ? v : Number.NaN;
}

/** The value of a whole number written in plain digits ("12", "+12"), or NaN ("1e3", "1.0", "0x10", "-1"). */
export function parseWhole(text: string): number {
  const t = text.trim();
  if (!WHOLE.test(t)) return Number.NaN;
  const v = Number(t);
  return Number.isSafeInteger(v) ? v : Number.NaN;
}
