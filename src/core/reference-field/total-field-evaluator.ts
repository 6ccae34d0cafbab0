/**
 * Fast total-field evaluation for a survey: many readings in a small box over a short time.
 *
 * Built on the one synthesis routine (synthesizeFromCoefficients): coefficients are brought to a few
 * time nodes once, the total field is synthesised on a regular latitude × longitude × height grid over
 * the box at each time node, and a reading is evaluated by trilinear interpolation in space and linear
 * interpolation in time.
 *
 * Why this is exact enough:
 *  - Time: Gauss coefficients are linear in decimal year between epochs, and decimal year is linear in
 *    time within a calendar year, so each field component is exactly linear in time between nodes placed
 *    at the range ends, every 1 January and every model epoch inside the range. The total field is the
 *    norm of that vector; nodes at most MAX_TIME_NODE_SPACING_MS apart keep its curvature error below
 *    ~1e-3 nT (change of ≤ ~12 nT in 30 days: 12² / (8 · 20 000 nT)).
 *  - Space: the grid starts at ~8 km (4 km in height) spacing and is halved until, at the edge
 *    midpoints, face centres and centre of up to 200 cells spread over it, trilinear interpolation
 *    agrees with direct synthesis to GRID_TOLERANCE_NT.
 * Readings outside the box or time range fall back to direct synthesis (exact, slower); a time outside
 * the model's validity throws OutsideModelValidityError. Longitudes are wrapped by 360° into the box, so a
 * survey across the antimeridian gives a box past 180° (e.g. 179.95° to 180.05°) and readings at −179.97°
 * still use the grid.
 */
import { coefficientsAtYear, epochIntervalIndex } from "./coefficients-at-time";
import { DEG_TO_RAD } from "./constants";
import { decimalYear, timeMsFromDecimalYear, utcYearBoundsMs } from "./decimal-year";
import type { CoefficientSet, FieldModel } from "./model";
import { synthesizeField, synthesizeFromCoefficients } from "./synthesis";

export interface TotalFieldEvaluatorOptions {
  minTimeMs: number;
  maxTimeMs: number;
  minLatDeg: number;
  maxLatDeg: number;
  minLonDeg: number;
  maxLonDeg: number;
  minHeightM: number;
  maxHeightM: number;
}

/** Total field (nT) of the reference model at a geodetic position and UTC instant. */
export type TotalFieldEvaluator = (latDeg: number, lonDeg: number, heightM: number, timeMs: number) => number;

/**
 * The total field of readings 0…count−1 into out[0…count−1]: NaN where latitude or longitude is
 * NaN or the time is outside the model's validity; a NaN height counts as `defaultHeightM`. The
 * evaluator's values, in one call per batch (a double passed to a call that is not inlined is
 * boxed, an allocation per reading).
 */
export type TotalFieldBatchEvaluator = (
  out: Float64Array,
  latDeg: ArrayLike<number>,
  lonDeg: ArrayLike<number>,
  heightM: ArrayLike<number> | null,
  timeMs: ArrayLike<number>,
  count: number,
  defaultHeightM: number,
) => void;

export interface TotalFieldGrid {
  evaluate: TotalFieldEvaluator;
  evaluateInto: TotalFieldBatchEvaluator;
  /** Nodes per axis; all zero when the box was too large and every reading uses direct synthesis. */
  latNodeCount: number;
  lonNodeCount: number;
  heightNodeCount: number;
  timeNodesMs: readonly number[];
  /** Largest |grid − direct| seen at the probe points of the checked cells, nT. */
  checkedErrorNt: number;
  usesGrid: boolean;
}

/** Worst disagreement with direct synthesis accepted at a probe point, nT. */
export const GRID_TOLERANCE_NT = 0.002;
/** Longest time between nodes, ms (30 days). */
export const MAX_TIME_NODE_SPACING_MS = 30 * 86_400_000;
/** Starting horizontal node spacing, km, and vertical spacing, m. */
const INITIAL_SPACING_KM = 8;
const INITIAL_HEIGHT_SPACING_M = 4000;
/** Grid node budget per time node; beyond it the evaluator synthesises every reading directly. */
const MAX_SPATIAL_NODES = 60_000;
/** Cells probed against direct synthesis at most (spread evenly over the grid). */
const MAX_CHECKED_CELLS = 200;
/** Refinement rounds (each halves every spacing). */
const MAX_REFINEMENTS = 7;
const KM_PER_DEG_LAT = 111.2;
/** Spacing used along an axis whose range is empty, so the two nodes stay distinct. */
const DEGENERATE_STEP_DEG = 1e-6;
const DEGENERATE_STEP_M = 1;

