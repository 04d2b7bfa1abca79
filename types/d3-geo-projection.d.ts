/**
 * Minimal declarations for the parts of d3-geo-projection 4.0.0 that Siderea uses (the package
 * ships no types and there is no @types package). Raw projections take and return radians.
 */
declare module "d3-geo-projection" {
  import type { GeoProjection } from "d3-geo";

  /** A raw projection: (lambda, phi) in radians -> [x, y] in the projection's unit plane (y up). */
  export interface GeoRawProjectionWithInverse {
    (lambdaRad: number, phiRad: number): [number, number];
    /** [x, y] in the unit plane -> [lambda, phi] in radians. */
    invert(x: number, y: number): [number, number];
  }

  /** Mollweide's homalographic projection (d3 projection, default scale 169.529). */
  export function geoMollweide(): GeoProjection;
  /** Raw Mollweide: x = (2 sqrt 2 / pi) lambda cos theta, y = sqrt 2 sin theta, 2 theta + sin 2 theta = pi sin phi. */
  export const geoMollweideRaw: GeoRawProjectionWithInverse;
}
