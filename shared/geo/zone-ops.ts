import geodesic from 'geographiclib-geodesic';
import { booleanPointInPolygon } from '@turf/turf';
import type { Feature, LineString, MultiPolygon, Polygon, Position } from 'geojson';
import { geodesicAreaM2 } from './geodesic-area';
import { GeoInputError } from './geo-input-error';
import {
  type AreaLike,
  SLIVER_M2,
  asMultiPolygon,
  bboxOf,
  bboxesMeet,
  intersectAreas,
  subtractArea,
  unionAreas,
} from './polygon-clip';
import { ringOrientation } from './rewind';

const { Geodesic } = geodesic;

/**
 * Every zone operation takes and returns zone features: a MultiPolygon geometry ([lon, lat], WGS84) and
 * properties with at least a string `id`. Other properties pass through untouched, except `areaM2`, which is
 * set to the geodesic area (m², {@link geodesicAreaM2}) of any geometry an operation produces. Inputs are never
 * mutated; results are new objects in RFC 7946 winding. Clipping is Turf 7 (polyclip-ts) in lon/lat.
 */
export type ZoneLike<P extends { id: string } = { id: string }> = Feature<MultiPolygon, P>;

/** Properties of the default zone that {@link fillGaps} creates. */
export type DefaultZoneProps = {
  id: string;
  name: string;
  classValue: null;
  productivityIndex: null;
  isDefault: true;
  meanValue: null;
  areaM2: number;
};

/** Overlaps smaller than this (m²) are round-off, not something to show a person. */
export const OVERLAP_EPSILON_M2 = SLIVER_M2;

type WithArea<P> = P & { areaM2: number };

function withGeometry<P extends { id: string }>(
  zone: ZoneLike<P>,
  geometry: MultiPolygon,
): ZoneLike<WithArea<P>> {
  return { ...zone, properties: { ...zone.properties, areaM2: geodesicAreaM2(geometry) }, geometry };
}

function findZone<P extends { id: string }>(zones: ZoneLike<P>[], id: string, role: string): number {
  const i = zones.findIndex((z) => z.properties.id === id);
  if (i < 0) throw new GeoInputError(`No zone with id ${id} (${role})`);
  return i;
}

/**
 * Each zone clipped to the field boundary. Zones left with no area (entirely outside, or under
 * {@link SLIVER_M2}) are dropped from the result.
 */
export function clipToBoundary<P extends { id: string }>(
  zones: ZoneLike<P>[],
  boundary: AreaLike,
): ZoneLike<WithArea<P>>[] {
  const out: ZoneLike<WithArea<P>>[] = [];
  for (const zone of zones) {
    const clipped = intersectAreas(zone, boundary);
    if (clipped) out.push(withGeometry(zone, clipped));
  }
  return out;
}

/** One overlap between two zones: their ids (in input order), the shared area and its geodesic m². */
export type Overlap = { aId: string; bId: string; geometry: MultiPolygon; areaM2: number };

/** Every pair of zones that share more than {@link OVERLAP_EPSILON_M2} m² of area, in input order. */
export function findOverlaps(zones: ZoneLike[]): Overlap[] {
  const boxes = zones.map((z) => bboxOf(z));
  const out: Overlap[] = [];
  for (let i = 0; i < zones.length; i++) {
    for (let j = i + 1; j < zones.length; j++) {
      if (!bboxesMeet(boxes[i], boxes[j])) continue;
      const shared = intersectAreas(zones[i], zones[j]);
      if (!shared) continue;
      const areaM2 = geodesicAreaM2(shared);
      if (areaM2 > OVERLAP_EPSILON_M2) {
        out.push({ aId: zones[i].properties.id, bId: zones[j].properties.id, geometry: shared, areaM2 });
      }
    }
  }
  return out;
}

/**
 * The zone `keepId` keeps the area it shares with `loseId`; `loseId` loses it. When nothing of the losing
 * zone remains it is removed. Throws {@link GeoInputError} for an unknown id or when both ids are the same.
 */
