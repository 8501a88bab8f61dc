import geodesic from 'geographiclib-geodesic';
import type { MultiPolygon, Polygon, Position } from 'geojson';

// The package is CommonJS: take its named members from the default export.
const { Geodesic } = geodesic;

/**
 * Surface area of the whole WGS84 ellipsoid in m²: 4πc² with c² = (a² + b² atanh(e)/e) / 2, the authalic radius
 * squared (Karney 2013, eq. 60); a and f from Geodesic.WGS84 (NGA TR8350.2).
 */
export const ELLIPSOID_AREA_M2: number = (() => {
  const { a, f } = Geodesic.WGS84;
  const e = Math.sqrt(f * (2 - f));
  const b = a * (1 - f);
  return 2 * Math.PI * (a * a + (b * b * Math.atanh(e)) / e);
})();

/** Positions of a ring without the closing duplicate; a ring may arrive closed or not. */
function openRing(ring: Position[]): Position[] {
  const n = ring.length;
  if (n > 1 && ring[0][0] === ring[n - 1][0] && ring[0][1] === ring[n - 1][1]) return ring.slice(0, n - 1);
  return ring;
}

/**
 * Signed area (m², counter-clockwise positive) and perimeter (m) of one ring of [lon, lat] positions in degrees,
 * edges being geodesics on WGS84 (GeographicLib PolygonArea, Karney 2013). The magnitude of the area never
 * exceeds half the ellipsoid. The ring may be closed or open; it is not mutated.
 */
export function ringMeasure(ring: Position[]): { areaM2: number; perimeterM: number } {
  const p = Geodesic.WGS84.Polygon(false);
  for (const pos of openRing(ring)) p.AddPoint(pos[1], pos[0]);
  const r = p.Compute(false, true);
  return { areaM2: r.area ?? 0, perimeterM: r.perimeter };
}

/** Unsigned geodesic area of one polygon's rings (m²): exterior minus holes, whatever their winding. */
function polygonAreaM2(rings: Position[][]): number {
  let total = 0;
  rings.forEach((ring, i) => {
    const a = Math.abs(ringMeasure(ring).areaM2);
    total += i === 0 ? a : -a;
  });
  return total;
}

/**
 * Ellipsoidal area in m² of a Polygon or MultiPolygon given in [lon, lat] degrees on WGS84 (GeographicLib
 * PolygonArea; PostGIS ST_Area(geography) uses the same algorithm). Holes are subtracted; either winding is
 * accepted; the parts of a MultiPolygon are summed (they are assumed not to overlap). Input is not mutated.
 */
export function geodesicAreaM2(geom: Polygon | MultiPolygon): number {
  if (geom.type === 'Polygon') return polygonAreaM2(geom.coordinates);
  return geom.coordinates.reduce((sum, rings) => sum + polygonAreaM2(rings), 0);
}
