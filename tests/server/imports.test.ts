import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createHash } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { importPreviewSchema, type ImportPreview } from '../../shared/schemas/import.schema';
import { fieldSchema } from '../../shared/schemas/field.schema';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { loadImportFeatures, loadImportPoints } from '../../server/routes/imports/import.service';
import type { Actor } from '../../server/types';
import { startTestApp, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { collection, fixture, shapefileOf, square, upload, zipOf, zipShapefile } from './imports-support';

let t: TestApp;
let w: World;
/** A field near 45° N, 93° W (UTM zone 15), for the projected shapefile cases. */
let field45: { id: string; version: number };
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'imports');
  const res = await w.callers.agronomist.post('/api/fields', {
    farmId: w.a.farm.id,
    name: 'Forty-five north',
    boundary: { type: 'Polygon', coordinates: [square(-93.01, 44.99, 0.03)] },
  });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  field45 = res.body;
});
afterAll(() => t.close());

const actorOf = (w: World, role: 'admin' | 'agronomist' = 'agronomist'): Actor => ({
  userId: w.people[role].id,
  workspaceId: w.ws.id,
  role,
  growerScope: null,
});

function preview(res: { status: number; body: unknown }, status = 201): ImportPreview {
  expect(res.status, JSON.stringify(res.body).slice(0, 600)).toBe(status);
  return importPreviewSchema.parse(res.body);
}

/**
 * DOMAIN.md §2: the ½-mile square at 45° N spans 0.0102062° of longitude and 0.0072407° of latitude and
 * encloses 647 500.456 m² on WGS84; translated to 93° W it encloses the same (the ellipsoid is symmetric
 * about its axis: derived).
 */
const SQUARE_45 = {
  ring: [
    [-93, 45],
    [-92.9897938, 45],
    [-92.9897938, 45.0072407],
    [-93, 45.0072407],
    [-93, 45],
  ],
  areaM2: 647_500.456,
};
const square45 = {
  type: 'FeatureCollection',
  features: [
    {
      type: 'Feature',
      properties: { name: 'Square' },
      geometry: { type: 'Polygon', coordinates: [SQUARE_45.ring] },
    },
  ],
};

const fieldA = () => w.a.field.id;
const agro = () => w.callers.agronomist;

describe('GeoJSON', () => {
  it('reads a FeatureCollection with a legacy CRS84 crs: polygons kept, the point dropped with a warning, altitude dropped', async () => {
    const p = preview(
      await upload(agro(), fieldA(), 'zones', 'zones.geojson', fixture('zones-crs84.geojson')),
    );
    expect(p.format).toBe('geojson');
    expect(p.coordinates.kind).toBe('geographic');
    expect(p.features.map((f) => f.properties.zone)).toEqual(['Low ridge', 'Bottom']);
    expect(p.features.every((f) => f.validity.valid && f.repair === null)).toBe(true);
    expect(p.features[1].geometry.coordinates[0][0].every((pos) => pos.length === 2)).toBe(true);
    expect(p.warnings.length).toBeGreaterThan(0);
    // PostGIS's ellipsoidal area and GeographicLib's agree (both Karney 2013).
    for (const f of p.features) expect(f.areaM2).toBeCloseTo(geodesicAreaM2(f.geometry), 2);
  });

  it('reads a bare geometry, a Feature and a GeometryCollection', async () => {
    const poly = { type: 'Polygon', coordinates: [square(-93.6, 42, 0.003)] };
    for (const body of [
      poly,
      { type: 'Feature', properties: null, geometry: poly },
      { type: 'GeometryCollection', geometries: [poly, { type: 'Point', coordinates: [-93.6, 42] }] },
    ]) {
      const p = preview(await upload(agro(), fieldA(), 'boundary', 'b.json', JSON.stringify(body)));
      expect(p.features).toHaveLength(1);
      expect(p.features[0].geometry.type).toBe('MultiPolygon');
    }
  });

  it('reprojects a legacy crs naming a UTM zone with proj4', async () => {
    // The same square in UTM 15N metres as GeoJSON with a legacy crs member (written by ogr2ogr).
    const utm = ogrGeoJson(square45, 'EPSG:32615');
    const p = preview(await upload(agro(), field45.id, 'boundary', 'utm.geojson', utm));
    expect(p.coordinates.kind).toBe('geographic');
    expect(Math.abs(p.features[0].areaM2 / SQUARE_45.areaM2 - 1)).toBeLessThan(1e-4);
  });
});