interface Axis {
  start: number;
  step: number;
  count: number;
}

function makeAxis(min: number, max: number, spacing: number, degenerateStep: number): Axis {
  const span = max - min;
  if (!(span > 0)) return { start: min, step: degenerateStep, count: 2 };
  const count = Math.max(2, Math.ceil(span / spacing) + 1);
  return { start: min, step: span / (count - 1), count };
}

function assertOptions(o: TotalFieldEvaluatorOptions): void {
  const entries = Object.entries(o) as [keyof TotalFieldEvaluatorOptions, number][];
  for (const [key, value] of entries) {
    if (!Number.isFinite(value)) throw new RangeError(`evaluator option ${key} = ${value} is not finite`);
  }
  if (o.minTimeMs > o.maxTimeMs) throw new RangeError("evaluator minTimeMs is after maxTimeMs");
  if (o.minLatDeg > o.maxLatDeg || o.minLonDeg > o.maxLonDeg || o.minHeightM > o.maxHeightM) {
    throw new RangeError("evaluator box has a minimum above its maximum");
  }
  if (o.minLatDeg < -90 || o.maxLatDeg > 90) throw new RangeError("evaluator latitudes must be within −90° to 90°");
}

/** Time nodes: range ends, 1 January of each year and each model epoch inside, at most 30 days apart. */
function timeNodes(model: FieldModel, fromMs: number, toMs: number): number[] {
  const breaks = new Set<number>([fromMs, toMs]);
  for (let { endMs } = utcYearBoundsMs(fromMs); endMs < toMs; endMs = utcYearBoundsMs(endMs).endMs) breaks.add(endMs);
  for (const epoch of model.epochs) {
    const epochMs = timeMsFromDecimalYear(epoch.year);
    if (epochMs > fromMs && epochMs < toMs) breaks.add(epochMs);
  }
  const sorted = [...breaks].sort((a, b) => a - b);
  const nodes: number[] = [sorted[0]];
  for (let i = 1; i < sorted.length; i++) {
    const gap = sorted[i] - sorted[i - 1];
    const pieces = Math.ceil(gap / MAX_TIME_NODE_SPACING_MS);
    for (let p = 1; p < pieces; p++) nodes.push(sorted[i - 1] + (gap * p) / pieces);
    nodes.push(sorted[i]);
  }
  if (nodes.length === 1) nodes.push(nodes[0]); // single instant: one segment of zero length
  return nodes;
}

function fillGrid(coefficients: CoefficientSet, lat: Axis, lon: Axis, height: Axis): Float64Array {
  const values = new Float64Array(lat.count * lon.count * height.count);
  let k = 0;
  for (let ih = 0; ih < height.count; ih++) {
    const heightM = height.start + ih * height.step;
    for (let ilat = 0; ilat < lat.count; ilat++) {
      const latDeg = lat.start + ilat * lat.step;
      for (let ilon = 0; ilon < lon.count; ilon++) {
        values[k++] = synthesizeFromCoefficients(coefficients, latDeg, lon.start + ilon * lon.step, heightM).totalNt;
      }
    }
  }
  return values;
}

/** Trilinear interpolation of one grid at fractional positions; (i, j, l) is the lower corner. */
function trilinear(
  v: Float64Array,
  base: number,
  lonStride: number,
  latStride: number,
  heightStride: number,
  fLat: number,
  fLon: number,
  fHeight: number,
): number {
  const c000 = v[base];
  const c001 = v[base + lonStride];
  const c010 = v[base + latStride];
  const c011 = v[base + latStride + lonStride];
  const b = base + heightStride;
  const c100 = v[b];
  const c101 = v[b + lonStride];
  const c110 = v[b + latStride];
  const c111 = v[b + latStride + lonStride];
  const low0 = c000 + fLon * (c001 - c000);
  const low1 = c010 + fLon * (c011 - c010);
  const high0 = c100 + fLon * (c101 - c100);
  const high1 = c110 + fLon * (c111 - c110);
  const low = low0 + fLat * (low1 - low0);
  const high = high0 + fLat * (high1 - high0);
  return low + fHeight * (high - low);
}

