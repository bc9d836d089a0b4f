/**
 * Longitude/latitude meshes. Each cell is projected onto the plane tangent to the sphere at the
 * cell's centre (λ₀, φ₀) by the orthographic projection (Snyder, Map Projections — A Working
 * Manual, USGS PP 1395, 1987, eqs. 20-3, 20-4):
 *   x = R·cos φ·sin(λ − λ₀),  y = R·(cos φ₀·sin φ − sin φ₀·cos φ·cos(λ − λ₀))
 * with λ − λ₀ unwrapped to [−180°, 180°] so that cells across the antimeridian stay whole. Every
 * planar formula then applies unchanged. Its length error is of second order in cell size / R:
 * below 1e-6 relative against great-circle (haversine) lengths for cells under 1 km at any
 * latitude. (The simpler east = R·cos φ₀·Δλ, north = R·Δφ is only first order: an east–west
 * edge 500 m off the centre latitude at 60° N is off by about 1.4e-4.)
 */

/** Mean Earth radius R₁ = 6 371 008.8 m (IUGG; Moritz, Geodetic Reference System 1980). */
export const EARTH_RADIUS = 6371008.8;
export const DEG = Math.PI / 180;

/** Longitude difference wrapped to [−180, 180]. */
export function wrapLongitude(d: number): number {
  return d > 180 || d < -180 ? d - 360 * Math.round(d / 360) : d;
}

export type CoordinateSystem = 'planar' | 'geographic';

/** Result of `orthographic` (module scratch: no allocation per node). */
export const projected = { x: 0, y: 0 };

/**
 * Orthographic projection of (lon, lat) about a centre with longitude lon0 and latitude whose
 * sine and cosine are given; y in the cancellation-free form
 * sin(φ − φ₀) + sin φ₀·cos φ·2·sin²(Δλ/2).
 */
export function orthographic(lon: number, lat: number, lon0: number, lat0: number, sinLat0: number): void {
  const dl = wrapLongitude(lon - lon0) * DEG;
  const phi = lat * DEG;
  const cp = Math.cos(phi);
  const h = Math.sin(dl / 2);
  projected.x = EARTH_RADIUS * cp * Math.sin(dl);
  projected.y = EARTH_RADIUS * (Math.sin(phi - lat0 * DEG) + sinLat0 * cp * 2 * h * h);
}

/** Inverse orthographic (Snyder 1987, eqs. 20-14, 20-15), for centroids: writes lon, lat into `projected`. */
export function inverseOrthographic(x: number, y: number, lon0: number, lat0: number): void {
  const rho = Math.hypot(x, y);
  if (rho === 0) { projected.x = lon0; projected.y = lat0; return; }
  const c = Math.asin(Math.min(1, rho / EARTH_RADIUS));
  const sc = Math.sin(c), cc = Math.cos(c);
  const s0 = Math.sin(lat0 * DEG), c0 = Math.cos(lat0 * DEG);
  projected.y = Math.asin(cc * s0 + (y * sc * c0) / rho) / DEG;
  projected.x = lon0 + Math.atan2(x * sc, rho * c0 * cc - y * s0 * sc) / DEG;
}

/** Great-circle distance in metres (haversine formula; standard spherical geometry). */
export function greatCircle(lon1: number, lat1: number, lon2: number, lat2: number): number {
  const dphi = (lat2 - lat1) * DEG, dl = wrapLongitude(lon2 - lon1) * DEG;
  const a = Math.sin(dphi / 2) ** 2 + Math.cos(lat1 * DEG) * Math.cos(lat2 * DEG) * Math.sin(dl / 2) ** 2;
  return 2 * EARTH_RADIUS * Math.asin(Math.min(1, Math.sqrt(a)));
}

/** Metres per degree of longitude and latitude at latitude φ (degrees). */
export function metresPerDegree(lat: number): { kx: number; ky: number } {
  return { kx: EARTH_RADIUS * Math.cos(lat * DEG) * DEG, ky: EARTH_RADIUS * DEG };
}

/**
 * Heuristic: coordinates that look like degrees (x in [−180, 360], y in [−90, 90], a bounding box
 * of a few degrees) while the velocities are of order 0.1–10 m/s.
 */
export function looksGeographic(points: Float64Array, typicalSpeed: number | null): boolean {
  let xmin = Infinity, xmax = -Infinity, ymin = Infinity, ymax = -Infinity;
  for (let i = 0; i < points.length; i += 2) {
    const x = points[i]!, y = points[i + 1]!;
    if (x < xmin) xmin = x; if (x > xmax) xmax = x;
    if (y < ymin) ymin = y; if (y > ymax) ymax = y;
  }
  if (!(xmin >= -180 && xmax <= 360 && ymin >= -90 && ymax <= 90)) return false;
  const span = Math.max(xmax - xmin, ymax - ymin);
  if (!(span > 0 && span < 5)) return false;
  return typicalSpeed === null || (typicalSpeed >= 0.01 && typicalSpeed <= 20);
}