/** The GeoJSON ogr2ogr writes for `geojson` reprojected to `srs` (it carries a legacy crs member). */
function ogrGeoJson(geojson: object, srs: string): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'sowright-gj-'));
  try {
    writeFileSync(path.join(dir, 'in.geojson'), JSON.stringify(geojson));
    execFileSync(
      'ogr2ogr',
      [
        '-f',
        'GeoJSON',
        '-t_srs',
        srs,
        '-lco',
        'RFC7946=NO',
        path.join(dir, 'out.geojson'),
        path.join(dir, 'in.geojson'),
      ],
      { stdio: 'pipe' },
    );
    const text = readFileSync(path.join(dir, 'out.geojson'), 'utf8');
    expect(text).toContain('32615');
    return text;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

describe('shapefile', () => {
  it('honours a projected .prj: the UTM square imports to its ellipsoidal area within 0.01 %', async () => {
    const zip = await zipShapefile(shapefileOf(square45, { tSrs: 'EPSG:32615' }));
    const p = preview(await upload(agro(), field45.id, 'boundary', 'square-utm.zip', zip));
    expect(p.format).toBe('shapefile');
    expect(p.coordinates.kind).toBe('geographic');
    expect(p.features).toHaveLength(1);
    expect(p.features[0].properties.name).toBe('Square');
    expect(Math.abs(p.features[0].areaM2 / SQUARE_45.areaM2 - 1)).toBeLessThan(1e-4);
  });

  it('without its .prj answers projected with the right UTM zone, and choosing it gives the same area', async () => {
    const zip = await zipShapefile(shapefileOf(square45, { tSrs: 'EPSG:32615' }), 'shapes', ['prj']);
    const p = preview(await upload(agro(), field45.id, 'boundary', 'square-noprj.zip', zip));
    expect(p.coordinates.kind).toBe('projected');
    expect(p.features).toEqual([]);
    if (p.coordinates.kind !== 'projected') return;
    expect(p.coordinates.candidates[0].code).toBe('EPSG:32615');
    // Zones 14 and 16 would put the data hundreds of kilometres away: not offered.
    expect(p.coordinates.candidates.map((c) => c.code)).not.toContain('EPSG:32614');
    const chosen = preview(
      await agro().post(`/api/imports/${p.id}/coordinates`, { code: 'EPSG:32615' }),
      200,
    );
    expect(chosen.coordinates.kind).toBe('geographic');
    expect(Math.abs(chosen.features[0].areaM2 / SQUARE_45.areaM2 - 1)).toBeLessThan(1e-4);
    // The choice is kept: reading the import again gives the same.
    const again = preview(await agro().get(`/api/imports/${p.id}`), 200);
    expect(again.features[0].areaM2).toBeCloseTo(chosen.features[0].areaM2, 6);
    const loaded = await loadImportFeatures(actorOf(w), p.id);
    expect(geodesicAreaM2(loaded[0].geometry) / SQUARE_45.areaM2).toBeCloseTo(1, 4);
  });

  it('refuses a code Sowright cannot reproject from, and a choice for a file whose system is known', async () => {
    const zip = await zipShapefile(shapefileOf(square45, { tSrs: 'EPSG:32615' }), 'shapes', ['prj']);
    const p = preview(await upload(agro(), field45.id, 'boundary', 'square-noprj-2.zip', zip));
    const unknown = await agro().post(`/api/imports/${p.id}/coordinates`, { code: 'EPSG:99999' });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error.code).toBe('unknown_crs');
    const known = preview(
      await upload(agro(), fieldA(), 'zones', 'zones.geojson', fixture('zones-crs84.geojson')),
    );
    const res = await agro().post(`/api/imports/${known.id}/coordinates`, { code: 'EPSG:32615' });
    expect(res.status).toBe(409);
  });

  it('a .prj that cannot be read is reported, and the data is not guessed', async () => {
    const parts = shapefileOf(square45, { tSrs: 'EPSG:32615' });
    parts.set('prj', Buffer.from('PROJCS["nonsense",GARBAGE'));
    const p = preview(await upload(agro(), field45.id, 'boundary', 'badprj.zip', await zipShapefile(parts)));
    expect(p.coordinates.kind).toBe('projected');
    expect(p.warnings.some((m) => m.includes('.prj'))).toBe(true);
  });

  it('lists several layers of one zip, naming each feature’s layer', async () => {
    const a = shapefileOf(collection([square(-93.6, 42, 0.002)]), { layer: 'north' });
    const b = shapefileOf(collection([square(-93.597, 42, 0.002)], [square(-93.594, 42, 0.002)]), {
      layer: 'south',
    });
    const zip = await zipOf([
      ...[...a].map(([e, d]) => ({ name: `north.${e}`, data: d })),
      ...[...b].map(([e, d]) => ({ name: `south.${e}`, data: d })),
    ]);
    const p = preview(await upload(agro(), fieldA(), 'zones', 'two-layers.zip', zip));
    expect(p.layers.map((l) => [l.name, l.featureCount, l.geometryType]).sort()).toEqual([
      ['north', 1, 'Polygon'],
      ['south', 2, 'Polygon'],
    ]);
    expect(p.features.map((f) => f.layer).sort()).toEqual(['north', 'south', 'south']);
    expect(new Set(p.features.map((f) => f.index)).size).toBe(3);
  });

  it('refuses a .dbf whose record count differs from the .shp, naming both counts', async () => {
    const one = shapefileOf(collection([square(-93.6, 42, 0.002)]));
    const two = shapefileOf(collection([square(-93.6, 42, 0.002)], [square(-93.597, 42, 0.002)]));
    one.set('dbf', two.get('dbf')!);
    const res = await upload(agro(), fieldA(), 'zones', 'mismatch.zip', await zipShapefile(one));
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/\b2\b.*\b1\b/);
  });

  it('refuses a .shp cut short (the .shx lists more shapes than it holds)', async () => {
    const parts = shapefileOf(collection([square(-93.6, 42, 0.002)], [square(-93.597, 42, 0.002)]));
    const shp = parts.get('shp')!;
    parts.set('shp', shp.subarray(0, shp.length - 20));
    const res = await upload(agro(), fieldA(), 'zones', 'cut.zip', await zipShapefile(parts));
    expect(res.status).toBe(422);
  });

  it('refuses parts whose magic bytes are not a shapefile’s', async () => {
    const parts = shapefileOf(collection([square(-93.6, 42, 0.002)]));
    parts.set('shp', Buffer.concat([Buffer.from('not a shapefile'), Buffer.alloc(200)]));
    const res = await upload(agro(), fieldA(), 'zones', 'fake.zip', await zipShapefile(parts));
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('unreadable_file');
  });

  it('reads shapefile points for a data layer', async () => {
    const pts = {
      type: 'FeatureCollection',
      features: [1, 2, 3].map((i) => ({
        type: 'Feature',
        properties: { yield_t: 9 + i, id: `p${i}` },
        geometry: { type: 'Point', coordinates: [-93.6 + i * 0.001, 42.001] },
      })),
    };
    const p = preview(
      await upload(agro(), fieldA(), 'points', 'yield.zip', await zipShapefile(shapefileOf(pts))),
    );
    expect(p.pointCount).toBe(3);
    expect(p.numericProperties).toEqual([{ name: 'yield_t', min: 10, max: 12, count: 3 }]);
  });
});

