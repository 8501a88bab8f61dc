import type { MultiPolygon, Position } from 'geojson';
import { GeoInputError, type GeoInputPlace } from './geo-input-error';
import { rewindRfc7946 } from './rewind';

/** One polygon feature as Sowright keeps it: a 2D MultiPolygon, RFC 7946 winding, its properties. */
export type NormalFeature = { index: number; properties: Record<string, unknown>; geometry: MultiPolygon };

/** Deeper GeometryCollections than this are refused (a guard against crafted input, not a format rule). */
const MAX_COLLECTION_DEPTH = 8;

const isObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v);

type Context = { warnings: string[]; dropped: Map<string, number>; unclosed: number };

/**
 * Any GeoJSON (bare geometry, Feature, FeatureCollection, GeometryCollection, 3D, either winding) → its polygon
 * features as 2D MultiPolygons wound as RFC 7946 §3.1.6 asks. Every polygon part of a feature (including those
 * inside GeometryCollections) becomes one MultiPolygon; points and lines are dropped with a warning, and so
 * are empty geometries. An unclosed ring is closed (with a warning). A legacy `crs` member is ignored here
 * (the caller reads it: `legacyCrsCode` in detect-coordinates.ts).
 *
 * Throws {@link GeoInputError} naming feature, part, ring and coordinate for coordinates that are not numbers,
 * rings of fewer than three distinct positions, and input that is not GeoJSON. Validity (self-intersections,
 * holes outside shells) is not decided here: PostGIS decides it. The input is not mutated.
 */
export function normaliseFeatures(input: unknown): { features: NormalFeature[]; warnings: string[] } {
  const ctx: Context = { warnings: [], dropped: new Map(), unclosed: 0 };
  const features: NormalFeature[] = [];
  for (const [index, raw] of featuresOf(input).entries()) {
    const properties = isObject(raw.properties) ? { ...raw.properties } : {};
    if (raw.geometry === null || raw.geometry === undefined) {
      count(ctx, 'without geometry');
      continue;
    }
    const polygons: Position[][][] = [];
    collectPolygons(raw.geometry, { feature: index }, polygons, ctx, 0);
    if (polygons.length === 0) continue;
    const geometry = rewindRfc7946<MultiPolygon>({ type: 'MultiPolygon', coordinates: polygons });
    features.push({ index, properties, geometry });
  }
  for (const [what, n] of ctx.dropped)
    ctx.warnings.push(`${n} feature part${n === 1 ? '' : 's'} ${what} skipped`);
  if (ctx.unclosed) {
    const n = ctx.unclosed;
    ctx.warnings.push(
      `${n} ring${n === 1 ? ' was' : 's were'} not closed: the first position was repeated at the end`,
    );
  }
  return { features, warnings: ctx.warnings };
}

/** The features of any GeoJSON object, as { geometry, properties } (a bare geometry becomes one feature). */
function featuresOf(input: unknown): { geometry: unknown; properties: unknown }[] {
  if (!isObject(input) || typeof input.type !== 'string') {
    throw new GeoInputError('The file is not GeoJSON: expected an object with a "type"');
  }
  switch (input.type) {
    case 'FeatureCollection': {
      if (!Array.isArray(input.features))
        throw new GeoInputError('The FeatureCollection has no "features" list');
      return input.features.map((f, i) => {
        if (!isObject(f) || f.type !== 'Feature')
          throw new GeoInputError('This entry of "features" is not a Feature', { feature: i });
        return { geometry: f.geometry, properties: f.properties };
      });
    }
    case 'Feature':
      return [{ geometry: input.geometry, properties: input.properties }];
    case 'Point':
    case 'MultiPoint':
    case 'LineString':
    case 'MultiLineString':
    case 'Polygon':
    case 'MultiPolygon':
    case 'GeometryCollection':
      return [{ geometry: input, properties: {} }];
    default:
      throw new GeoInputError(`The file is not GeoJSON: unknown type "${String(input.type).slice(0, 40)}"`);
  }
}