export function resolveOverlap<P extends { id: string }>(
  zones: ZoneLike<P>[],
  keepId: string,
  loseId: string,
): ZoneLike<P | WithArea<P>>[] {
  if (keepId === loseId) throw new GeoInputError('A zone cannot overlap itself: choose two different zones');
  const keep = zones[findZone(zones, keepId, 'the zone to keep the overlap')];
  const loseIndex = findZone(zones, loseId, 'the zone to lose the overlap');
  const rest = subtractArea(zones[loseIndex], keep);
  const out: ZoneLike<P | WithArea<P>>[] = [...zones];
  if (rest) out[loseIndex] = withGeometry(zones[loseIndex], rest);
  else out.splice(loseIndex, 1);
  return out;
}

/** The parts of the boundary no zone covers (pieces under {@link SLIVER_M2} ignored), or null when none. */
export function findGaps(zones: ZoneLike[], boundary: AreaLike): MultiPolygon | null {
  const covered = unionAreas(zones);
  return covered ? subtractArea(boundary, covered) : asMultiPolygon(boundary);
}

/**
 * Fills the gaps inside the boundary: they are added to the existing default zone (`isDefault: true`) if
 * there is one, else they become a new default zone with the given id and name. Returns the zones unchanged
 * (as a new array) when there is no gap.
 */
export function fillGaps<P extends { id: string }>(
  zones: ZoneLike<P>[],
  boundary: AreaLike,
  defaults: { id: string; name: string },
): ZoneLike<P | WithArea<P> | DefaultZoneProps>[] {
  const gaps = findGaps(zones, boundary);
  const out: ZoneLike<P | WithArea<P> | DefaultZoneProps>[] = [...zones];
  if (!gaps) return out;
  const d = zones.findIndex((z) => (z.properties as { isDefault?: unknown }).isDefault === true);
  if (d >= 0) {
    out[d] = withGeometry(zones[d], unionAreas([zones[d], gaps]) ?? gaps);
    return out;
  }
  const props: DefaultZoneProps = {
    id: defaults.id,
    name: defaults.name,
    classValue: null,
    productivityIndex: null,
    isDefault: true,
    meanValue: null,
    areaM2: geodesicAreaM2(gaps),
  };
  out.push({ type: 'Feature', properties: props, geometry: gaps });
  return out;
}

/** The union of two zones (touching or overlapping) as one MultiPolygon; holes and parts kept. */
export function mergeZones(a: AreaLike, b: AreaLike): MultiPolygon {
  const merged = unionAreas([a, b]);
  if (!merged) throw new GeoInputError('The zones to merge have no area');
  return merged;
}

// ---- splitting ----

type Pt = [number, number];

/** Parameter t along p→p+r where segment p→p+r meets q→q+s, or null (parallel or not meeting). */
function segmentHit(p: Pt, r: Pt, q: Pt, s: Pt): number | null {
  const den = r[0] * s[1] - r[1] * s[0];
  if (den === 0) return null;
  const qp: Pt = [q[0] - p[0], q[1] - p[1]];
  const t = (qp[0] * s[1] - qp[1] * s[0]) / den;
  const u = (qp[0] * r[1] - qp[1] * r[0]) / den;
  return t >= 0 && t <= 1 && u >= 0 && u <= 1 ? t : null;
}

/** Whether the segment a→b crosses any segment of the chains, beyond a small distance from `a`. */
function crossesAny(a: Pt, b: Pt, chains: Position[][]): boolean {
  const r: Pt = [b[0] - a[0], b[1] - a[1]];
  for (const chain of chains) {
    for (let i = 0; i + 1 < chain.length; i++) {
      const q = chain[i] as Pt;
      const s: Pt = [chain[i + 1][0] - q[0], chain[i + 1][1] - q[1]];
      const t = segmentHit(a, r, q, s);
      if (t !== null && t > 1e-9) return true;
    }
  }
  return false;
}

/** Where the ray from p in direction d leaves the box [w, s, e, n] (p inside the box). */
function rayToBox(p: Pt, d: Pt, box: number[]): Pt {
  let t = Infinity;
  if (d[0] > 0) t = Math.min(t, (box[2] - p[0]) / d[0]);
  if (d[0] < 0) t = Math.min(t, (box[0] - p[0]) / d[0]);
  if (d[1] > 0) t = Math.min(t, (box[3] - p[1]) / d[1]);
  if (d[1] < 0) t = Math.min(t, (box[1] - p[1]) / d[1]);
  return [p[0] + t * d[0], p[1] + t * d[1]];
}