describe('KML and KMZ', () => {
  it('turns a MultiGeometry into one MultiPolygon (holes kept, altitude and the point dropped)', async () => {
    const p = preview(
      await upload(agro(), fieldA(), 'boundary', 'fields.kml', fixture('boundary-multigeometry.kml')),
    );
    expect(p.format).toBe('kml');
    expect(p.features).toHaveLength(1);
    const g = p.features[0].geometry;
    expect(g.coordinates).toHaveLength(2);
    expect(g.coordinates[0]).toHaveLength(2);
    expect(g.coordinates.flat(2).every((pos) => pos.length === 2)).toBe(true);
    expect(p.features[0].validity.valid).toBe(true);
  });

  it('reports the line of malformed XML', async () => {
    const res = await upload(agro(), fieldA(), 'boundary', 'broken.kml', fixture('malformed-line-5.kml'));
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/line 5\b/);
  });

  it('reads a KMZ holding one root KML', async () => {
    const kmz = await zipOf([
      { name: 'doc.kml', data: fixture('boundary-multigeometry.kml') },
      { name: 'files/legend.png', data: Buffer.from([0x89, 0x50, 0x4e, 0x47]) },
    ]);
    const p = preview(await upload(agro(), fieldA(), 'boundary', 'fields.kmz', kmz));
    expect(p.format).toBe('kmz');
    expect(p.features).toHaveLength(1);
  });

  it('refuses a KMZ with two root KML documents', async () => {
    const kml = fixture('boundary-multigeometry.kml');
    const res = await upload(
      agro(),
      fieldA(),
      'boundary',
      'two.kmz',
      await zipOf([
        { name: 'a.kml', data: kml },
        { name: 'b.kml', data: kml },
      ]),
    );
    expect(res.status).toBe(422);
  });
});

