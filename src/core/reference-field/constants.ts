/** Constants of the main-field synthesis (IGRF-14, IAGA 2024, doi:10.5281/zenodo.14012302; WGS84, NIMA TR8350.2). */

/** Reference radius of the spherical-harmonic expansion, km. */
export const REFERENCE_RADIUS_KM = 6371.2;
/** WGS84 semi-major axis, km. */
export const WGS84_SEMI_MAJOR_AXIS_KM = 6378.137;
/** WGS84 flattening. */
export const WGS84_FLATTENING = 1 / 298.257223563;
/** WGS84 first eccentricity squared, e² = f(2 − f). */
export const WGS84_ECCENTRICITY_SQUARED = WGS84_FLATTENING * (2 - WGS84_FLATTENING);

export const DEG_TO_RAD = Math.PI / 180;
export const RAD_TO_DEG = 180 / Math.PI;
export const METRES_PER_KM = 1000;
