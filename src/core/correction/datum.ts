/**
 * The survey datum D in diurnal = B(t) − D: a fixed number (practice: a round value near the
 * base's typical reading, kept for the whole survey; Milsom, Field Geophysics, ch. 3), the median
 * or mean of the base record, or `reference` = the main field at the base position
 * (USGS data release CMGDS 2017-686-FA: A = [F − I(x)] − [F_B(t) − I_B]).
 */
import { mean, median } from "../series";

export type DatumChoice = number | "median" | "mean" | "reference";

/** A numeric datum for number/median/mean; null for `reference` (then it varies with time). */
export function resolveNumericDatum(choice: DatumChoice, baseFieldNt: ArrayLike<number>): number | null {
  if (typeof choice === "number") {
    if (!Number.isFinite(choice)) throw new RangeError("datum must be a finite number of nT");
    return choice;
  }
  if (choice === "reference") return null;
  if (baseFieldNt.length === 0) throw new RangeError(`a ${choice} datum needs base readings`);
  if (choice === "median") return median(baseFieldNt);
  if (choice === "mean") return mean(baseFieldNt);
  throw new RangeError(`unknown datum "${String(choice)}" (expected a number, median, mean or reference)`);
}