describe('points', () => {
  it('reads a CSV with lon/lat columns: point count and numeric attributes with their ranges', async () => {
    const p = preview(await upload(agro(), fieldA(), 'points', 'soil.csv', fixture('soil-samples.csv')));
    expect(p.format).toBe('csv');
    // S5 has no longitude: skipped with a warning.
    expect(p.pointCount).toBe(4);
    expect(p.warnings.some((m) => /row 6/.test(m))).toBe(true);
    expect(p.numericProperties).toEqual([
      { name: 'organic_matter', min: 2.8, max: 3.4, count: 3 },
      { name: 'ec_ms_m', min: 22.5, max: 30.5, count: 3 },
    ]);
    const pts = await loadImportPoints(actorOf(w), p.id, 'organic_matter');
    expect(pts).toEqual([
      { lon: -93.5995, lat: 42.0005, value: 3.1 },
      { lon: -93.5985, lat: 42.0005, value: 3.4 },
      { lon: -93.5975, lat: 42.0015, value: 2.8 },
    ]);
    await expect(loadImportPoints(actorOf(w), p.id, 'texture')).rejects.toMatchObject({
      code: 'validation_failed',
    });
  });

  it('detects x/y and long/lat headers', async () => {
    for (const [lon, lat] of [
      ['x', 'y'],
      ['long', 'lat'],
      ['LON', 'LATITUDE'],
    ]) {
      const p = preview(
        await upload(
          agro(),
          fieldA(),
          'points',
          'p.csv',
          `${lon},${lat},ec\n-93.6,42.001,10\n-93.599,42.001,12\n`,
        ),
      );
      expect(p.pointCount).toBe(2);
    }
  });

  it('refuses duplicate headers, unterminated quotes and over-long lines, naming the line', async () => {
    const dup = await upload(agro(), fieldA(), 'points', 'dup.csv', 'lon,lat,ec,EC\n-93.6,42,1,2\n');
    expect(dup.status).toBe(422);
    expect(dup.body.error.message).toMatch(/Line 1/);
    const quote = await upload(
      agro(),
      fieldA(),
      'points',
      'quote.csv',
      'lon,lat,note\n-93.6,42,ok\n-93.6,42,"open\n-93.6,42,x\n',
    );
    expect(quote.status).toBe(422);
    expect(quote.body.error.message).toMatch(/Line 3/);
    const long = await upload(
      agro(),
      fieldA(),
      'points',
      'long.csv',
      `lon,lat,note\n-93.6,42,ok\n-93.6,42,${'x'.repeat(20_000)}\n`,
    );
    expect(long.status).toBe(422);
    expect(long.body.error.message).toMatch(/Line 3/);
  });

  it('a CSV of UTM metres is answered as projected; choosing the zone gives the points in degrees', async () => {
    // 93° W, 45° N is the central meridian of UTM 15N: easting 500 000 m, northing about 4 983 000 m (derived).
    const csv = 'x,y,om\n500000,4983000,3.1\n500100,4983000,3.3\n500100,4983100,2.9\n';
    const p = preview(await upload(agro(), field45.id, 'points', 'utm.csv', csv));
    expect(p.coordinates.kind).toBe('projected');
    expect(p.pointCount).toBe(3);
    const chosen = preview(
      await agro().post(`/api/imports/${p.id}/coordinates`, { code: 'EPSG:32615' }),
      200,
    );
    expect(chosen.coordinates.kind).toBe('geographic');
    const pts = await loadImportPoints(actorOf(w), p.id, 'om');
    expect(pts).toHaveLength(3);
    expect(pts[0].lon).toBeCloseTo(-93, 6);
    expect(pts[0].lat).toBeGreaterThan(44.98);
    expect(pts[0].lat).toBeLessThan(45.02);
  });

  it('reads GeoJSON points (MultiPoint too)', async () => {
    const gj = {
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: { om: 3 }, geometry: { type: 'Point', coordinates: [-93.6, 42.001] } },
        {
          type: 'Feature',
          properties: { om: 4 },
          geometry: {
            type: 'MultiPoint',
            coordinates: [
              [-93.599, 42.001],
              [-93.598, 42.001],
            ],
          },
        },
      ],
    };
    const p = preview(await upload(agro(), fieldA(), 'points', 'om.geojson', JSON.stringify(gj)));
    expect(p.pointCount).toBe(3);
    expect(p.numericProperties).toEqual([{ name: 'om', min: 3, max: 4, count: 3 }]);
  });

  it('refuses a CSV for polygons and polygons for points', async () => {
    expect((await upload(agro(), fieldA(), 'zones', 'soil.csv', fixture('soil-samples.csv'))).status).toBe(
      422,
    );
    const polygonsOnly = JSON.stringify({ type: 'Polygon', coordinates: [square(-93.6, 42, 0.002)] });
    expect((await upload(agro(), fieldA(), 'points', 'zones.geojson', polygonsOnly)).status).toBe(422);
  });
});

