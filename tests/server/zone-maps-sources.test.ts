import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ZoneMap } from '../../server/db/models/zone-map.model';
import { zonesFromPointsInWorker } from '../../server/routes/zone-maps/zones-from-points.runner';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import {
  zonesFromPointsPreviewSchema,
  type ZoneMap as ZoneMapDto,
} from '../../shared/schemas/zone-map.schema';
import { startTestApp, type Caller, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { fixture, upload } from './imports-support';
import { S, SIDE, W, cell, expectMap, rel, tidy, totalZoneArea } from './zone-maps.helpers';

let t: TestApp;
let w: World;
let agro: Caller;
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'zone-sources');
  agro = w.callers.agronomist;
});
afterAll(() => t.close());

const AREA_TOLERANCE = 1e-4;

async function importOf(
  caller: Caller,
  purpose: string,
  name: string,
  bytes: Buffer | string,
  fieldId = w.a.field.id,
) {
  const res = await upload(caller, fieldId, purpose, name, bytes);
  expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(201);
  return res.body as { id: string; features: { index: number; properties: Record<string, unknown> }[] };
}

/** Name, class and productivity index of each zone, in order. */
const attributesOf = (map: ZoneMapDto) =>
  map.zones.features.map((f) => [f.properties.name, f.properties.classValue, f.properties.productivityIndex]);

const base = () => ({ fieldId: w.a.field.id, seasonId: w.a.season.id });

