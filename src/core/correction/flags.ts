/** Per-reading correction flags, as bits (fast in typed arrays) with stable names for output. */
export const CorrectionFlag = {
  /** Rover time before the first or after the last base sample: not corrected (no extrapolation). */
  noBaseCover: 1,
  /** Rover time inside a base gap longer than maxGapS: not corrected (no bridging). */
  baseGap: 2,
  /** Reading time outside the reference model's validity: no reference/residual (and no correction for datum=reference). */
  outsideModelValidity: 4,
  /** Another rover reading has the same time. */
  duplicateTime: 8,
  /** No latitude/longitude while a reference model is in use: no reference/residual. */
  noPosition: 16,
  /** This reading is itself a base occupation of a looped survey. */
  baseOccupation: 32,
} as const;

export type CorrectionFlagName =
  | "no_base_cover"
  | "base_gap"
  | "outside_model_validity"
  | "duplicate_time"
  | "no_position"
  | "base_occupation";

const NAMES: ReadonlyArray<readonly [number, CorrectionFlagName]> = [
  [CorrectionFlag.noBaseCover, "no_base_cover"],
  [CorrectionFlag.baseGap, "base_gap"],
  [CorrectionFlag.outsideModelValidity, "outside_model_validity"],
  [CorrectionFlag.duplicateTime, "duplicate_time"],
  [CorrectionFlag.noPosition, "no_position"],
  [CorrectionFlag.baseOccupation, "base_occupation"],
];

/** Flag names of a bit set, in a fixed order. */
export function flagNames(bits: number): CorrectionFlagName[] {
  const out: CorrectionFlagName[] = [];
  for (const [bit, name] of NAMES) if (bits & bit) out.push(name);
  return out;
}
