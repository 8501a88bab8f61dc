import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { importPreviewSchema, type ImportPreview } from '../../shared/schemas/import.schema';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { startTestApp, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { square, upload } from './imports-support';

let t: TestApp;
let w: World;
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'imports-corpus');
});
afterAll(() => t.close());

/** Positions in a small local frame (units of 0.001°) placed beside the test field at 93.6° W, 42° N. */
const at = (x: number, y: number) => [-93.6 + x * 0.001, 42 + y * 0.001];
const ring = (...pts: [number, number][]) => pts.map(([x, y]) => at(x, y));
const polygon = (...rings: unknown[][]) => ({ type: 'Polygon', coordinates: rings });
const post = (geojson: unknown, purpose = 'zones') =>
  upload(
    w.callers.agronomist,
    w.a.field.id,
    purpose,
    'case.geojson',
    typeof geojson === 'string' ? geojson : JSON.stringify(geojson),
  );

/** A one-polygon FeatureCollection with a legacy `crs` member naming `name`. */
const namedCrs = (name: string, ring: number[][]) => ({
  type: 'FeatureCollection',
  crs: { type: 'name', properties: { name } },
  features: [{ type: 'Feature', properties: {}, geometry: polygon(ring) }],
});

async function importOk(geojson: unknown): Promise<ImportPreview> {
  const res = await post(geojson);
  expect(res.status, JSON.stringify(res.body).slice(0, 500)).toBe(201);
  return importPreviewSchema.parse(res.body);
}

/** An invalid feature: PostGIS's reason, the place, and a repair with its own area. */
async function expectInvalid(geojson: unknown, reason: RegExp) {
  const p = await importOk(geojson);
  const f = p.features[0];
  expect(f.validity.valid).toBe(false);
  expect(f.validity.reason).toMatch(reason);
  expect(f.validity.location).toHaveLength(2);
  expect(f.repair).not.toBeNull();
  expect(f.repair!.areaM2).toBeCloseTo(geodesicAreaM2(f.repair!.geometry), 1);
  return f;
}

/** A 4xx whose message names the place (feature / ring / coordinate) given. */
async function expectRefused(geojson: unknown, place: RegExp, purpose = 'zones') {
  const res = await post(geojson, purpose);
  expect(res.status, JSON.stringify(res.body)).toBeGreaterThanOrEqual(400);
  expect(res.status).toBeLessThan(500);
  expect(res.body.error.message).toMatch(place);
  return res.body.error;
}

