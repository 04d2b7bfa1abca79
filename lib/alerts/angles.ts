/**
 * Angular distance on the celestial sphere, for the alert rule. Pure: no framework, database
 * or environment. Public API in degrees, radians inside.
 */
const RAD_PER_DEG = Math.PI / 180;
const DEG_PER_RAD = 180 / Math.PI;

/**
 * Great-circle distance in degrees [0, 180] between two directions given as (longitude,
 * latitude) in degrees in the same frame (RA/Dec in ICRS, or l/b), by the haversine formula
 * (Sinnott 1984, Sky & Telescope 68, 159), which stays accurate for small separations where
 * the cosine formula loses digits. The haversine is clamped to [0, 1] against rounding.
 */
export function angularDistanceDeg(lon1Deg: number, lat1Deg: number, lon2Deg: number, lat2Deg: number): number {
  const lat1 = lat1Deg * RAD_PER_DEG;
  const lat2 = lat2Deg * RAD_PER_DEG;
  const dLat = lat2 - lat1;
  const dLon = (lon2Deg - lon1Deg) * RAD_PER_DEG;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(lat1) * Math.cos(lat2) * Math.sin(dLon / 2) ** 2;
  return 2 * Math.asin(Math.sqrt(Math.min(1, Math.max(0, h)))) * DEG_PER_RAD;
}
