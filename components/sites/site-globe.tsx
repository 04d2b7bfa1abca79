"use client";

import { geoGraticule10, geoOrthographic, geoPath } from "d3-geo";

/** A small globe centred on the site, with the site as a dot: a quick check of sign errors in latitude or longitude. */
export function SiteGlobe({ latitudeDeg, longitudeDeg, size = 160 }: { latitudeDeg: number; longitudeDeg: number; size?: number }) {
  const valid = Number.isFinite(latitudeDeg) && Number.isFinite(longitudeDeg) && Math.abs(latitudeDeg) <= 90;
  const lat = valid ? latitudeDeg : 0;
  const lon = valid ? longitudeDeg : 0;
  const projection = geoOrthographic().scale(size / 2 - 4).translate([size / 2, size / 2]).rotate([-lon, -lat * 0.6]).clipAngle(90);
  const path = geoPath(projection);
  const point = projection([lon, lat]);
  const equator = path({ type: "LineString", coordinates: Array.from({ length: 73 }, (_, i) => [i * 5 - 180, 0]) });
  return (
    <svg width={size} height={size} role="img" aria-label={valid ? `Globe showing the site at latitude ${lat.toFixed(2)}°, longitude ${lon.toFixed(2)}°` : "Globe: enter a valid position"}>
      <path d={path({ type: "Sphere" }) ?? ""} fill="#111833" />
      <path d={path(geoGraticule10()) ?? ""} fill="none" stroke="#2a3670" strokeWidth={0.6} />
      <path d={equator ?? ""} fill="none" stroke="#b9c2d8" strokeWidth={0.8} />
      {valid && point ? <circle cx={point[0]} cy={point[1]} r={5} fill="#e8a33d" stroke="white" strokeWidth={1.5} /> : null}
    </svg>
  );
}
