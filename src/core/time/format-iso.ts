/** UTC ms → `yyyy-mm-ddThh:mm:ss.sssZ`, with the date part cached per day (fast for sorted logs). */
const MS_PER_DAY = 86_400_000;

function pad2(n: number): string {
  return n < 10 ? "0" + n : String(n);
}

function pad3(n: number): string {
  return n < 10 ? "00" + n : n < 100 ? "0" + n : String(n);
}

/** A formatter with its own one-day cache; results equal `new Date(ms).toISOString()` for years 0–9999. */
export function createIsoUtcFormatter(): (timeMs: number) => string {
  let cachedDay = NaN;
  let cachedPrefix = "";
  return (timeMs: number): string => {
    const day = Math.floor(timeMs / MS_PER_DAY);
    if (day !== cachedDay) {
      cachedDay = day;
      cachedPrefix = new Date(day * MS_PER_DAY).toISOString().slice(0, 11);
    }
    let rest = timeMs - day * MS_PER_DAY;
    const h = Math.floor(rest / 3_600_000);
    rest -= h * 3_600_000;
    const mi = Math.floor(rest / 60_000);
    rest -= mi * 60_000;
    const s = Math.floor(rest / 1000);
    const ms = rest - s * 1000;
    return cachedPrefix + pad2(h) + ":" + pad2(mi) + ":" + pad2(s) + "." + pad3(ms) + "Z";
  };
}

/** One-off formatting of UTC ms as ISO 8601 with milliseconds. */
export function formatIsoUtc(timeMs: number): string {
  return new Date(timeMs).toISOString();
}
