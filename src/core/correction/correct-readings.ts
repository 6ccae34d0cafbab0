/**
 * Diurnal and main-field correction of rover readings against a base series.
 *
 * Per reading, with B(t) the base interpolated to the reading time and D the datum:
 *   diurnal   = B(t) − D                   (datum = reference: diurnal = B(t) − I_B(t), the main
 *                                           field at the base position at t; USGS CMGDS 2017-686-FA)
 *   corrected = (F − instrumentOffsetNt) − diurnal     (instrument offset = rover − base, nT; Milsom)
 *   reference = I(x, t), total field of the injected model at the reading
 *   residual  = corrected − reference
 * A reading that cannot be corrected keeps its place with NaN values and flags saying why.
 */
import { createBaseInterpolator, CoverStatus, type InterpolationMethod, DEFAULT_MAX_GAP_S } from "./base-interpolator";
import type { BaseSeries } from "./base-series";
import { resolveNumericDatum, type DatumChoice } from "./datum";
import { CorrectionFlag, type CorrectionFlagName } from "./flags";
import type { BasePosition, ReferenceFieldEvaluator } from "./reference-evaluator";

export interface RoverReadings {
  count?: number;
  timeMs: ArrayLike<number>;
  fieldNt: ArrayLike<number>;
  latDeg?: ArrayLike<number> | null;
  lonDeg?: ArrayLike<number> | null;
  heightM?: ArrayLike<number> | null;
}

export interface CorrectionOptions {
  /** Default "median" of the base record. */
  datum?: DatumChoice;
  method?: InterpolationMethod;
  /** Default 120 s. */
  maxGapS?: number;
  /** Rover − base instrument offset (nT), subtracted from each raw reading; default 0. */
  instrumentOffsetNt?: number;
  /** Needed for datum "reference". */
  basePosition?: BasePosition | null;
  /** Height used where a reading has none (m above the ellipsoid); default 0. */
  defaultHeightM?: number;
  /** Rover indices that are base occupations (looped surveys); flagged base_occupation. */
  baseOccupations?: ArrayLike<number> | null;
}

export interface CorrectionColumns {
  count: number;
  baseNt: Float64Array;
  diurnalNt: Float64Array;
  correctedNt: Float64Array;
  referenceNt: Float64Array;
  residualNt: Float64Array;
  /** Bits of CorrectionFlag. */
  flags: Uint8Array;
}

export interface CorrectionSummary {
  datum: DatumChoice;
  /** The numeric datum used; null for datum "reference". */
  datumNt: number | null;
  method: InterpolationMethod;
  maxGapS: number;
  instrumentOffsetNt: number;
  /** Label of the reference model, null when none. */
  referenceModel: string | null;
  count: number;
  correctedCount: number;
  residualCount: number;
  flagCounts: Record<CorrectionFlagName, number>;
  warnings: string[];
}

export interface CorrectionResult extends CorrectionColumns {
  summary: CorrectionSummary;
}

export interface Corrector {
  readonly datumNt: number | null;
  /**
   * Correct one batch. Duplicate times: `duplicateMarks` (e.g. duplicateTimeMarks over the whole
   * log, sliced to this batch) when given; otherwise a reading equal in time to the previous one
   * is flagged with it, also across batches: then the previous batch's last reading gains the
   * duplicate_time flag in the columns already returned for it. So without marks a batch's flags
   * are final once the next batch has been corrected; a caller that hands each batch on at once
   * passes marks.
   * `into`: columns to write the batch into (views of their first n values are returned), so a
   * caller that is done with each batch before the next can reuse one set; every value is written.
   * Reuse goes with `duplicateMarks` (without them, the previous batch's columns may still change).
   */
  correctBatch(rover: RoverReadings, duplicateMarks?: Uint8Array, into?: CorrectionColumns): CorrectionColumns;
  summary(): CorrectionSummary;
}

function countOf(rover: RoverReadings): number {
  return rover.count ?? rover.timeMs.length;
}

/**
 * The reference field of readings 0…n−1 into out (the evaluator's batch form when it has one, the
 * same values one by one otherwise): NaN without a position or outside the model's validity; a
 * reading without height uses defaultHeightM.
 */
function referenceInto(
  reference: ReferenceFieldEvaluator,
  out: Float64Array,
  lat: ArrayLike<number>,
  lon: ArrayLike<number>,
  height: ArrayLike<number> | null,
  timeMs: ArrayLike<number>,
  n: number,
  defaultHeightM: number,
): void {
  if (reference.totalNtInto) {
    reference.totalNtInto(out, lat, lon, height, timeMs, n, defaultHeightM);
    return;
  }
  for (let i = 0; i < n; i++) {
    const h = height ? height[i] : NaN;
    const positioned = lat[i] === lat[i] && lon[i] === lon[i];
    out[i] = positioned && reference.covers(timeMs[i]) ? reference.totalNt(lat[i], lon[i], h === h ? h : defaultHeightM, timeMs[i]) : NaN;
  }
}