/**
 * Whether the summed degree changes inside the range: only under "lower-of-bracketing" truncation, where
 * the field jumps at an epoch such as 2000.0; linear time interpolation cannot follow a jump, so such a
 * range is synthesised directly.
 */
function hasDegreeJump(model: FieldModel, fromMs: number, toMs: number): boolean {
  if (model.degreeConvention === "full") return false;
  return epochIntervalIndex(model, decimalYear(fromMs)) !== epochIntervalIndex(model, decimalYear(toMs));
}

interface GridShape {
  lat: Axis;
  lon: Axis;
  height: Axis;
}

function gridShape(o: TotalFieldEvaluatorOptions, refinement: number): GridShape {
  const spacingKm = INITIAL_SPACING_KM / 2 ** refinement;
  const maxAbsLatRad = Math.max(Math.abs(o.minLatDeg), Math.abs(o.maxLatDeg)) * DEG_TO_RAD;
  const kmPerDegLon = Math.max(KM_PER_DEG_LAT * Math.cos(maxAbsLatRad), 1e-3);
  const lat = makeAxis(o.minLatDeg, o.maxLatDeg, spacingKm / KM_PER_DEG_LAT, DEGENERATE_STEP_DEG);
  // A one-latitude box at the north pole: put its second node just south, not beyond 90°.
  if (lat.start + lat.step * (lat.count - 1) > 90) lat.start = 90 - lat.step * (lat.count - 1);
  return {
    lat,
    lon: makeAxis(o.minLonDeg, o.maxLonDeg, spacingKm / kmPerDegLon, DEGENERATE_STEP_DEG),
    height: makeAxis(o.minHeightM, o.maxHeightM, INITIAL_HEIGHT_SPACING_M / 2 ** refinement, DEGENERATE_STEP_M),
  };
}

function nodeCount(shape: GridShape): number {
  return shape.lat.count * shape.lon.count * shape.height.count;
}

/**
 * Probe points of a cell, as fractions along (lat, lon, height): every mix of 0 and ½ but the corner.
 * Trilinear error of a quadratic field is Σ cᵢ xᵢ(1 − xᵢ), whose largest magnitude is at such a point
 * (edge midpoints, face centres, the centre: terms of opposite sign can cancel at the centre alone).
 */
const PROBES: ReadonlyArray<readonly [number, number, number]> = [
  [0.5, 0, 0], [0, 0.5, 0], [0, 0, 0.5], [0.5, 0.5, 0], [0.5, 0, 0.5], [0, 0.5, 0.5], [0.5, 0.5, 0.5],
];

/** Largest |trilinear − direct| at the probe points of up to MAX_CHECKED_CELLS cells spread over the grid. */
function checkCells(coefficients: CoefficientSet, shape: GridShape, values: Float64Array): number {
  const { lat, lon, height } = shape;
  const cells = (lat.count - 1) * (lon.count - 1) * (height.count - 1);
  const stride = Math.max(1, Math.floor(cells / MAX_CHECKED_CELLS));
  const latStride = lon.count;
  const heightStride = lon.count * lat.count;
  let worst = 0;
  const visit = (c: number) => {
    const ilon = c % (lon.count - 1);
    const ilat = Math.floor(c / (lon.count - 1)) % (lat.count - 1);
    const ih = Math.floor(c / ((lon.count - 1) * (lat.count - 1)));
    const base = ih * heightStride + ilat * latStride + ilon;
    for (const [fLat, fLon, fHeight] of PROBES) {
      const gridded = trilinear(values, base, 1, latStride, heightStride, fLat, fLon, fHeight);
      const direct = synthesizeFromCoefficients(
        coefficients,
        lat.start + (ilat + fLat) * lat.step,
        lon.start + (ilon + fLon) * lon.step,
        height.start + (ih + fHeight) * height.step,
      ).totalNt;
      worst = Math.max(worst, Math.abs(gridded - direct));
    }
  };
  for (let c = 0; c < cells; c += stride) visit(c);
  visit(cells - 1);
  return worst;
}

