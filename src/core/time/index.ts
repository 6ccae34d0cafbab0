export { TimestampError, type TimestampErrorReason } from "./timestamp-error";
export { GPS_EPOCH_MS, gpsMinusUtcSecondsAtUtc, gpsMinusUtcSecondsAtGps, gpsToUtcMs, utcToGpsMs } from "./leap-seconds";
export { isKnownTimeZone, isUtcZone, createZoneOffsetLookup, createLocalToUtc } from "./zone";
export { isLeapYear, daysInMonth, assertCivilFields, daysFromCivil } from "./civil";
export { createTimestampReader, parseTimestamp, type DateOrder, type TimeBasis, type TimeReadOptions, type TimestampReader } from "./parse-timestamp";
export { createIsoUtcFormatter, formatIsoUtc } from "./format-iso";
