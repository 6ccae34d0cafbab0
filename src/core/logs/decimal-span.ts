/** Decimal numbers read straight from a span of UTF-8 bytes, without building a string. */

const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];
/** Digits of a mantissa read exactly: 15 keep it below 2^53. */
const MAX_DIGITS = 15;
const POINT = 46;
const COMMA = 44;

/** parseDecimalBytes' slot for the value (a typed slot keeps the double unboxed). */
const scratch = new Float64Array(1);

/**
 * The `[+-]digits[.digits]` that starts bytes[start, limit) (`,` as the point too when
 * `decimalComma`) into out[outAt]; returns the offset of the first byte after it. The value is NaN
 * when it has no digit or more than 15 (the caller then falls back to Number()). The value goes to
 * a typed slot, not a return value, so that it is never boxed on the heap. Exact: an integer below 2^53 divided by an
 * exact power of ten is correctly rounded (IEEE 754), so the result equals Number() of the same
 * text (Clinger's fast path, common practice). Integer and fraction digits are read in two plain
 * loops, without per-digit state flags.
 */
export function readDecimalPrefix(bytes: Uint8Array, start: number, limit: number, decimalComma: boolean, out: Float64Array, outAt: number): number {
  let i = start;
  const first = i < limit ? bytes[i] : 0;
  const negative = first === 45;
  if (negative || first === 43) i++;
  const intStart = i;
  let mantissa = 0;
  let d = 0;
  for (; i < limit; i++) {
    d = bytes[i] - 48;
    if (d < 0 || d > 9) break;
    mantissa = mantissa * 10 + d;
  }
  let digitCount = i - intStart;
  let fractionDigits = 0;
  if (i < limit && (d === POINT - 48 || (d === COMMA - 48 && decimalComma))) {
    const fracStart = ++i;
    for (; i < limit; i++) {
      d = bytes[i] - 48;
      if (d < 0 || d > 9) break;
      mantissa = mantissa * 10 + d;
    }
    fractionDigits = i - fracStart;
    digitCount += fractionDigits;
  }
  if (digitCount === 0 || digitCount > MAX_DIGITS) {
    out[outAt] = NaN;
  } else {
    const v = fractionDigits === 0 ? mantissa : mantissa / POW10[fractionDigits];
    out[outAt] = negative ? -v : v;
  }
  return i;
}

/**
 * The whole span bytes[start, end) as `[+-]digits[.digits]` (see readDecimalPrefix), or NaN when the
 * span has another form (exponent, more than 15 digits, garbage): the caller then falls back to Number().
 */
export function parseDecimalBytes(bytes: Uint8Array, start: number, end: number, decimalComma: boolean): number {
  return readDecimalPrefix(bytes, start, end, decimalComma, scratch, 0) === end ? scratch[0] : NaN;
}
