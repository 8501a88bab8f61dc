import type { MultiPolygon, Polygon, Position } from 'geojson';

/**
 * Twice the signed planar area of a ring in degree units (shoelace on [lon, lat]); positive means
 * counter-clockwise on a map with east to the right and north up. Enough to tell winding for any ring that
 * does not cross the antimeridian or encircle a pole.
 */
export function ringOrientation(ring: Position[]): number {
  let s = 0;
  for (let i = 0, n = ring.length; i < n; i++) {
    const [x1, y1] = ring[i];
    const [x2, y2] = ring[(i + 1) % n];
    s += x1 * y2 - x2 * y1;
  }
  return s;
}

function windRing(ring: Position[], ccw: boolean): Position[] {
  const copy = ring.map((p) => [...p]);
  const o = ringOrientation(copy);
  return o > 0 === ccw || o === 0 ? copy : copy.reverse();
}

function windPolygon(rings: Position[][], outerCcw: boolean): Position[][] {
  return rings.map((ring, i) => windRing(ring, i === 0 ? outerCcw : !outerCcw));
}

function rewind<G extends Polygon | MultiPolygon>(g: G, outerCcw: boolean): G {
  if (g.type === 'Polygon') return { ...g, coordinates: windPolygon(g.coordinates, outerCcw) };
  return { ...g, coordinates: (g as MultiPolygon).coordinates.map((rings) => windPolygon(rings, outerCcw)) };
}

/**
 * A copy of a Polygon or MultiPolygon ([lon, lat]) wound as RFC 7946 §3.1.6 asks: exterior rings
 * counter-clockwise, holes clockwise. The input is not mutated.
 */
export function rewindRfc7946<G extends Polygon | MultiPolygon>(g: G): G {
  return rewind(g, true);
}

/**
 * A copy wound as the ESRI shapefile technical description (1998) asks: outer rings clockwise, holes
 * counter-clockwise. The input is not mutated.
 */
export function rewindShapefile<G extends Polygon | MultiPolygon>(g: G): G {
  return rewind(g, false);
}
