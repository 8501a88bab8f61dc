import type { Geometry, Position } from 'geojson';
import { GeoInputError, type GeoInputPlace } from './geo-input-error';

export type CoordinateSpace = { kind: 'geographic' } | { kind: 'projected'; bbox: number[] };
export type CrsCandidate = { code: string; label: string };

type WithGeometry = { geometry: Geometry | null };

/** Calls `visit` for every position of a geometry, with its place (part, ring, coordinate). */
export function eachPosition(g: Geometry | null, visit: (p: Position, place: GeoInputPlace) => void) {
  if (!g) return;
  switch (g.type) {
    case 'Point':
      return visit(g.coordinates, {});
    case 'MultiPoint':
    case 'LineString':
      return g.coordinates.forEach((p, coordinate) => visit(p, { coordinate }));
    case 'MultiLineString':
    case 'Polygon':
      return g.coordinates.forEach((ring, r) =>
        ring.forEach((p, coordinate) => visit(p, { ring: r, coordinate })),
      );
    case 'MultiPolygon':
      return g.coordinates.forEach((poly, part) =>
        poly.forEach((ring, r) => ring.forEach((p, coordinate) => visit(p, { part, ring: r, coordinate }))),
      );
    case 'GeometryCollection':
      return g.geometries.forEach((child) => eachPosition(child, visit));
  }
}

/** [west, south, east, north] of every position, or null when there is none. */
export function bboxOf(features: WithGeometry[]): number[] | null {
  let b: number[] | null = null;
  for (const f of features) {
    eachPosition(f.geometry, ([x, y]) => {
      if (!b) b = [x, y, x, y];
      else {
        if (x < b[0]) b[0] = x;
        if (y < b[1]) b[1] = y;
        if (x > b[2]) b[2] = x;
        if (y > b[3]) b[3] = y;
      }
    });
  }
  return b;
}

/**
 * Geographic (degrees) unless some |x| > 180 or |y| > 90, in which case the coordinates are projected
 * (FORMATS.md: "No crs and any |x| > 180 or |y| > 90: the file is projected; say so and ask, never guess").
 */
export function detectCoordinateSpace(features: WithGeometry[]): CoordinateSpace {
  const bbox = bboxOf(features);
  if (!bbox) return { kind: 'geographic' };
  const [w, s, e, n] = bbox;
  if (Math.max(Math.abs(w), Math.abs(e)) > 180 || Math.max(Math.abs(s), Math.abs(n)) > 90)
    return { kind: 'projected', bbox };
  return { kind: 'geographic' };
}

/**
 * Coordinates beyond ±180 / ±90 that are still small enough to be degrees (every |x| ≤ 360 and |y| ≤ 180) are
 * not metres of any projection a field lies in (UTM eastings run 166 000 to 834 000; Web Mercator near 0, 0
 * is open sea): they are bad degrees. Throws {@link GeoInputError} naming the first such coordinate.
 * Data that is plainly projected passes (see {@link detectCoordinateSpace}).
 */
export function assertDegreesInRange(features: (WithGeometry & { index: number })[]) {
  const bbox = bboxOf(features);
  if (!bbox) return;
  const [w, s, e, n] = bbox;
  const looksLikeDegrees =
    Math.max(Math.abs(w), Math.abs(e)) <= 360 && Math.max(Math.abs(s), Math.abs(n)) <= 180;
  if (!looksLikeDegrees) return;
  for (const f of features) {
    eachPosition(f.geometry, ([x, y], place) => {
      if (Math.abs(x) > 180)
        throw new GeoInputError(`Longitude ${x} lies beyond ±180°`, { feature: f.index, ...place });
      if (Math.abs(y) > 90)
        throw new GeoInputError(`Latitude ${y} lies beyond ±90°`, { feature: f.index, ...place });
    });
  }
}

/**
 * Throws when a feature spans more than 180° of longitude: it crosses the antimeridian (or is not a field),
 * which planar validity and areas would get wrong.
 */
export function assertNoAntimeridianCrossing(features: (WithGeometry & { index: number })[]) {
  for (const f of features) {
    const b = bboxOf([f]);
    if (b && b[2] - b[0] > 180) {
      throw new GeoInputError(
        'The shape spans more than 180° of longitude: it crosses the 180th meridian; split it there',
        {
          feature: f.index,
        },
      );
    }
  }
}

/** UTM zone number (1–60) of a longitude in degrees: 6° zones from 180° W (UTM definition, NGA). */
export const utmZoneOf = (lon: number) => Math.min(60, Math.max(1, Math.floor((lon + 180) / 6) + 1));

/**
 * The WGS84 UTM zones around a known location [lon, lat]: its own zone and the two beside it, in the
 * location's hemisphere (EPSG:326zz north, EPSG:327zz south; EPSG's WGS 84 / UTM code ranges).
 */
export function utmCandidates(lon: number, lat: number): CrsCandidate[] {
  const zone = utmZoneOf(lon);
  const north = lat >= 0;
  const zones = [zone, zone - 1, zone + 1].map((z) => ((z + 59) % 60) + 1);
  return zones.map((z) => ({
    code: `EPSG:${north ? 326 : 327}${String(z).padStart(2, '0')}`,
    label: `WGS 84 / UTM zone ${z}${north ? 'N' : 'S'}`,
  }));
}

/**
 * The EPSG code a legacy GeoJSON `crs` member names (GeoJSON 2008 §3.1), or null without one. CRS84 and
 * EPSG:4326 both come back as 'EPSG:4326'. Throws {@link GeoInputError} for a `crs` Sowright cannot read.
 */
export function legacyCrsCode(input: unknown): string | null {
  if (typeof input !== 'object' || input === null || !('crs' in input)) return null;
  const crs = (input as { crs: unknown }).crs;
  if (crs === null || crs === undefined) return null;
  const name = (crs as { properties?: { name?: unknown } }).properties?.name;
  if (typeof name !== 'string')
    throw new GeoInputError('The file\'s "crs" member names no coordinate system');
  if (/CRS:?84$/i.test(name)) return 'EPSG:4326';
  const m = /EPSG:{1,2}(?:[\d.]*:)?(\d{4,6})$/i.exec(name);
  if (!m)
    throw new GeoInputError(
      `The file names a coordinate system Sowright cannot read: "${name.slice(0, 80)}"`,
    );
  return `EPSG:${m[1]}`;
}