/** Correction columns for n readings (zeros until written). */
export function emptyColumns(n: number): CorrectionColumns {
  return {
    count: n,
    baseNt: new Float64Array(n),
    diurnalNt: new Float64Array(n),
    correctedNt: new Float64Array(n),
    referenceNt: new Float64Array(n),
    residualNt: new Float64Array(n),
    flags: new Uint8Array(n),
  };
}

function columnViews(c: CorrectionColumns, n: number): CorrectionColumns {
  return {
    count: n,
    baseNt: c.baseNt.subarray(0, n),
    diurnalNt: c.diurnalNt.subarray(0, n),
    correctedNt: c.correctedNt.subarray(0, n),
    referenceNt: c.referenceNt.subarray(0, n),
    residualNt: c.residualNt.subarray(0, n),
    flags: c.flags.subarray(0, n),
  };
}

/** Build a corrector for a base series; throws RangeError on bad options. */
export function createCorrector(base: BaseSeries, reference: ReferenceFieldEvaluator | null, options: CorrectionOptions = {}): Corrector {
  const datum = options.datum ?? "median";
  const method = options.method ?? "linear";
  const maxGapS = options.maxGapS ?? DEFAULT_MAX_GAP_S;
  const instrumentOffsetNt = options.instrumentOffsetNt ?? 0;
  const defaultHeightM = options.defaultHeightM ?? 0;
  if (!Number.isFinite(instrumentOffsetNt)) throw new RangeError("instrument offset must be a finite number of nT");
  const datumNt = resolveNumericDatum(datum, base.fieldNt);
  const basePos = options.basePosition ?? null;
  if (datum === "reference") {
    if (!reference) throw new RangeError("datum 'reference' needs a reference model (not --reference none)");
    if (!basePos || !Number.isFinite(basePos.latDeg) || !Number.isFinite(basePos.lonDeg)) {
      throw new RangeError("datum 'reference' needs the base position (latitude, longitude, height)");
    }
  }
  const interp = createBaseInterpolator(base, { method, maxGapS });
  let coverStatus = new Uint8Array(0); // per reading of the batch, reused
  const occupations = options.baseOccupations ? new Set(Array.from(options.baseOccupations)) : null;
  const flagCounts: Record<CorrectionFlagName, number> = {
    no_base_cover: 0, base_gap: 0, outside_model_validity: 0, duplicate_time: 0, no_position: 0, base_occupation: 0,
  };
  let total = 0;
  let correctedCount = 0;
  let residualCount = 0;
  let prevTimeMs = NaN;
  let prevFlags: Uint8Array | null = null; // flags of the last reading corrected so far: prevFlags[prevIndex]
  let prevIndex = -1;
  let offset = 0; // index of the batch's first reading in the whole log
  let heightDefaulted = 0;
  const baseHeightM = basePos && Number.isFinite(basePos.heightM) ? basePos.heightM : defaultHeightM;

  function correctBatch(rover: RoverReadings, duplicate?: Uint8Array, into?: CorrectionColumns): CorrectionColumns {
    const n = countOf(rover);
    if (into && into.count < n) throw new RangeError(`correction columns for ${into.count} readings cannot take a batch of ${n}`);
    const out = into ? columnViews(into, n) : emptyColumns(n);
    const { timeMs, fieldNt } = rover;
    // columns in locals: the loop below runs per reading
    const { baseNt, diurnalNt, correctedNt, referenceNt, residualNt, flags: flagsOut } = out;
    const lat = rover.latDeg ?? null;
    const lon = rover.lonDeg ?? null;
    const hgt = rover.heightM ?? null;
    // the previous batch as the loop needs it; this batch becomes the previous one (done here, before
    // the loop, for the reason given after it)
    const previousFlags = prevFlags;
    const previousIndex = prevIndex;
    const first = offset;
    if (n > 0) {
      prevFlags = out.flags;
      prevIndex = n - 1;
    }
    total += n;
    offset += n;
    // running state in locals, written back after the loop: a double kept in a closure variable is
    // boxed on every store (an allocation per reading in V8)
    let lastTimeMs = prevTimeMs;
    let correctedSoFar = correctedCount;
    let residuals = residualCount;
    let defaulted = heightDefaulted;
    // the reference field and the base of the whole batch, each in one call
    if (reference && lat && lon) referenceInto(reference, referenceNt, lat, lon, hgt, timeMs, n, defaultHeightM);
    if (coverStatus.length < n) coverStatus = new Uint8Array(n);
    interp.fill(baseNt, coverStatus, timeMs, n);
    for (let i = 0; i < n; i++) {
      const t = timeMs[i];
      let flags = 0;
      if (duplicate ? duplicate[i] : t === lastTimeMs) flags |= CorrectionFlag.duplicateTime;
      if (!duplicate && t === lastTimeMs) {
        // mark both members of an adjacent pair (the first may sit in the previous batch)
        const earlier = i > 0 ? flagsOut : previousFlags!;
        const k = i > 0 ? i - 1 : previousIndex;
        if (!(earlier[k] & CorrectionFlag.duplicateTime)) {
          earlier[k] |= CorrectionFlag.duplicateTime;
          flagCounts.duplicate_time++;
        }
      }
      lastTimeMs = t;
      if (occupations && occupations.has(first + i)) flags |= CorrectionFlag.baseOccupation;

      // reference at the reading
      let refNt = NaN;
      const covered = reference ? reference.covers(t) : false;
      const la = lat ? lat[i] : NaN;
      const lo = lon ? lon[i] : NaN;
      if (reference) {
        if (la !== la || lo !== lo) flags |= CorrectionFlag.noPosition;
        else if (!covered) flags |= CorrectionFlag.outsideModelValidity;
        else {
          const h = hgt ? hgt[i] : NaN;
          if (h !== h) defaulted++; // referenceInto used defaultHeightM
          refNt = referenceNt[i];
        }
      }

      // diurnal
      const b = baseNt[i];
      let diurnal = NaN;
      if (b !== b) {
        flags |= coverStatus[i] === CoverStatus.BaseGap ? CorrectionFlag.baseGap : CorrectionFlag.noBaseCover;
      } else if (datumNt !== null) {
        diurnal = b - datumNt;
      } else if (covered) {
        diurnal = b - reference!.totalNt(basePos!.latDeg, basePos!.lonDeg, baseHeightM, t);
      } else {
        flags |= CorrectionFlag.outsideModelValidity;
      }
      const corrected = fieldNt[i] - instrumentOffsetNt - diurnal;
      const residual = corrected - refNt;
      diurnalNt[i] = diurnal;
      correctedNt[i] = corrected;
      referenceNt[i] = refNt;
      residualNt[i] = residual;
      flagsOut[i] = flags;
      if (corrected === corrected) correctedSoFar++;
      if (residual === residual) residuals++;
      if (flags) {
        if (flags & CorrectionFlag.noBaseCover) flagCounts.no_base_cover++;
        if (flags & CorrectionFlag.baseGap) flagCounts.base_gap++;
        if (flags & CorrectionFlag.outsideModelValidity) flagCounts.outside_model_validity++;
        if (flags & CorrectionFlag.duplicateTime) flagCounts.duplicate_time++;
        if (flags & CorrectionFlag.noPosition) flagCounts.no_position++;
        if (flags & CorrectionFlag.baseOccupation) flagCounts.base_occupation++;
      }
    }
    // Nothing but plain stores after the loop: the loop is compiled while it first runs, before any
    // code after it has run, and the optimized code bailed out at the first operation there that
    // had no type feedback (a compare, a call), on every batch.
    prevTimeMs = lastTimeMs;
    correctedCount = correctedSoFar;
    residualCount = residuals;
    heightDefaulted = defaulted;
    return out;
  }

  return {
    datumNt,
    correctBatch,
    summary(): CorrectionSummary {
      const warnings: string[] = [];
      if (heightDefaulted > 0) warnings.push(`${heightDefaulted} readings had no height: the reference field used ${defaultHeightM} m`);
      return {
        datum, datumNt, method, maxGapS, instrumentOffsetNt,
        referenceModel: reference ? reference.label : null,
        count: total, correctedCount, residualCount, flagCounts: { ...flagCounts }, warnings,
      };
    },
  };
}

