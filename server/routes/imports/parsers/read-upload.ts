import type { Geometry, MultiPoint, MultiPolygon, Position } from 'geojson';
import { GeoInputError } from '../../../../shared/geo/geo-input-error';
import { normaliseFeatures } from '../../../../shared/geo/normalise-features';
import {
  assertDegreesInRange,
  assertNoAntimeridianCrossing,
  bboxOf,
  detectCoordinateSpace,
  utmCandidates,
  type CrsCandidate,
} from '../../../../shared/geo/detect-coordinates';
import { readZip } from '../../../lib/zip-inspect';
import { FileReadError } from '../import-errors';
import { readGeoJson } from './geojson';
import { readKml } from './kml';
import { readCsv } from './csv';
import { isShapefilePart, readShapefileLayers } from './shapefile';
import { extractPoints } from './points';
import { PointTable, numericSummary } from './point-table';
import { isGeographicCode, toWgs84 } from './projections';
import type { ParseJob, ParseOutcome, PointColumns, PreviewFeatureIn, ReadLayer, ReadResult } from './types';

/** A candidate coordinate system is offered only if the data lands this close to the field (metres). */
export const CANDIDATE_RADIUS_M = 50_000;

const ext = (name: string) => (/\.([^./]+)$/.exec(name)?.[1] ?? '').toLowerCase();

/** Which reader a file needs: zip magic first, then the extension for CSV, then the first character. */
export async function readAny(bytes: Uint8Array, fileName: string): Promise<ReadResult> {
  const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (buf.length >= 4 && buf.readUInt32LE(0) === 0x04034b50) return readZipped(buf, fileName);
  const e = ext(fileName);
  if (e === 'csv' || e === 'txt') return readCsv(bytes, fileName);
  let i = buf[0] === 0xef && buf[1] === 0xbb && buf[2] === 0xbf ? 3 : 0;
  while (i < buf.length && i < 4096 && /\s/.test(String.fromCharCode(buf[i]))) i++;
  const first = String.fromCharCode(buf[i] ?? 0);
  if (first === '{') return readGeoJson(bytes, fileName);
  if (first === '<') return readKml(bytes, fileName);
  if (e === 'shp' || e === 'dbf' || e === 'shx')
    throw new FileReadError('Send a shapefile as one zip holding its .shp, .shx, .dbf and .prj');
  throw new FileReadError(
    'Sowright reads GeoJSON, zipped shapefiles, KML, KMZ and CSV; this file is none of them',
  );
}

async function readZipped(buf: Buffer, fileName: string): Promise<ReadResult> {
  const isRootKml = (n: string) => /\.kml$/i.test(n) && !n.includes('/');
  const { names, files } = await readZip(buf, (n) => isShapefilePart(n) || isRootKml(n));
  const warnings: string[] = [];
  if (names.some((n) => /\.shp$/i.test(n) && isShapefilePart(n))) {
    return { format: 'shapefile', layers: readShapefileLayers(files, warnings), warnings };
  }
  const kmls = [...files.keys()].filter(isRootKml);
  if (kmls.length === 1) return readKml(files.get(kmls[0])!, fileName, 'kmz');
  if (kmls.length > 1)
    throw new FileReadError(`The KMZ holds ${kmls.length} KML documents at its top level; it must hold one`);
  throw new FileReadError('The zip holds neither a shapefile (.shp) nor a KML document');
}

type Projector = (p: number[]) => number[];

function reproject(features: PreviewFeatureIn[], fn: Projector): PreviewFeatureIn[] {
  const ring = (r: Position[]) => r.map((p) => fn(p));
  return features.map((f) => ({
    ...f,
    geometry: {
      type: 'MultiPolygon',
      coordinates: f.geometry.coordinates.map((poly) => poly.map(ring)),
    } as MultiPolygon,
  }));
}