describe('zones from an imported file', () => {
  /** Three polygon zones; the third sticks out of the field to the east and overlaps the second. */
  const file = JSON.stringify({
    type: 'FeatureCollection',
    features: [
      {
        type: 'Feature',
        properties: { label: 'Zone süd – Bäche', cls: 1, pi: 0.8 },
        geometry: { type: 'Polygon', coordinates: [cell(0, 0, 0.5, 0.5)] },
      },
      {
        type: 'Feature',
        properties: { label: 'North', cls: '2', pi: '1,1' },
        geometry: { type: 'Polygon', coordinates: [cell(0, 0.5, 0.6, 1)] },
      },
      {
        type: 'Feature',
        properties: { label: '', cls: null, pi: 1.3 },
        geometry: { type: 'Polygon', coordinates: [cell(0.5, 0.5, 1.5, 1)] },
      },
    ],
  });

  it('clips to the boundary, names and classes from the chosen properties, reports the overlap, leaves the gap', async () => {
    const imp = await importOf(agro, 'zones', 'zones.geojson', file);
    const map = expectMap(
      await agro.post('/api/zone-maps/from-import', {
        ...base(),
        importId: imp.id,
        name: 'From the file',
        featureIndexes: [0, 1, 2],
        nameProperty: 'label',
        classProperty: 'cls',
        indexProperty: 'pi',
      }),
      201,
    );
    expect(map.source).toBe('imported');
    expect(attributesOf(map)).toEqual([
      ['Zone süd – Bäche', 1, 0.8],
      ['North', 2, 1.1],
      ['Zone 3', null, 1.3],
    ]);
    const east = map.zones.features[2];
    expect(Math.max(...east.geometry.coordinates.flat(2).map((p) => p[0]))).toBeLessThanOrEqual(
      W + SIDE + 1e-9,
    );
    // Half of the field's north half, clipped (derived).
    expect(rel(east.properties.areaM2, map.analysis.boundaryAreaM2 / 4)).toBeLessThan(1e-3);
    expect(map.analysis.overlaps).toHaveLength(1);
    // The south-east quarter is a gap: no default zone unless asked (derived: a quarter of the field).
    expect(map.zones.features.some((f) => f.properties.isDefault)).toBe(false);
    expect(rel(map.analysis.gapAreaM2, map.analysis.boundaryAreaM2 / 4)).toBeLessThan(1e-3);
  });

  it('fills the gaps with a default zone when asked; after resolving the overlap the areas add up', async () => {
    const imp = await importOf(agro, 'zones', 'zones-2.geojson', file);
    let map = expectMap(
      await agro.post('/api/zone-maps/from-import', {
        ...base(),
        importId: imp.id,
        name: 'Filled',
        featureIndexes: [0, 1, 2],
        nameProperty: null,
        classProperty: null,
        indexProperty: null,
        fillGaps: true,
      }),
      201,
    );
    expect(map.zones.features.map((f) => f.properties.name)).toEqual([
      'Zone 1',
      'Zone 2',
      'Zone 3',
      expect.any(String),
    ]);
    expect(map.zones.features[3].properties.isDefault).toBe(true);
    expect(map.analysis.overlaps).toHaveLength(1);
    map = await tidy(agro, map);
    expect(map.analysis.overlaps).toEqual([]);
    expect(rel(totalZoneArea(map), map.analysis.boundaryAreaM2)).toBeLessThan(AREA_TOLERANCE);
  });

  it('names the feature and property of a class that is not a class, and saves nothing', async () => {
    const bad = JSON.stringify({
      type: 'FeatureCollection',
      features: [
        {
          type: 'Feature',
          properties: { cls: 'high' },
          geometry: { type: 'Polygon', coordinates: [cell(0, 0, 1, 1)] },
        },
      ],
    });
    const imp = await importOf(agro, 'zones', 'bad-class.geojson', bad);
    const before = await ZoneMap.count({ where: { workspaceId: w.ws.id } });
    const res = await agro.post('/api/zone-maps/from-import', {
      ...base(),
      importId: imp.id,
      name: 'Bad class',
      featureIndexes: [0],
      nameProperty: null,
      classProperty: 'cls',
      indexProperty: null,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toEqual(['cls']);
    expect(res.body.error.message).toContain('Feature 1');
    expect(await ZoneMap.count({ where: { workspaceId: w.ws.id } })).toBe(before);
  });

  it('refuses a feature outside the boundary and a feature index the file does not have', async () => {
    const far = JSON.stringify({
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [cell(0, 0, 1, 1)] } },
        { type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [cell(3, 3, 4, 4)] } },
      ],
    });
    const imp = await importOf(agro, 'zones', 'far.geojson', far);
    const body = {
      ...base(),
      importId: imp.id,
      name: 'Far',
      nameProperty: null,
      classProperty: null,
      indexProperty: null,
    };
    const outside = await agro.post('/api/zone-maps/from-import', { ...body, featureIndexes: [0, 1] });
    expect(outside.status).toBe(422);
    expect(outside.body.error.message).toContain('Feature 2');
    const missing = await agro.post('/api/zone-maps/from-import', { ...body, featureIndexes: [0, 7] });
    expect(missing.status).toBe(400);
    expect(missing.body.error.details[0].path).toEqual(['featureIndexes', 1]);
  });

  it('keeps the fixture file’s names and classes (zones-crs84.geojson, polygons only)', async () => {
    const imp = await importOf(agro, 'zones', 'zones-crs84.geojson', fixture('zones-crs84.geojson'));
    const map = expectMap(
      await agro.post('/api/zone-maps/from-import', {
        ...base(),
        importId: imp.id,
        name: 'Fixture',
        featureIndexes: imp.features.map((f) => f.index),
        nameProperty: 'zone',
        classProperty: 'class',
        indexProperty: 'index',
      }),
      201,
    );
    expect(attributesOf(map)).toEqual([
      ['Low ridge', 1, 0.82],
      ['Bottom', 2, 1.14],
    ]);
  });

  it("answers 404 for another workspace's import", async () => {
    const other = await makeWorld(t.app, 'zone-sources-other');
    const imp = await importOf(other.callers.agronomist, 'zones', 'theirs.geojson', file, other.a.field.id);
    const res = await agro.post('/api/zone-maps/from-import', {
      ...base(),
      importId: imp.id,
      name: 'Theirs',
      featureIndexes: [0],
      nameProperty: null,
      classProperty: null,
      indexProperty: null,
    });
    expect(res.status).toBe(404);
  });
});

