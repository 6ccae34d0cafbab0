/**
 * Distance walked along a survey line: cumulative horizontal distance between consecutive
 * readings (local equirectangular approximation on a sphere of the WGS84 mean radius; at survey
 * spacings of metres its error is far below the GPS error). Readings without a position get NaN
 * and do not advance the distance. Pure.
 */
const MEAN_EARTH_RADIUS_M = 6_371_008.8; // IUGG mean radius R1 of WGS84
const DEG = Math.PI / 180;

export function distanceAlongM(latDeg: ArrayLike<number>, lonDeg: ArrayLike<number>): Float64Array {
  const n = latDeg.length;
  const out = new Float64Array(n);
  let prevLat = NaN, prevLon = NaN, total = 0;
  for (let i = 0; i < n; i++) {
    const la = latDeg[i], lo = lonDeg[i];
    if (la !== la || lo !== lo) {
      out[i] = NaN;
      continue;
    }
    if (prevLat === prevLat) {
      const dy = (la - prevLat) * DEG;
      const dx = (lo - prevLon) * DEG * Math.cos(((la + prevLat) / 2) * DEG);
      total += MEAN_EARTH_RADIUS_M * Math.hypot(dx, dy);
    }
    out[i] = total;
    prevLat = la;
    prevLon = lo;
  }
  return out;
}
