/** Calendar checks for civil date-time fields (proleptic Gregorian). */
import { TimestampError } from "./timestamp-error";

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

export function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

export function daysInMonth(year: number, month: number): number {
  return month === 2 && isLeapYear(year) ? 29 : DAYS_IN_MONTH[month - 1];
}

/** Throws TimestampError for month 13, 30 February, 25:00, minute 61 and the like. */
export function assertCivilFields(
  text: string,
  year: number,
  month: number,
  day: number,
  hour: number,
  minute: number,
  second: number,
): void {
  if (month < 1 || month > 12) throw new TimestampError("impossible_date", text, `impossible month ${month} in "${text}"`);
  if (day < 1 || day > daysInMonth(year, month)) {
    throw new TimestampError("impossible_date", text, `impossible day ${day} of month ${month} in "${text}"`);
  }
  if (hour > 23) throw new TimestampError("impossible_time", text, `impossible hour ${hour} in "${text}"`);
  if (minute > 59) throw new TimestampError("impossible_time", text, `impossible minute ${minute} in "${text}"`);
  if (second === 60) {
    throw new TimestampError("leap_second_label", text, `second 60 (a leap-second label) is not accepted in "${text}"`);
  }
  if (second > 59) throw new TimestampError("impossible_time", text, `impossible second ${second} in "${text}"`);
}

/**
 * Days since 1970-01-01 of a proleptic Gregorian date (H. Hinnant's "days_from_civil", common
 * practice); exact for all years, unlike Date.UTC, which maps years 0–99 to 1900–1999.
 */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const mp = month > 2 ? month - 3 : month + 9;
  const doy = Math.floor((153 * mp + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146_097 + doe - 719_468;
}
