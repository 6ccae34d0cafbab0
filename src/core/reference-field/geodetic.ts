/** Geodetic (WGS84) to geocentric spherical coordinates. */
import {
  DEG_TO_RAD,
  METRES_PER_KM,
  WGS84_ECCENTRICITY_SQUARED,
  WGS84_SEMI_MAJOR_AXIS_KM,
} from "./constants";

export interface GeocentricPosition {
  /** Distance from the Earth's centre, km. */
  radiusKm: number;
  /** cos and sin of the geocentric colatitude θ. */
  cosColatitude: number;
  sinColatitude: number;
  /** Geodetic latitude minus geocentric latitude, radians (positive in the northern hemisphere). */
  geodeticMinusGeocentricRad: number;
}

/** Smallest sin θ used, so that terms divided by sin θ stay finite exactly at a pole. */
const MIN_SIN_COLATITUDE = 1e-15;

/**
 * Geocentric radius and colatitude of a point given by geodetic latitude (deg) and height above the
 * WGS84 ellipsoid (m). Uses the prime-vertical radius N = a / √(1 − e² sin²φ):
 * p = (N + h) cos φ, z = (N(1 − e²) + h) sin φ.
 */
export function geodeticToGeocentric(latitudeDeg: number, heightM: number): GeocentricPosition {
  const latRad = latitudeDeg * DEG_TO_RAD;
  const sinLat = Math.sin(latRad);
  const cosLat = Math.cos(latRad);
  const heightKm = heightM / METRES_PER_KM;
  const primeVerticalKm = WGS84_SEMI_MAJOR_AXIS_KM / Math.sqrt(1 - WGS84_ECCENTRICITY_SQUARED * sinLat * sinLat);
  const equatorialKm = (primeVerticalKm + heightKm) * cosLat;
  const axialKm = (primeVerticalKm * (1 - WGS84_ECCENTRICITY_SQUARED) + heightKm) * sinLat;
  const radiusKm = Math.hypot(equatorialKm, axialKm);
  const geocentricLatRad = Math.atan2(axialKm, equatorialKm);
  return {
    radiusKm,
    cosColatitude: axialKm / radiusKm,
    sinColatitude: Math.max(equatorialKm / radiusKm, MIN_SIN_COLATITUDE),
    geodeticMinusGeocentricRad: latRad - geocentricLatRad,
  };
}