/** Build the grid behind createTotalFieldEvaluator and report its size (for tests and benchmarks). */
export function createTotalFieldGrid(model: FieldModel, opts: TotalFieldEvaluatorOptions): TotalFieldGrid {
  assertOptions(opts);
  const direct: TotalFieldEvaluator = (latitudeDeg, longitudeDeg, heightM, timeMs) =>
    synthesizeField(model, { latitudeDeg, longitudeDeg, heightM, timeMs }).totalNt;
  const coversFromMs = timeMsFromDecimalYear(model.validFromYear);
  const coversToMs = timeMsFromDecimalYear(model.validToYear);
  const directInto: TotalFieldBatchEvaluator = (out, latDeg, lonDeg, heightM, timeMs, count, defaultHeightM) => {
    for (let i = 0; i < count; i++) {
      const t = timeMs[i];
      const h = heightM ? heightM[i] : NaN;
      const outside = latDeg[i] !== latDeg[i] || lonDeg[i] !== lonDeg[i] || !(t >= coversFromMs && t <= coversToMs);
      out[i] = outside ? NaN : direct(latDeg[i], lonDeg[i], h === h ? h : defaultHeightM, t);
    }
  };
  const noGrid = (timeNodesMs: number[] = []): TotalFieldGrid => ({
    evaluate: direct,
    evaluateInto: directInto,
    latNodeCount: 0,
    lonNodeCount: 0,
    heightNodeCount: 0,
    timeNodesMs,
    checkedErrorNt: 0,
    usesGrid: false,
  });

  // Clip the time range to validity; readings outside it go to direct synthesis, which throws.
  const validFromMs = Math.ceil(coversFromMs);
  const validToMs = Math.floor(coversToMs);
  const fromMs = Math.max(opts.minTimeMs, validFromMs);
  const toMs = Math.min(opts.maxTimeMs, validToMs);
  if (fromMs > toMs) return noGrid();
  const nodesMs = timeNodes(model, fromMs, toMs);
  if (hasDegreeJump(model, fromMs, toMs)) return noGrid(nodesMs);
  const coefficientsAtNodes = nodesMs.map((t) => coefficientsAtYear(model, Math.min(decimalYear(t), model.validToYear)));

  let shape: GridShape | null = null;
  let firstValues: Float64Array | null = null;
  let checkedErrorNt = Infinity;
  for (let refinement = 0; refinement <= MAX_REFINEMENTS; ) {
    const candidate = gridShape(opts, refinement);
    if (nodeCount(candidate) * nodesMs.length > MAX_SPATIAL_NODES * 4 || nodeCount(candidate) > MAX_SPATIAL_NODES) break;
    const values = fillGrid(coefficientsAtNodes[0], candidate.lat, candidate.lon, candidate.height);
    checkedErrorNt = checkCells(coefficientsAtNodes[0], candidate, values);
    if (checkedErrorNt <= GRID_TOLERANCE_NT) {
      shape = candidate;
      firstValues = values;
      break;
    }
    // Trilinear error falls with the square of the spacing: skip straight to the halving that should pass.
    refinement += Math.max(1, Math.ceil(Math.log2(Math.sqrt(checkedErrorNt / GRID_TOLERANCE_NT))));
  }
  if (!shape || !firstValues) return noGrid(nodesMs);

  const { lat, lon, height } = shape;
  const grids = [firstValues, ...coefficientsAtNodes.slice(1).map((c) => fillGrid(c, lat, lon, height))];
  const latStride = lon.count;
  const heightStride = lon.count * lat.count;
  const latMax = lat.start + (lat.count - 1) * lat.step;
  const lonMax = lon.start + (lon.count - 1) * lon.step;
  const heightMax = height.start + (height.count - 1) * height.step;
  const firstMs = nodesMs[0];
  const lastMs = nodesMs[nodesMs.length - 1];
  let segment = 0;

  // The per-reading arithmetic is written once, in the batch loop; the one-reading form goes through it.
  const evaluateInto: TotalFieldBatchEvaluator = (out, latIn, lonIn, heightIn, timeIn, count, defaultHeightM) => {
    for (let i = 0; i < count; i++) {
      const latDeg = latIn[i];
      const lonGivenDeg = lonIn[i];
      const timeMs = timeIn[i];
      let heightM = heightIn ? heightIn[i] : NaN;
      if (heightM !== heightM) heightM = defaultHeightM;
      if (latDeg !== latDeg || lonGivenDeg !== lonGivenDeg || !(timeMs >= coversFromMs && timeMs <= coversToMs)) {
        out[i] = NaN;
        continue;
      }
      let lonDeg = lonGivenDeg;
      if (!(lonDeg >= lon.start && lonDeg <= lonMax)) {
        lonDeg = lon.start + ((((lonGivenDeg - lon.start) % 360) + 360) % 360); // same meridian, inside the window if it can be
      }
      if (
        !(latDeg >= lat.start && latDeg <= latMax) ||
        !(lonDeg >= lon.start && lonDeg <= lonMax) ||
        !(heightM >= height.start && heightM <= heightMax) ||
        !(timeMs >= firstMs && timeMs <= lastMs)
      ) {
        out[i] = direct(latDeg, lonGivenDeg, heightM, timeMs);
        continue;
      }
      while (segment > 0 && timeMs < nodesMs[segment]) segment--;
      while (segment < nodesMs.length - 2 && timeMs > nodesMs[segment + 1]) segment++;
      const uLat = (latDeg - lat.start) / lat.step;
      const uLon = (lonDeg - lon.start) / lon.step;
      const uHeight = (heightM - height.start) / height.step;
      const iLat = Math.min(Math.floor(uLat), lat.count - 2);
      const iLon = Math.min(Math.floor(uLon), lon.count - 2);
      const iHeight = Math.min(Math.floor(uHeight), height.count - 2);
      const fLat = uLat - iLat;
      const fLon = uLon - iLon;
      const fHeight = uHeight - iHeight;
      const base = iHeight * heightStride + iLat * latStride + iLon;
      const before = trilinear(grids[segment], base, 1, latStride, heightStride, fLat, fLon, fHeight);
      const t0 = nodesMs[segment];
      const t1 = nodesMs[segment + 1];
      if (t1 === t0) {
        out[i] = before;
        continue;
      }
      const after = trilinear(grids[segment + 1], base, 1, latStride, heightStride, fLat, fLon, fHeight);
      out[i] = before + ((timeMs - t0) / (t1 - t0)) * (after - before);
    }
  };
  const one = { lat: new Float64Array(1), lon: new Float64Array(1), height: new Float64Array(1), time: new Float64Array(1), out: new Float64Array(1) };
  const evaluate: TotalFieldEvaluator = (latDeg, lonDeg, heightM, timeMs) => {
    // outside validity direct synthesis throws, as documented; a NaN input goes there as before
    if (!(timeMs >= coversFromMs && timeMs <= coversToMs) || latDeg !== latDeg || lonDeg !== lonDeg || heightM !== heightM) {
      return direct(latDeg, lonDeg, heightM, timeMs);
    }
    one.lat[0] = latDeg;
    one.lon[0] = lonDeg;
    one.height[0] = heightM;
    one.time[0] = timeMs;
    evaluateInto(one.out, one.lat, one.lon, one.height, one.time, 1, 0);
    return one.out[0];
  };

  return {
    evaluate,
    evaluateInto,
    latNodeCount: lat.count,
    lonNodeCount: lon.count,
    heightNodeCount: height.count,
    timeNodesMs: nodesMs,
    checkedErrorNt,
    usesGrid: true,
  };
}

/**
 * Total-field evaluator for readings inside the given box and time range (see module comment).
 * Throws OutsideModelValidityError for a reading whose time is outside the model's validity.
 */
export function createTotalFieldEvaluator(model: FieldModel, opts: TotalFieldEvaluatorOptions): TotalFieldEvaluator {
  return createTotalFieldGrid(model, opts).evaluate;
}