describe('uploads', () => {
  const countUploads = async (fieldId: string) =>
    (
      await t.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM uploads WHERE field_id = $1', {
        bind: [fieldId],
        type: QueryTypes.SELECT,
      })
    )[0].n;

  it('keeps the original byte for byte; the same file twice for the same field and purpose is one upload', async () => {
    // A file of its own for this run (a unique member), so earlier runs' uploads do not count.
    const bytes = Buffer.from(
      JSON.stringify({ ...JSON.parse(fixture('zones-crs84.geojson').toString()), name: `run ${Date.now()}` }),
    );
    const fieldId = w.b.field.id;
    const before = await countUploads(fieldId);
    const first = preview(await upload(agro(), fieldId, 'zones', 'keep.geojson', bytes));
    const second = preview(await upload(w.callers.admin, fieldId, 'zones', 'renamed.geojson', bytes));
    expect(second.id).not.toBe(first.id);
    expect(await countUploads(fieldId)).toBe(before + 1);
    const [row] = await t.sequelize.query<{
      content: Buffer;
      sha256: string;
      original_name: string;
      size_bytes: number;
    }>(
      'SELECT u.content, u.sha256, u.original_name, u.size_bytes FROM uploads u JOIN imports i ON i.upload_id = u.id WHERE i.id = $1',
      { bind: [first.id], type: QueryTypes.SELECT },
    );
    expect(Buffer.compare(row.content, bytes)).toBe(0);
    expect(row.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
    expect(row.original_name).toBe('keep.geojson');
    expect(row.size_bytes).toBe(bytes.length);
    // Another purpose is another upload.
    preview(await upload(agro(), fieldId, 'boundary', 'keep.geojson', bytes));
    expect(await countUploads(fieldId)).toBe(before + 2);
  });

  it('answers 413 for a file over the limit, storing nothing', async () => {
    const before = await countUploads(fieldA());
    const res = await upload(agro(), fieldA(), 'zones', 'big.geojson', Buffer.alloc(31 * 1024 * 1024, 32));
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('too_large');
    expect(await countUploads(fieldA())).toBe(before);
  });

  it('refuses a missing file, a bad purpose and an unknown field', async () => {
    const none = await agro().post('/api/imports', { purpose: 'zones', fieldId: fieldA() });
    expect(none.status).toBe(400);
    expect(
      (await upload(agro(), fieldA(), 'seeds', 'z.geojson', fixture('zones-crs84.geojson'))).status,
    ).toBe(400);
    expect(
      (
        await upload(
          agro(),
          '00000000-0000-4000-8000-000000000000',
          'zones',
          'z.geojson',
          fixture('zones-crs84.geojson'),
        )
      ).status,
    ).toBe(404);
  });

  it('lets admin and agronomist import; farmer and consultant may not', async () => {
    for (const role of ['farmer', 'consultant'] as const) {
      const res = await upload(
        w.callers[role],
        fieldA(),
        'zones',
        'z.geojson',
        fixture('zones-crs84.geojson'),
      );
      expect(res.status).toBe(403);
    }
    preview(await upload(w.callers.admin, fieldA(), 'zones', 'z.geojson', fixture('zones-crs84.geojson')));
  });

  it('hides another workspace’s import and field (404), in the routes and in the exported loaders', async () => {
    const other = await makeWorld(t.app, 'imports-other');
    const p = preview(
      await upload(
        other.callers.agronomist,
        other.a.field.id,
        'zones',
        'z.geojson',
        fixture('zones-crs84.geojson'),
      ),
    );
    expect((await agro().get(`/api/imports/${p.id}`)).status).toBe(404);
    expect((await agro().post(`/api/imports/${p.id}/coordinates`, { code: 'EPSG:32615' })).status).toBe(404);
    expect(
      (await upload(agro(), other.a.field.id, 'zones', 'z.geojson', fixture('zones-crs84.geojson'))).status,
    ).toBe(404);
    await expect(loadImportFeatures(actorOf(w), p.id)).rejects.toMatchObject({ code: 'not_found' });
    await expect(loadImportPoints(actorOf(w), p.id, 'class')).rejects.toMatchObject({ code: 'not_found' });
    const own = await loadImportFeatures(actorOf(other), p.id);
    expect(own.map((f) => f.properties.zone)).toEqual(['Low ridge', 'Bottom']);
  });

  it('the field answer after a boundary from an import has the fields shape', async () => {
    const p = preview(
      await upload(
        agro(),
        w.b.field.id,
        'boundary',
        'b.geojson',
        JSON.stringify({ type: 'Polygon', coordinates: [square(-93.6, 42, 0.004)] }),
      ),
    );
    const field = (await agro().get(`/api/fields/${w.b.field.id}`)).body;
    const res = await agro().put(`/api/fields/${w.b.field.id}/boundary`, {
      importId: p.id,
      featureIndexes: [0],
      repair: false,
      version: field.version,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    fieldSchema.parse(res.body);
    expect(res.body.areaM2).toBeCloseTo(p.features[0].areaM2, 3);
  });
});