/** Position of a point on the box perimeter as a number in [0, 4): south, east, north, west sides in turn. */
function perimeterPos(p: Pt, box: number[]): number {
  const [w, s, e, n] = box;
  const eps = 1e-12 * Math.max(e - w, n - s);
  if (Math.abs(p[1] - s) <= eps) return (p[0] - w) / (e - w);
  if (Math.abs(p[0] - e) <= eps) return 1 + (p[1] - s) / (n - s);
  if (Math.abs(p[1] - n) <= eps) return 2 + (e - p[0]) / (e - w);
  return 3 + (n - p[1]) / (n - s);
}

/** Candidate directions for extending the line beyond an end: straight on first, then turning either way. */
function rayDirections(from: Pt, to: Pt): Pt[] {
  const base = Math.atan2(to[1] - from[1], to[0] - from[0]);
  const out: Pt[] = [];
  for (const k of [0, 1, -1, 2, -2, 3, -3, 4, -4, 5, -5, 6, -6, 7, -7]) {
    const a = base + (k * Math.PI) / 8;
    out.push([Math.cos(a), Math.sin(a)]);
  }
  return out;
}

/**
 * A polygon bounded by the line, by two rays that carry the line's ends out to a box around everything
 * without crossing the zone, the line or each other, and by the box itself. Everything of the zone inside it
 * lies on one side of the drawn line. Null when no such rays exist (the line ends inside the zone).
 */
function sidePolygon(line: Pt[], zoneRings: Position[][]): Polygon | null {
  const zb = zoneRings.flat();
  const all = [...zb, ...line];
  const xs = all.map((p) => p[0]);
  const ys = all.map((p) => p[1]);
  const span = Math.max(Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys)) || 1;
  const box = [
    Math.min(...xs) - span,
    Math.min(...ys) - span,
    Math.max(...xs) + span,
    Math.max(...ys) + span,
  ];
  const first = line[0];
  const last = line[line.length - 1];
  const lineChain: Position[][] = [line];
  const ok = (p: Pt, far: Pt) => !crossesAny(p, far, zoneRings) && !crossesAny(p, far, lineChain);
  for (const dEnd of rayDirections(line[line.length - 2], last)) {
    const farEnd = rayToBox(last, dEnd, box);
    if (!ok(last, farEnd)) continue;
    for (const dStart of rayDirections(line[1], first)) {
      const farStart = rayToBox(first, dStart, box);
      if (!ok(first, farStart) || crossesAny(first, farStart, [[last, farEnd]])) continue;
      const ring: Position[] = [farStart, ...line, farEnd];
      const from = perimeterPos(farEnd, box);
      let to = perimeterPos(farStart, box);
      if (to <= from) to += 4;
      const corners: Pt[] = [
        [box[2], box[1]],
        [box[2], box[3]],
        [box[0], box[3]],
        [box[0], box[1]],
      ];
      for (let c = Math.floor(from) + 1; c < to; c++) ring.push(corners[(c - 1) % 4]);
      ring.push(farStart);
      return { type: 'Polygon', coordinates: [ring] };
    }
  }
  return null;
}

/** The line's positions with repeated points removed; throws when fewer than two remain or it crosses itself. */
function cleanLine(line: LineString): Pt[] {
  const pts: Pt[] = [];
  line.coordinates.forEach((p, i) => {
    if (!Number.isFinite(p?.[0]) || !Number.isFinite(p?.[1])) {
      throw new GeoInputError('The split line has a position that is not a pair of numbers', {
        coordinate: i,
      });
    }
    const prev = pts[pts.length - 1];
    if (!prev || prev[0] !== p[0] || prev[1] !== p[1]) pts.push([p[0], p[1]]);
  });
  if (pts.length < 2) throw new GeoInputError('The split line needs at least two different positions');
  for (let i = 0; i + 1 < pts.length; i++) {
    const rest = pts.slice(i + 2);
    if (rest.length > 1 && crossesAny(pts[i], pts[i + 1], [rest])) {
      throw new GeoInputError('The split line crosses itself', { coordinate: i + 1 });
    }
  }
  return pts;
}

