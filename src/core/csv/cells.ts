/** Text of CSV cells: fixed-point numbers and RFC 4180 quoting. Pure. */
/** 10^0 … 10^9, exact. */
const POW10 = [1, 10, 100, 1000, 10_000, 100_000, 1_000_000, 10_000_000, 100_000_000, 1_000_000_000];

/**
 * `x` with exactly `decimals` digits (0–9) after the point, "" for NaN. Rounds x·10^d half away
 * from zero in binary arithmetic, so a value lying exactly on a decimal tie may differ from
 * Number#toFixed in the last digit; magnitudes beyond 2^53 / 10^d fall back to toFixed.
 */
export function createFixedFormatter(decimals: number): (x: number) => string {
  if (!Number.isInteger(decimals) || decimals < 0 || decimals >= POW10.length) throw new RangeError("decimals must be 0–9");
  const scale = POW10[decimals];
  const limit = Number.MAX_SAFE_INTEGER / scale;
  const zeros = "0".repeat(decimals);
  return (x: number): string => {
    if (x !== x) return "";
    const ax = x < 0 ? -x : x;
    if (ax >= limit) return x.toFixed(decimals);
    const scaled = Math.round(ax * scale);
    if (decimals === 0) return (x < 0 && scaled !== 0 ? "-" : "") + scaled;
    const whole = Math.floor(scaled / scale);
    const frac = scaled - whole * scale;
    const fracText = String(frac);
    const sign = x < 0 && scaled !== 0 ? "-" : "";
    return sign + whole + "." + (fracText.length < decimals ? zeros.slice(fracText.length) + fracText : fracText);
  };
}

/** RFC 4180 quoting of one text cell when it holds a comma, quote or line break. */
export function csvCell(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