describe('the bad-input corpus (RELIABILITY.md), each ending in a clear answer', () => {
  it('bow-tie: invalid, self-intersection, repaired into two triangles', async () => {
    const f = await expectInvalid(
      polygon(ring([0, 0], [2, 2], [2, 0], [0, 2], [0, 0])),
      /Self-intersection/i,
    );
    expect(f.repair!.geometry.coordinates).toHaveLength(2);
  });

  it('self-touching ring (an exterior that passes through one vertex twice): invalid, repaired', async () => {
    await expectInvalid(polygon(ring([0, 0], [4, 0], [4, 4], [2, 0], [0, 4], [0, 0])), /Self-intersection/i);
  });

  it('spike (out and back along one line): invalid, repaired without the spike', async () => {
    const f = await expectInvalid(
      polygon(ring([0, 0], [2, 0], [2, 1], [4, 1], [2, 1], [2, 2], [0, 2], [0, 0])),
      /Self-intersection/i,
    );
    // The repair keeps the 2×2 square (derived: the spike has no area).
    const plain = geodesicAreaM2({
      type: 'Polygon',
      coordinates: [ring([0, 0], [2, 0], [2, 2], [0, 2], [0, 0])],
    });
    expect(f.repair!.areaM2).toBeCloseTo(plain, 0);
  });

  it('unclosed ring: closed, with a warning, and imported', async () => {
    const p = await importOk(polygon(ring([0, 0], [2, 0], [2, 2], [0, 2])));
    expect(p.features[0].validity.valid).toBe(true);
    expect(p.warnings.some((m) => /closed/.test(m))).toBe(true);
  });

  it('too few points: refused naming feature and ring', async () => {
    await expectRefused(
      { type: 'Feature', properties: {}, geometry: polygon(ring([0, 0], [1, 0], [0, 0])) },
      /feature 1, outer ring/,
    );
    await expectRefused(
      polygon(ring([0, 0], [2, 0], [2, 2], [0, 0]), ring([0.5, 0.5], [0.5, 0.5])),
      /hole 1/,
    );
  });

  it('NaN, null and string coordinates: refused naming the coordinate (NaN is not JSON: named by line)', async () => {
    await expectRefused('{"type":"Polygon","coordinates":[[[0,0],[1,0],\n[NaN,1],[0,0]]]}', /line 2/);
    await expectRefused(polygon([at(0, 0), at(1, 0), [null, 42.001], at(0, 0)]), /coordinate 3/);
    await expectRefused(
      {
        type: 'FeatureCollection',
        features: [
          { type: 'Feature', properties: {}, geometry: polygon(ring([0, 0], [1, 0], [1, 1], [0, 0])) },
          {
            type: 'Feature',
            properties: {},
            geometry: polygon([at(0, 0), ['-93.5', '42.0'], at(1, 1), at(0, 0)]),
          },
        ],
      },
      /feature 2, outer ring, coordinate 2/,
    );
  });

  it('longitude beyond 180 and latitude beyond 90: refused naming the coordinate', async () => {
    await expectRefused(
      polygon([
        [179.5, 42],
        [181.2, 42],
        [180.5, 42.5],
        [179.5, 42],
      ]),
      /Longitude 181\.2.*coordinate 2/,
    );
    await expectRefused(
      polygon([
        [-93.6, 89.5],
        [-93.5, 89.5],
        [-93.5, 90.5],
        [-93.6, 89.5],
      ]),
      /Latitude 90\.5.*coordinate 3/,
    );
  });

  it('projected metres labelled as degrees: answered as projected, with a warning, never guessed', async () => {
    const utm = [
      [448000, 4650000],
      [449000, 4650000],
      [449000, 4651000],
      [448000, 4651000],
      [448000, 4650000],
    ];
    const p = await importOk(namedCrs('EPSG:4326', utm));
    expect(p.coordinates.kind).toBe('projected');
    expect(p.features).toEqual([]);
    expect(p.warnings.length).toBeGreaterThan(0);
  });

  it('a legacy crs Sowright cannot reproject: the user is asked, with a warning naming the code', async () => {
    const lambert = [
      [652000, 6862000],
      [653000, 6862000],
      [653000, 6863000],
      [652000, 6862000],
    ];
    const p = await importOk(namedCrs('urn:ogc:def:crs:EPSG::2154', lambert));
    expect(p.coordinates.kind).toBe('projected');
    expect(p.warnings.some((m) => m.includes('EPSG:2154'))).toBe(true);
  });

  it('empty geometries: a file of nothing but empties is refused; empties beside a polygon are skipped with a warning', async () => {
    await expectRefused(
      {
        type: 'FeatureCollection',
        features: [{ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [] } }],
      },
      /no polygons/,
    );
    const p = await importOk({
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: {}, geometry: { type: 'MultiPolygon', coordinates: [] } },
        { type: 'Feature', properties: {}, geometry: null },
        {
          type: 'Feature',
          properties: { keep: true },
          geometry: polygon(ring([0, 0], [1, 0], [1, 1], [0, 0])),
        },
      ],
    });
    expect(p.features.map((f) => f.index)).toEqual([2]);
    expect(p.warnings.length).toBeGreaterThan(0);
  });

  it('3D coordinates: imported in 2D', async () => {
    const p = await importOk(polygon(ring([0, 0], [2, 0], [2, 2], [0, 0]).map((pos) => [...pos, 312.5])));
    expect(p.features[0].geometry.coordinates.flat(2).every((pos) => pos.length === 2)).toBe(true);
  });

  it('antimeridian crossing: refused naming the feature', async () => {
    await expectRefused(
      polygon([
        [179.99, -16.5],
        [-179.99, -16.5],
        [-179.99, -16.49],
        [179.99, -16.49],
        [179.99, -16.5],
      ]),
      /180.*feature 1/,
    );
  });

  it('hole outside its shell: invalid, repaired', async () => {
    await expectInvalid(
      polygon(ring([0, 0], [2, 0], [2, 2], [0, 2], [0, 0]), ring([3, 3], [3, 4], [4, 4], [4, 3], [3, 3])),
      /Hole lies outside shell/i,
    );
  });

  it('nested holes and duplicate holes: invalid, repaired', async () => {
    const shell = ring([0, 0], [10, 0], [10, 10], [0, 10], [0, 0]);
    await expectInvalid(
      polygon(
        shell,
        ring([2, 2], [2, 8], [8, 8], [8, 2], [2, 2]),
        ring([4, 4], [4, 6], [6, 6], [6, 4], [4, 4]),
      ),
      /nested/i,
    );
    const hole = ring([2, 2], [2, 4], [4, 4], [4, 2], [2, 2]);
    await expectInvalid(polygon(shell, hole, hole), /Self-intersection|nested|disconnected/i);
  });

  it('overlapping multipolygon parts: invalid, repaired to their union', async () => {
    const a = ring([0, 0], [2, 0], [2, 2], [0, 2], [0, 0]);
    const b = ring([1, 0], [3, 0], [3, 2], [1, 2], [1, 0]);
    const f = await expectInvalid({ type: 'MultiPolygon', coordinates: [[a], [b]] }, /Self-intersection/i);
    const union = geodesicAreaM2({
      type: 'Polygon',
      coordinates: [ring([0, 0], [3, 0], [3, 2], [0, 2], [0, 0])],
    });
    expect(f.repair!.areaM2 / union).toBeCloseTo(1, 6);
  });

  it('valid cases are not refused: repeated points, and a hole touching the shell at one point', async () => {
    const repeated = await importOk(polygon(ring([0, 0], [2, 0], [2, 0], [2, 2], [0, 2], [0, 2], [0, 0])));
    expect(repeated.features[0].validity).toEqual({ valid: true, reason: null, location: null });
    const touching = await importOk(
      polygon(ring([0, 0], [4, 0], [4, 4], [0, 4], [0, 0]), ring([0, 2], [2, 3], [2, 1], [0, 2])),
    );
    expect(touching.features[0].validity.valid).toBe(true);
    expect(touching.features[0].repair).toBeNull();
  });
});

