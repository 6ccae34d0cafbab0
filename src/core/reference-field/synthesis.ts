/**
 * Main-field synthesis: the one routine every form (single point, batch, grid) is built on.
 *
 * In geocentric spherical coordinates (r, θ colatitude, λ longitude), with reference radius a:
 *   X' =  Σn (a/r)^(n+2) Σm [g cos mλ + h sin mλ] dP(n,m)/dθ            (north)
 *   Y' =  Σn (a/r)^(n+2) Σm m [g sin mλ − h cos mλ] P(n,m) / sin θ      (east)
 *   Z' = −Σn (n+1) (a/r)^(n+2) Σm [g cos mλ + h sin mλ] P(n,m)           (down)
 * then rotated by ψ = geodetic − geocentric latitude into the geodetic frame:
 *   X = X' cos ψ + Z' sin ψ,  Z = Z' cos ψ − X' sin ψ.
 * (IGRF-14, IAGA 2024, doi:10.5281/zenodo.14012302; WGS84.)
 */
import { coefficientsAtYear, isYearWithinValidity } from "./coefficients-at-time";
import { DEG_TO_RAD, RAD_TO_DEG, REFERENCE_RADIUS_KM } from "./constants";
import { decimalYear } from "./decimal-year";
import { geodeticToGeocentric } from "./geodetic";
import { createLegendreTable, fillSchmidtLegendre, type LegendreTable } from "./legendre";
import { coefficientIndex, type CoefficientSet, type FieldModel } from "./model";

export interface GeodeticPoint {
  latitudeDeg: number;
  longitudeDeg: number;
  /** Height above the WGS84 ellipsoid, m. */
  heightM: number;
  /** UTC instant, ms since the Unix epoch. */
  timeMs: number;
}

export interface FieldVector {
  northNt: number;
  eastNt: number;
  downNt: number;
  horizontalNt: number;
  totalNt: number;
  /** Positive downward, degrees. */
  inclinationDeg: number;
  /** Positive east of geographic north, degrees in (−180, 180]. */
  declinationDeg: number;
}

/** Scratch space reused between calls (synthesis is synchronous, so one set per degree is safe). */
interface Scratch {
  legendre: LegendreTable;
  cosM: Float64Array;
  sinM: Float64Array;
}
const scratchByDegree = new Map<number, Scratch>();

function scratchFor(maxDegree: number): Scratch {
  let s = scratchByDegree.get(maxDegree);
  if (!s) {
    s = {
      legendre: createLegendreTable(maxDegree),
      cosM: new Float64Array(maxDegree + 1),
      sinM: new Float64Array(maxDegree + 1),
    };
    scratchByDegree.set(maxDegree, s);
  }
  return s;
}

function assertPosition(latitudeDeg: number, longitudeDeg: number, heightM: number): void {
  if (!Number.isFinite(latitudeDeg) || latitudeDeg < -90 || latitudeDeg > 90) {
    throw new RangeError(`latitude ${latitudeDeg}° is not within −90° to 90°`);
  }
  if (!Number.isFinite(longitudeDeg)) throw new RangeError(`longitude ${longitudeDeg}° is not finite`);
  if (!Number.isFinite(heightM)) throw new RangeError(`height ${heightM} m is not finite`);
}

/** Field vector in the geodetic frame from a coefficient set already brought to the date. */
export function synthesizeFromCoefficients(
  coefficients: CoefficientSet,
  latitudeDeg: number,
  longitudeDeg: number,
  heightM: number,
): FieldVector {
  assertPosition(latitudeDeg, longitudeDeg, heightM);
  const nMax = coefficients.maxDegree;
  const { g, h } = coefficients;
  const position = geodeticToGeocentric(latitudeDeg, heightM);
  const { legendre, cosM, sinM } = scratchFor(nMax);
  fillSchmidtLegendre(legendre, position.cosColatitude, position.sinColatitude);
  const { p, dp } = legendre;

  const lonRad = longitudeDeg * DEG_TO_RAD;
  for (let m = 0; m <= nMax; m++) {
    cosM[m] = Math.cos(m * lonRad);
    sinM[m] = Math.sin(m * lonRad);
  }

  const ratio = REFERENCE_RADIUS_KM / position.radiusKm;
  let radiusPower = ratio * ratio; // (a/r)^(n+2), starting at n = 0
  let north = 0;
  let east = 0;
  let down = 0;
  for (let n = 1; n <= nMax; n++) {
    radiusPower *= ratio;
    let sumNorth = 0;
    let sumEast = 0;
    let sumDown = 0;
    for (let m = 0; m <= n; m++) {
      const k = coefficientIndex(n, m);
      const cosTerm = g[k] * cosM[m] + h[k] * sinM[m];
      sumNorth += cosTerm * dp[k];
      sumDown += cosTerm * p[k];
      if (m > 0) sumEast += m * (g[k] * sinM[m] - h[k] * cosM[m]) * p[k];
    }
    north += radiusPower * sumNorth;
    east += radiusPower * sumEast;
    down -= (n + 1) * radiusPower * sumDown;
  }
  east /= position.sinColatitude;

  const psi = position.geodeticMinusGeocentricRad;
  const cosPsi = Math.cos(psi);
  const sinPsi = Math.sin(psi);
  const northNt = north * cosPsi + down * sinPsi;
  const downNt = down * cosPsi - north * sinPsi;
  return fieldVector(northNt, east, downNt);
}

/** Derived elements H, F, I, D from the three components. */
export function fieldVector(northNt: number, eastNt: number, downNt: number): FieldVector {
  const horizontalNt = Math.hypot(northNt, eastNt);
  return {
    northNt,
    eastNt,
    downNt,
    horizontalNt,
    totalNt: Math.hypot(horizontalNt, downNt),
    inclinationDeg: Math.atan2(downNt, horizontalNt) * RAD_TO_DEG,
    declinationDeg: Math.atan2(eastNt, northNt) * RAD_TO_DEG,
  };
}

/** Whether the model is defined at the UTC instant. */
export function isWithinValidity(model: FieldModel, timeMs: number): boolean {
  return Number.isFinite(timeMs) && isYearWithinValidity(model, decimalYear(timeMs));
}

/**
 * Main field at a geodetic point and UTC instant. Throws OutsideModelValidityError for a date
 * outside the model's validity and RangeError for an impossible position.
 */
export function synthesizeField(model: FieldModel, point: GeodeticPoint): FieldVector {
  return synthesizeFieldAtYear(model, point.latitudeDeg, point.longitudeDeg, point.heightM, decimalYear(point.timeMs));
}

/** As synthesizeField, with the date given as a decimal year (published test tables use these). */
export function synthesizeFieldAtYear(
  model: FieldModel,
  latitudeDeg: number,
  longitudeDeg: number,
  heightM: number,
  year: number,
): FieldVector {
  assertPosition(latitudeDeg, longitudeDeg, heightM);
  return synthesizeFromCoefficients(cachedCoefficientsAtYear(model, year), latitudeDeg, longitudeDeg, heightM);
}

/** Last coefficient set per model: readings of one instant (or a run of them) reuse it. */
const lastCoefficients = new WeakMap<FieldModel, { year: number; coefficients: CoefficientSet }>();

function cachedCoefficientsAtYear(model: FieldModel, year: number): CoefficientSet {
  const last = lastCoefficients.get(model);
  if (last && last.year === year) return last.coefficients;
  const coefficients = coefficientsAtYear(model, year);
  lastCoefficients.set(model, { year, coefficients });
  return coefficients;
}
