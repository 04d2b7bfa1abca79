import { createRandom } from "@/lib/sky/random";

/**
 * Test-only simulation of an array at latitude latDeg with full efficiency up to zenithMaxDeg:
 * local sidereal time uniform (or weighted by a rate modulation), zenith density
 * sin(theta) cos(theta) (a flat array; Sommers 2001), azimuth uniform, converted to (ra, dec)
 * with the spherical-astronomy formulas for hour angle H and declination (e.g. Smart,
 * Textbook on Spherical Astronomy, ch. II):
 *   sin dec = sin(lat) cos(theta) + cos(lat) sin(theta) cos(az),
 *   sin H = -sin(az) sin(theta) / cos(dec),  cos H = (cos(theta) - sin(lat) sin(dec)) / (cos(lat) cos(dec)),
 *   ra = lst - H  (azimuth north-clockwise).
 * An optional dipole flux 1 + d . u (ICRS-like frame, no precession) is injected by
 * acceptance-rejection; rateModulation(lst) in [0, 1] thins events in sidereal time.
 */
export function simulateLocalSky(opts: {
  n: number; seed: number; latDeg: number; zenithMaxDeg: number;
  dipole?: { amplitude: number; raDeg: number; decDeg: number };
  rateModulation?: (lstRad: number) => number;
}) {
  const D = Math.PI / 180, rnd = createRandom(opts.seed);
  const { n } = opts;
  const raRad = new Float64Array(n), decRad = new Float64Array(n), zenithDeg = new Float64Array(n), azimuthDeg = new Float64Array(n), lstRad = new Float64Array(n);
  const lat = opts.latDeg * D, c2 = Math.cos(opts.zenithMaxDeg * D) ** 2;
  const dv = opts.dipole
    ? [Math.cos(opts.dipole.decDeg * D) * Math.cos(opts.dipole.raDeg * D), Math.cos(opts.dipole.decDeg * D) * Math.sin(opts.dipole.raDeg * D), Math.sin(opts.dipole.decDeg * D)].map((v) => v * opts.dipole!.amplitude)
    : [0, 0, 0];
  const dmax = 1 + Math.hypot(dv[0], dv[1], dv[2]);
  let i = 0;
  while (i < n) {
    const lst = 2 * Math.PI * rnd.next();
    const cosT = Math.sqrt(c2 + rnd.next() * (1 - c2)), sinT = Math.sqrt(1 - cosT * cosT);
    const az = 2 * Math.PI * rnd.next();
    const sinDec = Math.sin(lat) * cosT + Math.cos(lat) * sinT * Math.cos(az);
    const dec = Math.asin(sinDec), cosDec = Math.cos(dec);
    const H = Math.atan2(-Math.sin(az) * sinT / cosDec, (cosT - Math.sin(lat) * sinDec) / (Math.cos(lat) * cosDec));
    let ra = (lst - H) % (2 * Math.PI); if (ra < 0) ra += 2 * Math.PI;
    const flux = 1 + dv[0] * cosDec * Math.cos(ra) + dv[1] * cosDec * Math.sin(ra) + dv[2] * sinDec;
    if (rnd.next() * dmax > flux) continue;
    if (opts.rateModulation && rnd.next() > opts.rateModulation(lst)) continue;
    raRad[i] = ra; decRad[i] = dec; zenithDeg[i] = Math.acos(cosT) / D; azimuthDeg[i] = az / D; lstRad[i] = lst;
    i++;
  }
  return { raRad, decRad, zenithDeg, azimuthDeg, lstRad };
}
