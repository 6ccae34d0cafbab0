/** Decimal numbers read straight from a span of UTF-8 bytes, without building a string. */

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];
const MAX_DIGITS = 15;

/**
 * `[+-]digits[.digits]` in bytes[start, end) (`,` as the point too when `decimalComma`), or NaN when
 * the span has another form (exponent, more than 15 digits, garbage): the caller then falls back to
 * Number(). Exact: an integer below 2^53 divided by an exact power of ten is correctly rounded
 * (IEEE 754), so the result equals Number() of the same text (Clinger's fast path, common practice).
 */
export function parseDecimalBytes(bytes: Uint8Array, start: number, end: number, decimalComma: boolean): number {
  let i = start;
  if (i >= end) return NaN;
  let negative = false;
  const first = bytes[i];
  if (first === 45) {
    negative = true;
    i++;
  } else if (first === 43) {
    i++;
  }
  let mantissa = 0;
  let digits = 0;
  let fractionDigits = 0;
  let seenPoint = false;
  for (; i < end; i++) {
    const c = bytes[i];
    if (c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      if (seenPoint) fractionDigits++;
    } else if (!seenPoint && (c === 46 || (c === 44 && decimalComma))) {
      seenPoint = true;
    } else {
      return NaN;
    }
  }
  if (digits === 0 || digits > MAX_DIGITS) return NaN;
  const v = fractionDigits === 0 ? mantissa : mantissa / POW10[fractionDigits];
  return negative ? -v : v;
}
