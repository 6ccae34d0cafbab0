/** Why a timestamp could not be read. */
export type TimestampErrorReason =
  | "unrecognised_format"
  | "missing_date"
  | "ambiguous_date_order"
  | "impossible_date"
  | "impossible_time"
  | "leap_second_label"
  | "before_gps_epoch"
  | "bad_offset";

/** A timestamp that cannot be turned into an instant (month 13, 30 February, 25:00, garbage). */
export class TimestampError extends Error {
  constructor(
    readonly reason: TimestampErrorReason,
    readonly text: string,
    message: string,
  ) {
    super(message);
    this.name = "TimestampError";
  }
}