function reprojectPoints(cols: PointColumns, fn: Projector): PointColumns {
  const x = new Float64Array(cols.x.length);
  const y = new Float64Array(cols.y.length);
  for (let i = 0; i < x.length; i++) [x[i], y[i]] = fn([cols.x[i], cols.y[i]]);
  return { ...cols, x, y };
}

/** Great-circle distance in metres (haversine on the mean radius 6 371 008.8 m: enough to tell 50 km). */
function distanceM(a: number[], b: number[]) {
  const rad = Math.PI / 180;
  const dLat = (b[1] - a[1]) * rad;
  const dLon = (b[0] - a[0]) * rad;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(a[1] * rad) * Math.cos(b[1] * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * 6_371_008.8 * Math.asin(Math.min(1, Math.sqrt(h)));
}

/**
 * Coordinate systems to offer for projected data: the UTM zones around the reference location and Web
 * Mercator, each kept only if reprojecting the middle of the data with it lands within
 * {@link CANDIDATE_RADIUS_M} of the reference.
 */
export function rankCandidates(bbox: number[], reference: number[] | null): CrsCandidate[] {
  if (!reference) return [];
  const mid = [(bbox[0] + bbox[2]) / 2, (bbox[1] + bbox[3]) / 2];
  const all = [
    ...utmCandidates(reference[0], reference[1]),
    { code: 'EPSG:3857', label: 'WGS 84 / Pseudo-Mercator (web maps)' },
  ];
  const out: (CrsCandidate & { d: number })[] = [];
  for (const c of all) {
    const p = toWgs84(c.code)!(mid);
    if (!Number.isFinite(p[0]) || !Number.isFinite(p[1])) continue;
    const d = distanceM(p, reference);
    if (d <= CANDIDATE_RADIUS_M)
      out.push({ code: c.code, label: `${c.label}: lands ${(d / 1000).toFixed(1)} km from this field`, d });
  }
  return out.sort((a, b) => a.d - b.d).map(({ code, label }) => ({ code, label }));
}

function geometryTypeOf(layer: ReadLayer): string {
  if (layer.geometryType) return layer.geometryType;
  const types = new Set<string>();
  const visit = (g: unknown) => {
    const o = g as { type?: unknown; geometries?: unknown[] } | null;
    if (!o || typeof o.type !== 'string') return;
    if (o.type === 'GeometryCollection' && Array.isArray(o.geometries))
      o.geometries.slice(0, 1000).forEach(visit);
    else types.add(o.type.replace(/^Multi/, ''));
  };
  const d = layer.data as { type?: string; features?: { geometry?: unknown }[]; geometry?: unknown } | null;
  if (d?.type === 'FeatureCollection' && Array.isArray(d.features))
    d.features.forEach((f) => visit(f?.geometry));
  else if (d?.type === 'Feature') visit(d.geometry);
  else visit(d);
  return types.size === 1 ? [...types][0] : types.size === 0 ? 'None' : 'Mixed';
}

function featureCountOf(layer: ReadLayer): number {
  if (layer.points) return layer.points.x.length;
  const d = layer.data as { type?: string; features?: unknown[] } | null;
  return d?.type === 'FeatureCollection' && Array.isArray(d.features) ? d.features.length : 1;
}

/** How one layer's coordinates become WGS84: a projector, nothing to do, or the user must choose. */
function layerProjection(
  layer: ReadLayer,
  warnings: string[],
): { fn: Projector | null; needsChoice: boolean; source: string } {
  if (layer.crs.kind !== 'code' || isGeographicCode(layer.crs.code))
    return { fn: null, needsChoice: false, source: layer.crs.source };
  const fn = toWgs84(layer.crs.code);
  if (fn) return { fn, needsChoice: false, source: `${layer.crs.source}, reprojected` };
  warnings.push(
    `The file names ${layer.crs.code}, which Sowright cannot reproject: choose the coordinate system`,
  );
  return { fn: null, needsChoice: true, source: layer.crs.source };
}

/**
 * Reads an uploaded file into what the preview needs: polygon features (boundary, zones) or point columns
 * (points), in WGS84 when the coordinate system is known, else the raw bounding box and the candidates.
 * Pure apart from the zip reading; runs inside the parse worker (server/jobs/parse-upload.ts).
 */
export async function readUpload(job: ParseJob): Promise<ParseOutcome> {
  const read = await readAny(job.bytes, job.fileName);
  const warnings = [...read.warnings];
  const wantPoints = job.purpose === 'points';
  if (!wantPoints && read.format === 'csv')
    throw new FileReadError('A CSV holds points: import it as a data layer, not as polygons');

  const layers = read.layers.map((l) => ({
    name: l.name,
    featureCount: featureCountOf(l),
    geometryType: geometryTypeOf(l),
  }));
  let features: PreviewFeatureIn[] = [];
  let points: PointColumns | null = null;
  let needsChoice = false;
  const sources = new Set<string>();
  let offset = 0;
  for (const [li, layer] of read.layers.entries()) {
    const proj = layerProjection(layer, warnings);
    needsChoice ||= proj.needsChoice;
    sources.add(proj.source);
    const layerName = read.layers.length > 1 ? layer.name : null;
    if (wantPoints) {
      let cols = layer.points;
      if (!cols) {
        const table = new PointTable();
        const { dropped } = extractPoints(layer.data, table);
        if (dropped)
          warnings.push(`${dropped} feature${dropped === 1 ? '' : 's'} that are not points skipped`);
        cols = table.toColumns();
      }
      if (proj.fn) cols = reprojectPoints(cols, proj.fn);
      points = points ? concatPoints(points, cols) : cols;
    } else {
      const n = normaliseFeatures(layer.data);
      warnings.push(...n.warnings.map((w) => (layerName ? `Layer "${layerName}": ${w}` : w)));
      let fs: PreviewFeatureIn[] = n.features.map((f) => ({
        ...f,
        index: offset + f.index,
        layer: layerName,
      }));
      if (proj.fn) fs = reproject(fs, proj.fn);
      features = features.concat(fs);
    }
    offset += layers[li].featureCount;
  }

  // Points are judged by their bounding box (two corners stand for them all); polygons feature by feature.
  const asFeatures = points ? [{ geometry: cornersOf(points) }] : features;
  const space = detectCoordinateSpace(asFeatures);
  if (space.kind === 'projected' && !needsChoice) {
    // Beyond ±180/±90: bad degrees (refused, naming the place) or metres labelled as degrees (ask).
    if (points) assertPointDegrees(points);
    else assertDegreesInRange(features);
    needsChoice = true;
    warnings.push(
      'The coordinates are not longitude and latitude degrees (some lie beyond ±180 / ±90): choose the coordinate system they are in',
    );
  }
  if (needsChoice && job.crsCode) {
    const fn = toWgs84(job.crsCode);
    if (!fn) throw new FileReadError(`Sowright cannot reproject from ${job.crsCode}`, 'unknown_crs');
    if (points) points = reprojectPoints(points, fn);
    features = reproject(features, fn);
    sources.clear();
    sources.add(`${job.crsCode}, as you chose`);
    needsChoice = false;
    assertWorld(points ? [{ index: 0, geometry: cornersOf(points) }] : features, job.crsCode);
  } else if (needsChoice) {
    const bbox = (space.kind === 'projected' ? space.bbox : bboxOf(asFeatures)) ?? [0, 0, 0, 0];
    const candidates = rankCandidates(bbox, job.reference);
    if (!job.reference)
      warnings.push('No field location is known to suggest a coordinate system from: enter its EPSG code');
    else if (candidates.length === 0)
      warnings.push('No usual coordinate system puts this data near the field: enter its EPSG code');
    return {
      format: read.format,
      layers,
      coordinates: { kind: 'projected', bbox, candidates },
      crsChosen: false,
      features: [],
      points: null,
      pointCount: points?.x.length,
      numericProperties: points ? numericSummary(points.columns) : undefined,
      warnings,
    };
  } else {
    assertWorld(points ? [{ index: 0, geometry: cornersOf(points) }] : features, null);
  }
  return {
    format: read.format,
    layers,
    coordinates: { kind: 'geographic', source: [...sources].join('; ') },
    crsChosen: sources.has(`${job.crsCode}, as you chose`),
    features,
    pointCount: points?.x.length,
    points: points
      ? {
          lon: points.x,
          lat: points.y,
          columns: points.columns.map(({ name, values }) => ({ name, values })),
        }
      : null,
    numericProperties: points ? numericSummary(points.columns) : undefined,
    warnings,
  };
}

/** After reprojection every coordinate must be finite degrees on the globe, and no shape may span the 180th meridian. */
function assertWorld(features: { index: number; geometry: Geometry }[], code: string | null) {
  const space = detectCoordinateSpace(features);
  if (space.kind === 'projected' || bboxOf(features)?.some((v) => !Number.isFinite(v))) {
    throw new FileReadError(
      code
        ? `With ${code} the coordinates fall outside the globe: choose another coordinate system`
        : 'The coordinates fall outside the globe',
      code ? 'unknown_crs' : 'unreadable_file',
    );
  }
  if (features.every((f) => f.geometry.type !== 'MultiPoint')) assertNoAntimeridianCrossing(features);
}

/** The south-west and north-east corners of the points' bounding box, as a MultiPoint. */
function cornersOf(p: PointColumns): MultiPoint {
  let [w, s, e, n] = [Infinity, Infinity, -Infinity, -Infinity];
  for (let i = 0; i < p.x.length; i++) {
    const x = p.x[i];
    const y = p.y[i];
    if (!(x >= w)) w = x;
    if (!(x <= e)) e = x;
    if (!(y >= s)) s = y;
    if (!(y <= n)) n = y;
  }
  return {
    type: 'MultiPoint',
    coordinates: p.x.length
      ? [
          [w, s],
          [e, n],
        ]
      : [],
  };
}

/** Like assertDegreesInRange, for point columns: names the first point beyond ±180 / ±90 when the numbers are degree-sized. */
function assertPointDegrees(p: PointColumns) {
  const [[w, s], [e, n]] = cornersOf(p).coordinates;
  if (Math.max(Math.abs(w), Math.abs(e)) > 360 || Math.max(Math.abs(s), Math.abs(n)) > 180) return;
  for (let i = 0; i < p.x.length; i++) {
    if (Math.abs(p.x[i]) > 180)
      throw new GeoInputError(`Longitude ${p.x[i]} of point ${i + 1} lies beyond ±180°`);
    if (Math.abs(p.y[i]) > 90)
      throw new GeoInputError(`Latitude ${p.y[i]} of point ${i + 1} lies beyond ±90°`);
  }
}

function concatPoints(a: PointColumns, b: PointColumns): PointColumns {
  const join = (u: Float64Array, v: Float64Array) => {
    const out = new Float64Array(u.length + v.length);
    out.set(u);
    out.set(v, u.length);
    return out;
  };
  const names = new Set([...a.columns, ...b.columns].map((c) => c.name));
  const pick = (p: PointColumns, name: string) => p.columns.find((c) => c.name === name);
  const columns = [...names].map((name) => {
    const ca = pick(a, name);
    const cb = pick(b, name);
    return {
      name,
      values: join(
        ca?.values ?? new Float64Array(a.x.length).fill(Number.NaN),
        cb?.values ?? new Float64Array(b.x.length).fill(Number.NaN),
      ),
      texts: (ca?.texts ?? 0) + (cb?.texts ?? 0),
    };
  });
  return { x: join(a.x, b.x), y: join(a.y, b.y), columns };
}