/** Readings [start, end) of typed rover columns, as views (nothing copied), for correctBatch. */
export function sliceRoverReadings(
  rover: { timeMs: Float64Array; fieldNt: Float64Array; latDeg: Float64Array | null; lonDeg: Float64Array | null; heightM: Float64Array | null },
  start: number,
  end: number,
): RoverReadings {
  const view = (a: Float64Array | null) => (a ? a.subarray(start, end) : null);
  return { count: end - start, timeMs: view(rover.timeMs)!, fieldNt: view(rover.fieldNt)!, latDeg: view(rover.latDeg), lonDeg: view(rover.lonDeg), heightM: view(rover.heightM) };
}

/** Mark every reading whose time occurs more than once in the whole log. */
export function duplicateTimeMarks(timeMs: ArrayLike<number>, count = timeMs.length): Uint8Array {
  const marks = new Uint8Array(count);
  let sorted = true;
  for (let i = 1; i < count; i++) {
    if (timeMs[i] < timeMs[i - 1]) {
      sorted = false;
      break;
    }
  }
  if (sorted) {
    for (let i = 1; i < count; i++) if (timeMs[i] === timeMs[i - 1]) marks[i] = marks[i - 1] = 1;
    return marks;
  }
  const copy = Float64Array.from({ length: count }, (_, i) => timeMs[i]).sort();
  const dups = new Set<number>();
  for (let i = 1; i < count; i++) if (copy[i] === copy[i - 1]) dups.add(copy[i]);
  if (dups.size > 0) for (let i = 0; i < count; i++) if (dups.has(timeMs[i])) marks[i] = 1;
  return marks;
}

/** Correct a whole rover log at once (duplicate times found anywhere in the log). */
export function correctReadings(
  rover: RoverReadings,
  base: BaseSeries,
  reference: ReferenceFieldEvaluator | null,
  options: CorrectionOptions = {},
): CorrectionResult {
  const corrector = createCorrector(base, reference, options);
  const columns = corrector.correctBatch(rover, duplicateTimeMarks(rover.timeMs, countOf(rover)));
  return { ...columns, summary: corrector.summary() };
}