describe('zones from data', () => {
  /** A 12 × 12 grid of samples over the field whose value rises from west to east (invented). */
  const csv = (() => {
    const lines = ['lon,lat,yield_t_ha'];
    for (let i = 0; i < 12; i++) {
      for (let j = 0; j < 12; j++) {
        const lon = W + ((i + 0.5) / 12) * SIDE;
        const lat = S + ((j + 0.5) / 12) * SIDE;
        lines.push(`${lon.toFixed(7)},${lat.toFixed(7)},${(8 + i * 0.5).toFixed(2)}`);
      }
    }
    return lines.join('\n');
  })();
  const choices = {
    attribute: 'yield_t_ha',
    method: 'quantile',
    classes: 3,
    cellSizeM: 20,
    power: 2,
    minAreaM2: 500,
  };

  it('previews zones with breaks and a histogram, and creates the map with class and mean value per zone', async () => {
    const imp = await importOf(agro, 'points', 'yield.csv', csv);
    const before = await ZoneMap.count({ where: { workspaceId: w.ws.id } });
    const preview = await agro.post('/api/zone-maps/from-points/preview', {
      ...base(),
      importId: imp.id,
      ...choices,
    });
    expect(preview.status, JSON.stringify(preview.body).slice(0, 300)).toBe(200);
    const p = zonesFromPointsPreviewSchema.parse(preview.body);
    expect(p.breaks).toHaveLength(2);
    expect(p.zones.map((z) => z.classIndex)).toEqual([0, 1, 2]);
    expect(p.histogram.length).toBeGreaterThan(1);
    for (let i = 1; i < p.histogram.length; i++)
      expect(p.histogram[i].from).toBeCloseTo(p.histogram[i - 1].to, 9);
    // Values of 8 … 13.5 t/ha (derived from the samples above); the interpolated cells lie within them.
    expect(p.histogram[0].from).toBeGreaterThanOrEqual(8);
    expect(p.histogram[p.histogram.length - 1].to).toBeLessThanOrEqual(13.5);
    // A preview saves nothing.
    expect(await ZoneMap.count({ where: { workspaceId: w.ws.id } })).toBe(before);

    let map = expectMap(
      await agro.post('/api/zone-maps/from-points', {
        ...base(),
        importId: imp.id,
        name: 'Yield zones',
        ...choices,
      }),
      201,
    );
    expect(map.source).toBe('from-data');
    expect(map.sourceNote).toContain('yield_t_ha');
    const zones = map.zones.features;
    expect(zones.map((z) => z.properties.classValue)).toEqual([1, 2, 3]);
    const means = zones.map((z) => z.properties.meanValue!);
    expect(means[0]).toBeLessThan(means[1]);
    expect(means[1]).toBeLessThan(means[2]);
    for (const z of zones) expect(rel(z.properties.areaM2, geodesicAreaM2(z.geometry))).toBeLessThan(1e-6);
    // West to east: the lowest class lies furthest west (the values rise eastward).
    const west = (z: (typeof zones)[number]) => Math.min(...z.geometry.coordinates.flat(2).map((c) => c[0]));
    expect(west(zones[0])).toBeLessThan(west(zones[2]));

    map = expectMap(await agro.post(`/api/zone-maps/${map.id}/fill-gaps`, { version: map.version }));
    expect(map.analysis.overlaps).toEqual([]);
    expect(rel(totalZoneArea(map), map.analysis.boundaryAreaM2)).toBeLessThan(AREA_TOLERANCE);
  });

  it('refuses an attribute that is not numeric, naming it; a farmer may not make zones from data (403)', async () => {
    const imp = await importOf(agro, 'points', 'yield-2.csv', csv);
    const res = await agro.post('/api/zone-maps/from-points/preview', {
      ...base(),
      importId: imp.id,
      ...choices,
      attribute: 'nothing',
    });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toEqual(['attribute']);
    const farmer = await w.callers.farmer.post('/api/zone-maps/from-points', {
      ...base(),
      importId: imp.id,
      name: 'No',
      ...choices,
    });
    expect(farmer.status).toBe(403);
  });

  it('refuses, rather than hangs, when making zones runs past its time limit', async () => {
    const points = Array.from({ length: 50 }, (_, i) => ({
      lon: W + (i / 50) * SIDE,
      lat: S + SIDE / 2,
      value: i,
    }));
    const boundary = { type: 'MultiPolygon' as const, coordinates: [[cell(0, 0, 1, 1)]] };
    const options = { classes: 3, method: 'quantile' as const, cellSizeM: 5, minAreaM2: 0 };
    await expect(
      zonesFromPointsInWorker(points, boundary, options, { timeoutMs: 1, maxOldGenerationSizeMb: 256 }),
    ).rejects.toMatchObject({
      code: 'validation_failed',
      details: [{ path: ['cellSizeM'] }],
    });
    // The same job within the usual limits succeeds (so the refusal above was the limit's doing).
    const result = await zonesFromPointsInWorker(points, boundary, options);
    expect(result.zones.length).toBeGreaterThan(0);
  });
});
