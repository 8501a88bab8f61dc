import { difference, featureCollection, intersect, union } from '@turf/turf';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { geodesicAreaM2 } from './geodesic-area';
import { rewindRfc7946 } from './rewind';

/** Anything that is, or carries, a Polygon or MultiPolygon geometry. */
export type AreaLike = Polygon | MultiPolygon | Feature<Polygon | MultiPolygon>;

/** Areas under this many m² are treated as empty: the round-off of planar clipping (about 1 × 1 dm). */
export const SLIVER_M2 = 0.01;

/** The geometry of a feature, or the geometry itself. */
export function geometryOf(g: AreaLike): Polygon | MultiPolygon {
  return g.type === 'Feature' ? g.geometry : g;
}

/** A MultiPolygon copy of any area geometry, [lon, lat] only, RFC 7946 winding; input not mutated. */
export function asMultiPolygon(g: AreaLike): MultiPolygon {
  const geom = geometryOf(g);
  const polys = geom.type === 'Polygon' ? [geom.coordinates] : geom.coordinates;
  return rewindRfc7946({
    type: 'MultiPolygon',
    coordinates: polys.map((rings) => rings.map((ring) => ring.map((p) => [p[0], p[1]]))),
  });
}

const feature = (g: AreaLike): Feature<Polygon | MultiPolygon> => ({
  type: 'Feature',
  properties: {},
  geometry: geometryOf(g),
});

/**
 * Drops the polygon parts smaller than `minM2` (geodesic m², default {@link SLIVER_M2}); null when nothing is
 * left. Returns a new MultiPolygon.
 */
export function dropSlivers(g: MultiPolygon | null, minM2 = SLIVER_M2): MultiPolygon | null {
  if (!g) return null;
  const kept = g.coordinates.filter(
    (rings) => geodesicAreaM2({ type: 'Polygon', coordinates: rings }) >= minM2,
  );
  return kept.length ? { type: 'MultiPolygon', coordinates: kept } : null;
}

function result(f: Feature<Polygon | MultiPolygon> | null): MultiPolygon | null {
  return f ? dropSlivers(asMultiPolygon(f)) : null;
}

/** Planar (lon/lat) intersection by Turf 7 (polyclip-ts); slivers dropped; null when empty. */
export function intersectAreas(a: AreaLike, b: AreaLike): MultiPolygon | null {
  return result(intersect(featureCollection([feature(a), feature(b)])));
}

/** `a` minus `b`, planar (Turf 7); slivers dropped; null when nothing is left. */
export function subtractArea(a: AreaLike, b: AreaLike): MultiPolygon | null {
  return result(difference(featureCollection([feature(a), feature(b)])));
}

/** Union of any number of areas (Turf 7); null for none. */
export function unionAreas(list: AreaLike[]): MultiPolygon | null {
  if (list.length === 0) return null;
  if (list.length === 1) return dropSlivers(asMultiPolygon(list[0]));
  return result(union(featureCollection(list.map(feature))));
}

/** [west, south, east, north] of an area's exterior rings. */
export function bboxOf(g: AreaLike): [number, number, number, number] {
  let w = Infinity;
  let s = Infinity;
  let e = -Infinity;
  let n = -Infinity;
  for (const rings of asMultiPolygon(g).coordinates) {
    for (const [x, y] of rings[0]) {
      if (x < w) w = x;
      if (x > e) e = x;
      if (y < s) s = y;
      if (y > n) n = y;
    }
  }
  return [w, s, e, n];
}

/** Whether two bounding boxes share any point. */
export function bboxesMeet(a: number[], b: number[]): boolean {
  return a[0] <= b[2] && b[0] <= a[2] && a[1] <= b[3] && b[1] <= a[3];
}