/**
 * Moves every vertex that clipping put on an edge of the zone onto that edge's geodesic (WGS84). Clipping is
 * planar in lon/lat, but areas are geodesic: a cut point on the straight lon/lat chord of a 300 m edge sits
 * about a millimetre off the geodesic and the halves' areas would then miss the zone's by a few 1e-6. Both
 * halves share the moved point, so they still meet exactly. Returns a new MultiPolygon.
 */
function snapToZoneEdges(g: MultiPolygon, zoneRings: Position[][]): MultiPolygon {
  const own = new Set(zoneRings.flat().map((p) => `${p[0]},${p[1]}`));
  const cache = new Map<string, Position>();
  const snap = (p: Position): Position => {
    const key = `${p[0]},${p[1]}`;
    if (own.has(key)) return [p[0], p[1]];
    const hit = cache.get(key);
    if (hit) return [...hit];
    let best: { d: number; a: Position; b: Position; t: number } | null = null;
    for (const ring of zoneRings) {
      for (let i = 0; i + 1 < ring.length; i++) {
        const [a, b] = [ring[i], ring[i + 1]];
        const dx = b[0] - a[0];
        const dy = b[1] - a[1];
        const len2 = dx * dx + dy * dy;
        if (!len2) continue;
        const t = Math.min(1, Math.max(0, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2));
        const d = Math.hypot(a[0] + t * dx - p[0], a[1] + t * dy - p[1]);
        if (!best || d < best.d) best = { d, a, b, t };
      }
    }
    let out: Position = [p[0], p[1]];
    // Only points lying on an edge (1e-9° is about 0.1 mm): the others are the line's own vertices.
    if (best && best.d < 1e-9) {
      const line = Geodesic.WGS84.InverseLine(best.a[1], best.a[0], best.b[1], best.b[0]);
      const pos = line.Position(best.t * line.s13);
      out = [pos.lon2!, pos.lat2!];
    }
    cache.set(key, out);
    return [...out];
  };
  return {
    type: 'MultiPolygon',
    coordinates: g.coordinates.map((rings) => rings.map((ring) => ring.map(snap))),
  };
}

/**
 * Splits a zone along a drawn line (a LineString in [lon, lat]; it may run past the zone's edge). Every part
 * of the zone the line crosses is cut; parts it does not cross go whole to the side they lie on. Returns
 * [left, right] of the line as drawn, each non-empty; their areas add up to the zone's. Holes are kept.
 * Throws {@link GeoInputError} when the line does not divide the zone (it misses it, or starts or ends inside
 * it, or crosses itself).
 */
export function splitZone(zone: AreaLike, line: LineString): [MultiPolygon, MultiPolygon] {
  const pts = cleanLine(line);
  const mp = asMultiPolygon(zone);
  for (const [end, index] of [
    [pts[0], 0],
    [pts[pts.length - 1], line.coordinates.length - 1],
  ] as const) {
    if (
      mp.coordinates.some((rings) =>
        booleanPointInPolygon(end, { type: 'Polygon', coordinates: rings }, { ignoreBoundary: true }),
      )
    ) {
      throw new GeoInputError('The split line must start and end outside the zone', { coordinate: index });
    }
  }
  const side = sidePolygon(pts, mp.coordinates.flat());
  if (!side)
    throw new GeoInputError('The split line cannot be carried out of the zone: draw it across the zone');
  const left: Position[][][] = [];
  const right: Position[][][] = [];
  let crossed = false;
  for (const rings of mp.coordinates) {
    const part: Polygon = { type: 'Polygon', coordinates: rings };
    const inside = intersectAreas(part, side);
    const outside = subtractArea(part, side);
    if (inside && outside) crossed = true;
    if (inside) left.push(...inside.coordinates);
    if (outside) right.push(...outside.coordinates);
  }
  if (!crossed || !left.length || !right.length) {
    throw new GeoInputError('The split line does not divide the zone: draw it right across the zone');
  }
  const zoneRings = mp.coordinates.flat();
  const a = snapToZoneEdges({ type: 'MultiPolygon', coordinates: left }, zoneRings);
  const b = snapToZoneEdges({ type: 'MultiPolygon', coordinates: right }, zoneRings);
  // The side polygon lies left of the line when it is wound counter-clockwise.
  return ringOrientation(side.coordinates[0]) > 0 ? [a, b] : [b, a];
}