function count(ctx: Context, what: string) {
  ctx.dropped.set(what, (ctx.dropped.get(what) ?? 0) + 1);
}

function collectPolygons(
  geom: unknown,
  place: GeoInputPlace,
  out: Position[][][],
  ctx: Context,
  depth: number,
) {
  if (!isObject(geom) || typeof geom.type !== 'string')
    throw new GeoInputError('The geometry is not a GeoJSON geometry', place);
  const coords = geom.coordinates;
  switch (geom.type) {
    case 'Polygon':
      if (isEmpty(coords)) return count(ctx, 'with an empty geometry');
      out.push(readPolygon(coords, place, ctx));
      return;
    case 'MultiPolygon': {
      if (isEmpty(coords)) return count(ctx, 'with an empty geometry');
      if (!Array.isArray(coords)) throw new GeoInputError('The MultiPolygon has no list of polygons', place);
      coords.forEach((poly, part) => {
        if (isEmpty(poly)) return count(ctx, 'with an empty geometry');
        out.push(readPolygon(poly, { ...place, part }, ctx));
      });
      return;
    }
    case 'GeometryCollection': {
      if (depth >= MAX_COLLECTION_DEPTH)
        throw new GeoInputError('GeometryCollections are nested too deeply', place);
      if (!Array.isArray(geom.geometries))
        throw new GeoInputError('The GeometryCollection has no "geometries" list', place);
      for (const g of geom.geometries) collectPolygons(g, place, out, ctx, depth + 1);
      return;
    }
    case 'Point':
    case 'MultiPoint':
      return count(ctx, 'holding points (not polygons)');
    case 'LineString':
    case 'MultiLineString':
      return count(ctx, 'holding lines (not polygons)');
    default:
      throw new GeoInputError(`Unknown geometry type "${geom.type.slice(0, 40)}"`, place);
  }
}

const isEmpty = (coords: unknown) =>
  coords === undefined || coords === null || (Array.isArray(coords) && coords.length === 0);

function readPolygon(rings: unknown, place: GeoInputPlace, ctx: Context): Position[][] {
  if (!Array.isArray(rings)) throw new GeoInputError('The polygon has no list of rings', place);
  return rings.map((ring, r) => readRing(ring, { ...place, ring: r }, ctx));
}

function readRing(ring: unknown, place: GeoInputPlace, ctx: Context): Position[] {
  if (!Array.isArray(ring)) throw new GeoInputError('The ring is not a list of positions', place);
  const out = ring.map((p, coordinate) => readPosition(p, { ...place, coordinate }));
  const first = out[0];
  const last = out[out.length - 1];
  if (out.length > 0 && (first[0] !== last[0] || first[1] !== last[1])) {
    out.push([first[0], first[1]]);
    ctx.unclosed++;
  }
  const distinct = new Set(out.map(([x, y]) => `${x},${y}`)).size;
  if (out.length < 4 || distinct < 3) {
    throw new GeoInputError(`A ring needs at least three distinct corners; this one has ${distinct}`, place);
  }
  return out;
}

function readPosition(p: unknown, place: GeoInputPlace): Position {
  if (!Array.isArray(p) || p.length < 2)
    throw new GeoInputError('A position needs a longitude and a latitude', place);
  const [x, y] = p as unknown[];
  if (typeof x !== 'number' || typeof y !== 'number' || !Number.isFinite(x) || !Number.isFinite(y)) {
    throw new GeoInputError(`Coordinates must be numbers; found ${describe(x)}, ${describe(y)}`, place);
  }
  // Altitude (and any measure) is dropped: Sowright works in 2D.
  return [x, y];
}

function describe(v: unknown): string {
  if (typeof v === 'string') return `the text "${v.slice(0, 20)}"`;
  if (typeof v === 'number') return String(v);
  return v === null ? 'null' : v === undefined ? 'nothing' : typeof v;
}