describe('property: the GeoJSON importer answers 201 or 4xx, never 500', () => {
  const coordinate = fc.oneof(
    fc.double({ min: -200, max: 200, noNaN: true }),
    fc.double(),
    fc.constant(null),
    fc.string({ maxLength: 4 }),
    fc.integer(),
    fc.constant(-93.6),
    fc.constant(42),
  );
  const position = fc.array(coordinate, { minLength: 0, maxLength: 4 });
  const junkPolygon = fc.record({
    type: fc.constantFrom('Polygon', 'MultiPolygon', 'GeometryCollection', 'Point', 'LineString', 'Nope'),
    coordinates: fc.array(fc.array(fc.array(position, { maxLength: 6 }), { maxLength: 3 }), { maxLength: 3 }),
  });

  it('arbitrary JSON', async () => {
    await fc.assert(
      fc.asyncProperty(fc.json({ maxDepth: 6 }), async (text) => {
        const res = await post(text);
        expect(res.status).toBeLessThan(500);
        expect([201, 400, 404, 409, 413, 422]).toContain(res.status);
      }),
      { numRuns: 30 },
    );
  });

  it('polygons with junk coordinates', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(junkPolygon, { minLength: 1, maxLength: 3 }),
        fc.boolean(),
        async (geoms, asCollection) => {
          const body = asCollection
            ? {
                type: 'FeatureCollection',
                features: geoms.map((geometry) => ({ type: 'Feature', properties: {}, geometry })),
              }
            : geoms[0];
          const res = await post(JSON.stringify(body));
          expect(res.status).toBeLessThan(500);
          if (res.status !== 201) expect(typeof res.body.error.message).toBe('string');
        },
      ),
      { numRuns: 40 },
    );
  });

  it('real squares near the field with a junk coordinate spliced in', async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: 4 }), coordinate, coordinate, async (i, x, y) => {
        const r: unknown[][] = square(-93.6, 42, 0.002);
        r[i] = [x, y];
        const res = await post(JSON.stringify(polygon(r as number[][])));
        expect(res.status).toBeLessThan(500);
      }),
      { numRuns: 30 },
    );
  });
});
