import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { insertZone } from '../../server/routes/zone-maps/zone-store';
import { CropSeason, Field } from '../../server/db/associations';
import { Zone } from '../../server/db/models/zone.model';
import { ZoneMap } from '../../server/db/models/zone-map.model';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { zoneMapListSchema } from '../../shared/schemas/zone-map.schema';
import { startTestApp, type Caller, type TestApp } from '../helpers/app';
import { makeWorld, squareBoundary, type World } from '../helpers/factory';
import {
  addZone,
  cell,
  createMap,
  del,
  expectMap,
  getBytes,
  multi,
  polygon,
  rel,
  S,
  SIDE,
  W,
  tidy,
  totalZoneArea,
  verticalLine,
  zoneNamed,
} from './zone-maps.helpers';

let t: TestApp;
let w: World;
let agro: Caller;
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'zone-maps');
  agro = w.callers.agronomist;
});
afterAll(() => t.close());

/** 0.01 % (issue 3, "Areas"): zone areas add up to the boundary's. */
const AREA_TOLERANCE = 1e-4;

describe('zone map life cycle', () => {
  it('creates a map with one default zone covering the boundary, on the ellipsoid', async () => {
    const map = await createMap(agro, w, 'Life cycle');
    expect(map).toMatchObject({
      fieldId: w.a.field.id,
      seasonId: w.a.season.id,
      versionNo: expect.any(Number),
      source: 'drawn',
      version: 0,
    });
    expect(map.zones.features).toHaveLength(1);
    const zone = map.zones.features[0];
    expect(zone.properties.isDefault).toBe(true);
    // PostGIS ST_Area(geography) and GeographicLib use the same algorithm (DOMAIN.md §2).
    const expected = geodesicAreaM2(squareBoundary());
    expect(rel(zone.properties.areaM2, expected)).toBeLessThan(1e-9);
    expect(rel(map.analysis.boundaryAreaM2, expected)).toBeLessThan(1e-9);
    expect(map.analysis).toMatchObject({ overlaps: [], zonesAreaM2: zone.properties.areaM2 });
    expect(map.analysis.gapAreaM2).toBeLessThan(0.01);

    const rows = await Zone.findAll({ where: { zoneMapId: map.id } });
    expect(rows.map((r) => r.id)).toEqual([zone.properties.id]);

    const read = expectMap(await agro.get(`/api/zone-maps/${map.id}`));
    expect(read).toEqual(map);
    const list = zoneMapListSchema.parse((await agro.get(`/api/zone-maps?fieldId=${w.a.field.id}`)).body);
    expect(list.items.find((i) => i.id === map.id)).toMatchObject({ name: 'Life cycle', zoneCount: 1 });
  });

  it('numbers versions per field and season; a new version copies the zones and leaves the old one alone', async () => {
    const first = await createMap(agro, w, 'Versions');
    const edited = await addZone(agro, first, 'West strip', polygon(cell(0, 0, 0.25, 1)), { classValue: 3 });
    const second = expectMap(await agro.post(`/api/zone-maps/${first.id}/new-version`, {}), 201);
    expect(second.id).not.toBe(first.id);
    expect(second.versionNo).toBe(first.versionNo + 1);
    expect(second.name).toBe('Versions');
    const strip = (m: typeof second) =>
      m.zones.features.map((f) => ({
        name: f.properties.name,
        classValue: f.properties.classValue,
        areaM2: f.properties.areaM2,
        geometry: f.geometry,
      }));
    expect(strip(second)).toEqual(strip(edited));
    const ids = new Set(edited.zones.features.map((f) => f.properties.id));
    expect(second.zones.features.every((f) => !ids.has(f.properties.id))).toBe(true);

    const renamed = expectMap(
      await agro.post(`/api/zone-maps/${second.id}/new-version`, { name: 'Versions, wetter spring' }),
      201,
    );
    expect(renamed.versionNo).toBe(first.versionNo + 2);
    await addZone(agro, second, 'East strip', polygon(cell(0.75, 0, 1, 1)));
    expect(expectMap(await agro.get(`/api/zone-maps/${first.id}`))).toEqual(edited);
  });

  it('refuses a field without a boundary (409, naming the field) and a season of another field (400)', async () => {
    const bare = await Field.create({
      workspaceId: w.ws.id,
      growerId: w.a.grower.id,
      farmId: w.a.farm.id,
      name: 'No boundary yet',
      notes: null,
      boundary: null,
    });
    const season = await CropSeason.create({
      workspaceId: w.ws.id,
      growerId: w.a.grower.id,
      fieldId: bare.id,
      year: 2027,
      crop: 'soybean',
      plannedPlantingDate: null,
      notes: null,
    });
    const before = await ZoneMap.count({ where: { fieldId: bare.id } });
    const res = await agro.post('/api/zone-maps', {
      fieldId: bare.id,
      seasonId: season.id,
      name: 'Nothing to zone',
    });
    expect(res.status).toBe(409);
    expect(res.body.error.details[0].path).toEqual(['fieldId']);
    expect(res.body.error.message).toContain('No boundary yet');

    const mixed = await agro.post('/api/zone-maps', {
      fieldId: w.a.field.id,
      seasonId: season.id,
      name: 'Mixed',
    });
    expect(mixed.status).toBe(400);
    expect(mixed.body.error.details[0].path).toEqual(['seasonId']);
    expect(await ZoneMap.count({ where: { fieldId: bare.id } })).toBe(before);
  });
});

describe('archiving', () => {
  it('hides an archived map from the default list, refuses edits to it (409), and restores it', async () => {
    let map = await createMap(agro, w, 'Archive me');
    const listed = async (q: string) =>
      zoneMapListSchema
        .parse((await agro.get(`/api/zone-maps?fieldId=${w.a.field.id}${q}`)).body)
        .items.map((i) => i.id);
    map = expectMap(await agro.post(`/api/zone-maps/${map.id}/archive`));
    expect(map.archivedAt).not.toBeNull();
    expect(await listed('')).not.toContain(map.id);
    expect(await listed('&archived=only')).toContain(map.id);
    const edit = await agro.post(`/api/zone-maps/${map.id}/fill-gaps`, { version: map.version });
    expect(edit.status).toBe(409);
    expect(edit.body.error.code).toBe('conflict');
    map = expectMap(await agro.post(`/api/zone-maps/${map.id}/restore`));
    expect(map.archivedAt).toBeNull();
    expect(await listed('')).toContain(map.id);
    expect((await agro.post(`/api/zone-maps/${map.id}/fill-gaps`, { version: map.version })).status).toBe(
      200,
    );
  });
});

describe('edits', () => {
  it('adds a zone clipped to the boundary; the overlap is reported until resolved; fill-gaps closes the sum', async () => {
    let map = await createMap(agro, w, 'Clip and overlap');
    const defaultZone = map.zones.features[0];
    // Half of this square lies west of the field.
    map = await addZone(agro, map, 'Edge', polygon(cell(-0.5, 0, 0.5, 0.5)), {
      classValue: 2,
      productivityIndex: 1.1,
    });
    const edge = zoneNamed(map, 'Edge');
    expect(Math.min(...edge.geometry.coordinates.flat(2).map((p) => p[0]))).toBeGreaterThanOrEqual(
      -93.6 - 1e-9,
    );
    // A quarter of the field (derived: the half inside of a half-side square).
    expect(rel(edge.properties.areaM2, map.analysis.boundaryAreaM2 / 4)).toBeLessThan(1e-3);
    expect(edge.properties).toMatchObject({ classValue: 2, productivityIndex: 1.1, isDefault: false });
    expect(map.analysis.overlaps).toHaveLength(1);
    expect(new Set([map.analysis.overlaps[0].aId, map.analysis.overlaps[0].bId])).toEqual(
      new Set([defaultZone.properties.id, edge.properties.id]),
    );
    expect(rel(map.analysis.overlaps[0].areaM2, edge.properties.areaM2)).toBeLessThan(1e-6);

    map = expectMap(
      await agro.post(`/api/zone-maps/${map.id}/resolve-overlap`, {
        version: map.version,
        keepZoneId: edge.properties.id,
        loseZoneId: defaultZone.properties.id,
      }),
    );
    expect(map.analysis.overlaps).toEqual([]);
    expect(rel(zoneNamed(map, 'Edge').properties.areaM2, edge.properties.areaM2)).toBeLessThan(1e-9);
    expect(rel(totalZoneArea(map), map.analysis.boundaryAreaM2)).toBeLessThan(AREA_TOLERANCE);
  });

  it('splits a zone by a line, keeping the total area; a line that misses the zone is a 422 and changes nothing', async () => {
    let map = await createMap(agro, w, 'Split');
    const whole = map.zones.features[0];
    map = expectMap(
      await agro.post(`/api/zone-maps/${map.id}/split`, {
        version: map.version,
        zoneId: whole.properties.id,
        line: verticalLine(0.4),
      }),
    );
    expect(map.zones.features).toHaveLength(2);
    const areas = map.zones.features.map((f) => f.properties.areaM2).sort((a, b) => a - b);
    // 40 % and 60 % of the field (derived; meridians cut a small square almost proportionally).
    expect(rel(areas[0], whole.properties.areaM2 * 0.4)).toBeLessThan(1e-3);
    expect(rel(areas[0] + areas[1], whole.properties.areaM2)).toBeLessThan(AREA_TOLERANCE);
    expect(map.zones.features.map((f) => f.properties.id)).toContain(whole.properties.id);
    // The default zone split in two: the part that stays is still the default, the cut-off part is not.
    expect(whole.properties.isDefault).toBe(true);
    expect(
      map.zones.features.map((f) => [f.properties.id === whole.properties.id, f.properties.isDefault]).sort(),
    ).toEqual([
      [false, false],
      [true, true],
    ]);

    const miss = await agro.post(`/api/zone-maps/${map.id}/split`, {
      version: map.version,
      zoneId: whole.properties.id,
      line: {
        type: 'LineString',
        coordinates: [
          [-93.7, 41.9],
          [-93.69, 41.9],
        ],
      },
    });
    expect(miss.status).toBe(422);
    expect(miss.body.error.details[0].path).toEqual(['line']);
    expect(expectMap(await agro.get(`/api/zone-maps/${map.id}`))).toEqual(map);
  });

  it('merges two zones into one of their summed area', async () => {
    let map = await createMap(agro, w, 'Merge');
    map = expectMap(
      await agro.post(`/api/zone-maps/${map.id}/split`, {
        version: map.version,
        zoneId: map.zones.features[0].properties.id,
        line: verticalLine(0.5),
      }),
    );
    const [a, b] = map.zones.features;
    map = expectMap(
      await agro.post(`/api/zone-maps/${map.id}/merge`, {
        version: map.version,
        zoneIds: [a.properties.id, b.properties.id],
      }),
    );
    expect(map.zones.features).toHaveLength(1);
    expect(map.zones.features[0].properties.id).toBe(a.properties.id);
    expect(
      rel(map.zones.features[0].properties.areaM2, a.properties.areaM2 + b.properties.areaM2),
    ).toBeLessThan(AREA_TOLERANCE);
    expect(await Zone.count({ where: { id: b.properties.id } })).toBe(0);

    const same = await agro.post(`/api/zone-maps/${map.id}/merge`, {
      version: map.version,
      zoneIds: [a.properties.id, a.properties.id],
    });
    expect(same.status).toBe(400);
  });

  it('deletes a zone (its area becomes a gap) and fill-gaps gives the gap back to the default zone', async () => {
    let map = await createMap(agro, w, 'Delete and fill');
    map = await addZone(agro, map, 'North', polygon(cell(0, 0.5, 1, 1)), { classValue: 1 });
    map = await tidy(agro, map);
    const north = zoneNamed(map, 'North');
    const res = await del(
      agro,
      `/api/zone-maps/${map.id}/zones/${north.properties.id}?version=${map.version}`,
    );
    map = expectMap(res);
    expect(map.zones.features.map((f) => f.properties.name)).not.toContain('North');
    expect(rel(map.analysis.gapAreaM2, north.properties.areaM2)).toBeLessThan(1e-3);

    map = expectMap(await agro.post(`/api/zone-maps/${map.id}/fill-gaps`, { version: map.version }));
    expect(map.zones.features).toHaveLength(1);
    expect(map.zones.features[0].properties.isDefault).toBe(true);
    expect(map.analysis.gapAreaM2).toBeLessThan(0.01);
    expect(rel(totalZoneArea(map), map.analysis.boundaryAreaM2)).toBeLessThan(AREA_TOLERANCE);
  });

  it('fill-gaps makes a new default zone when there is none', async () => {
    let map = await createMap(agro, w, 'New default');
    map = await addZone(agro, map, 'South', polygon(cell(0, 0, 1, 0.3)));
    map = expectMap(
      await del(
        agro,
        `/api/zone-maps/${map.id}/zones/${map.zones.features.find((f) => f.properties.isDefault)!.properties.id}?version=${map.version}`,
      ),
    );
    expect(map.zones.features.some((f) => f.properties.isDefault)).toBe(false);
    map = expectMap(await agro.post(`/api/zone-maps/${map.id}/fill-gaps`, { version: map.version }));
    expect(map.zones.features.filter((f) => f.properties.isDefault)).toHaveLength(1);
    expect(rel(totalZoneArea(map), map.analysis.boundaryAreaM2)).toBeLessThan(AREA_TOLERANCE);
  });

  it('renames a zone, sets class and index, and moves its vertices (clipped)', async () => {
    let map = await createMap(agro, w, 'Update');
    map = await addZone(agro, map, 'Old name', polygon(cell(0.1, 0.1, 0.3, 0.3)));
    const z = zoneNamed(map, 'Old name');
    map = expectMap(
      await agro.put(`/api/zone-maps/${map.id}/zones/${z.properties.id}`, {
        version: map.version,
        name: 'Knoll',
        classValue: 4,
        productivityIndex: 0.85,
      }),
    );
    const renamed = zoneNamed(map, 'Knoll');
    expect(renamed.properties).toMatchObject({ id: z.properties.id, classValue: 4, productivityIndex: 0.85 });
    expect(renamed.geometry).toEqual(z.geometry);

    map = expectMap(
      await agro.put(`/api/zone-maps/${map.id}/zones/${z.properties.id}`, {
        version: map.version,
        name: 'Knoll',
        classValue: 4,
        productivityIndex: 0.85,
        geometry: polygon(cell(-0.2, 0.1, 0.3, 0.3)),
      }),
    );
    // Clipped at the west edge: 0.3 × 0.2 of the field (derived).
    expect(rel(zoneNamed(map, 'Knoll').properties.areaM2, map.analysis.boundaryAreaM2 * 0.06)).toBeLessThan(
      2e-3,
    );
    const row = await Zone.findByPk(z.properties.id);
    expect(row).toMatchObject({ name: 'Knoll', classValue: 4, productivityIndex: 0.85 });

    const outside = await agro.put(`/api/zone-maps/${map.id}/zones/${z.properties.id}`, {
      version: map.version,
      name: 'Knoll',
      classValue: 4,
      productivityIndex: 0.85,
      geometry: polygon(cell(2, 2, 3, 3)),
    });
    expect(outside.status).toBe(422);
    expect(outside.body.error.details[0].path).toEqual(['geometry']);
  });
});

describe('holes and multi-part zones survive editing', () => {
  /** A ring around a hole, west half; and a two-part zone, east. */
  const donut = polygon(cell(0.05, 0.05, 0.45, 0.95), cell(0.15, 0.4, 0.35, 0.6).reverse());
  const twoPart = multi([cell(0.6, 0.05, 0.95, 0.35)], [cell(0.6, 0.65, 0.95, 0.95)]);
  const holes = (g: { coordinates: number[][][][] }) => g.coordinates.reduce((n, p) => n + p.length - 1, 0);

  it('split keeps the hole in the half that holds it, and the part the line misses', async () => {
    let map = await createMap(agro, w, 'Holes split');
    map = await addZone(agro, map, 'Ring', donut);
    map = await addZone(agro, map, 'Pair', twoPart);
    const ring = zoneNamed(map, 'Ring');
    expect(holes(ring.geometry)).toBe(1);
    expect(zoneNamed(map, 'Pair').geometry.coordinates).toHaveLength(2);

    // South of the hole: the north piece keeps the hole.
    const southCut = {
      type: 'LineString',
      coordinates: [
        [-93.6 - 0.001, 42.0015],
        [-93.595 + 0.001, 42.0015],
      ],
    };
    map = expectMap(
      await agro.post(`/api/zone-maps/${map.id}/split`, {
        version: map.version,
        zoneId: ring.properties.id,
        line: southCut,
      }),
    );
    const pieces = map.zones.features.filter((f) => f.properties.name.startsWith('Ring'));
    expect(pieces).toHaveLength(2);
    expect(pieces.map((p) => holes(p.geometry)).sort()).toEqual([0, 1]);
    expect(
      rel(pieces[0].properties.areaM2 + pieces[1].properties.areaM2, ring.properties.areaM2),
    ).toBeLessThan(AREA_TOLERANCE);

    // Across the southern part only: the northern part stays whole on its side.
    const pair = zoneNamed(map, 'Pair');
    map = expectMap(
      await agro.post(`/api/zone-maps/${map.id}/split`, {
        version: map.version,
        zoneId: pair.properties.id,
        line: southCut,
      }),
    );
    const pairs = map.zones.features.filter((f) => f.properties.name.startsWith('Pair'));
    expect(pairs.map((p) => p.geometry.coordinates.length).sort()).toEqual([1, 2]);
    expect(rel(pairs[0].properties.areaM2 + pairs[1].properties.areaM2, pair.properties.areaM2)).toBeLessThan(
      AREA_TOLERANCE,
    );
  });

  it('merge keeps the hole and both parts; rename keeps the geometry exactly', async () => {
    let map = await createMap(agro, w, 'Holes merge');
    map = await addZone(agro, map, 'Ring', donut);
    map = await addZone(agro, map, 'Pair', twoPart);
    const [ring, pair] = [zoneNamed(map, 'Ring'), zoneNamed(map, 'Pair')];
    map = expectMap(
      await agro.post(`/api/zone-maps/${map.id}/merge`, {
        version: map.version,
        zoneIds: [ring.properties.id, pair.properties.id],
      }),
    );
    const merged = zoneNamed(map, 'Ring');
    expect(merged.geometry.coordinates).toHaveLength(3);
    expect(holes(merged.geometry)).toBe(1);
    expect(rel(merged.properties.areaM2, ring.properties.areaM2 + pair.properties.areaM2)).toBeLessThan(
      AREA_TOLERANCE,
    );

    map = expectMap(
      await agro.put(`/api/zone-maps/${map.id}/zones/${merged.properties.id}`, {
        version: map.version,
        name: 'Ring and pair',
        classValue: 1,
        productivityIndex: null,
      }),
    );
    expect(zoneNamed(map, 'Ring and pair').geometry).toEqual(merged.geometry);

    // Vertex editing that sends the holed, two-part shape back keeps both.
    map = expectMap(
      await agro.put(`/api/zone-maps/${map.id}/zones/${merged.properties.id}`, {
        version: map.version,
        name: 'Ring and pair',
        classValue: 1,
        productivityIndex: null,
        geometry: multi(donut.coordinates, twoPart.coordinates[0]),
      }),
    );
    const edited = zoneNamed(map, 'Ring and pair');
    expect(edited.geometry.coordinates).toHaveLength(2);
    expect(holes(edited.geometry)).toBe(1);
  });
});

describe('optimistic locking', () => {
  it('answers 409 stale to an edit made on an old version and keeps what was saved', async () => {
    let map = await createMap(agro, w, 'Locking');
    const old = map.version;
    map = await addZone(agro, map, 'First', polygon(cell(0, 0, 0.5, 0.5)));
    expect(map.version).toBe(old + 1);
    const zoneId = zoneNamed(map, 'First').properties.id;
    const attempts = [
      agro.post(`/api/zone-maps/${map.id}/zones`, {
        version: old,
        name: 'Late',
        geometry: polygon(cell(0.5, 0.5, 1, 1)),
        classValue: null,
        productivityIndex: null,
      }),
      agro.put(`/api/zone-maps/${map.id}/zones/${zoneId}`, {
        version: old,
        name: 'Late',
        classValue: null,
        productivityIndex: null,
      }),
      del(agro, `/api/zone-maps/${map.id}/zones/${zoneId}?version=${old}`),
      agro.post(`/api/zone-maps/${map.id}/split`, { version: old, zoneId, line: verticalLine(0.25) }),
      agro.post(`/api/zone-maps/${map.id}/merge`, {
        version: old,
        zoneIds: [zoneId, map.zones.features[0].properties.id],
      }),
      agro.post(`/api/zone-maps/${map.id}/resolve-overlap`, {
        version: old,
        keepZoneId: zoneId,
        loseZoneId: map.zones.features[0].properties.id,
      }),
      agro.post(`/api/zone-maps/${map.id}/fill-gaps`, { version: old }),
    ];
    for (const attempt of attempts) {
      const res = await attempt;
      expect(res.status).toBe(409);
      expect(res.body.error.code).toBe('stale');
    }
    expect(expectMap(await agro.get(`/api/zone-maps/${map.id}`))).toEqual(map);
  });
});

describe('bad zone geometry', () => {
  const p = (lonLat: number[][]) => lonLat.map(([x, y]) => [W + x * SIDE, S + y * SIDE]);
  /** Our own cases, in the categories of RELIABILITY.md's bad-input corpus. */
  const CASES: Record<string, unknown> = {
    'bow-tie': polygon(
      p([
        [0.1, 0.1],
        [0.9, 0.9],
        [0.9, 0.1],
        [0.1, 0.9],
        [0.1, 0.1],
      ]),
    ),
    spike: polygon(
      p([
        [0.1, 0.1],
        [0.5, 0.1],
        [0.5, 0.5],
        [0.5, 0.05],
        [0.5, 0.1],
        [0.9, 0.1],
        [0.9, 0.9],
        [0.1, 0.1],
      ]),
    ),
    'unclosed ring': polygon(
      p([
        [0.1, 0.1],
        [0.9, 0.1],
        [0.9, 0.9],
      ]),
    ),
    'too few points': polygon(
      p([
        [0.1, 0.1],
        [0.9, 0.1],
        [0.1, 0.1],
      ]),
    ),
    'empty polygon': { type: 'Polygon', coordinates: [] },
    'empty ring': { type: 'Polygon', coordinates: [[]] },
    'empty multipolygon': { type: 'MultiPolygon', coordinates: [] },
    'string coordinate': {
      type: 'Polygon',
      coordinates: [
        [
          ['-93.6', 42],
          [-93.59, 42],
          [-93.59, 42.01],
          ['-93.6', 42],
        ],
      ],
    },
    'null coordinate': {
      type: 'Polygon',
      coordinates: [
        [
          [null, 42],
          [-93.59, 42],
          [-93.59, 42.01],
          [null, 42],
        ],
      ],
    },
    'longitude over 180': polygon([
      [181, 42],
      [182, 42],
      [182, 43],
      [181, 42],
    ]),
    'projected metres': polygon([
      [448_000, 4_650_000],
      [448_400, 4_650_000],
      [448_400, 4_650_400],
      [448_000, 4_650_000],
    ]),
    'hole outside shell': polygon(cell(0.1, 0.1, 0.4, 0.4), cell(0.6, 0.6, 0.9, 0.9).reverse()),
    'overlapping parts': multi([cell(0.1, 0.1, 0.6, 0.6)], [cell(0.4, 0.4, 0.9, 0.9)]),
    'a point': { type: 'Point', coordinates: [-93.598, 42.002] },
  };

  /** The status each case must get: 400 when the request's shape is wrong, 422 when PostGIS or clipping refuses it. */
  const STATUS: Record<string, number> = {
    'string coordinate': 400,
    'null coordinate': 400,
    'a point': 400,
  };

  it.each(Object.keys(CASES))(
    '%s: a clear 4xx naming the geometry, nothing stored, never a 500',
    async (name) => {
      const map = await createMap(agro, w, `Bad ${name}`);
      const res = await agro.post(`/api/zone-maps/${map.id}/zones`, {
        version: map.version,
        name: 'Bad',
        geometry: CASES[name],
        classValue: null,
        productivityIndex: null,
      });
      expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(STATUS[name] ?? 422);
      expect(res.body.error.details[0].path[0]).toBe('geometry');
      expect(expectMap(await agro.get(`/api/zone-maps/${map.id}`))).toEqual(map);
    },
  );

  it('names the reason and the place of an invalid shape', async () => {
    const map = await createMap(agro, w, 'Bow-tie place');
    const res = await agro.post(`/api/zone-maps/${map.id}/zones`, {
      version: map.version,
      name: 'Bad',
      geometry: CASES['bow-tie'],
      classValue: null,
      productivityIndex: null,
    });
    expect(res.status).toBe(422);
    // The crossing of the bow-tie is the middle of the field (derived from the case above).
    expect(res.body.error.message).toContain(`${W + SIDE / 2}, ${S + SIDE / 2}`);
  });
});

describe('what PostGIS lets into the table', () => {
  it('stores a shape shared/geo left invalid as ST_MakeValid makes it (polygons only), never invalid', async () => {
    const map = await createMap(agro, w, 'Make valid');
    const row = await ZoneMap.findByPk(map.id);
    // A bow-tie: two triangles touching at the middle of the field once made valid.
    const bowTie = multi([
      [
        [W, S],
        [W + SIDE, S + SIDE],
        [W + SIDE, S],
        [W, S + SIDE],
        [W, S],
      ],
    ]);
    const id = await t.sequelize.transaction((tx) =>
      insertZone(tx, row!, {
        name: 'Bow-tie',
        classValue: null,
        productivityIndex: null,
        isDefault: false,
        meanValue: null,
        geometry: bowTie,
      }),
    );
    const [stored] = await t.sequelize.query<{
      valid: boolean;
      type: string;
      area: number;
      expected: number;
    }>(
      `SELECT ST_IsValid(geometry) AS valid, GeometryType(geometry) AS type, area_m2 AS area,
              ST_Area(ST_CollectionExtract(ST_MakeValid(ST_SetSRID(ST_GeomFromGeoJSON(:g), 4326)), 3)::geography, true) AS expected
         FROM zones WHERE id = :id`,
      { replacements: { id, g: JSON.stringify(bowTie) }, type: QueryTypes.SELECT },
    );
    expect(stored).toMatchObject({ valid: true, type: 'MULTIPOLYGON' });
    expect(rel(stored.area, stored.expected)).toBeLessThan(1e-9);
    // Two triangles, each a quarter of the square (derived).
    expect(rel(stored.area, map.analysis.boundaryAreaM2 / 2)).toBeLessThan(1e-3);
  });

  it('refuses an invalid row even written around the service (the CHECK constraint)', async () => {
    const map = await createMap(agro, w, 'Check constraint');
    await expect(
      t.sequelize.query(
        `INSERT INTO zones (zone_map_id, workspace_id, name, geometry)
         VALUES (:mapId, :ws, 'Raw', ST_GeomFromText('MULTIPOLYGON(((0 0, 1 1, 1 0, 0 1, 0 0)))', 4326))`,
        { replacements: { mapId: map.id, ws: w.ws.id } },
      ),
    ).rejects.toThrow(/check constraint/i);
  });
});

describe('two edits at once', () => {
  it('lets one of two edits made on the same version through and answers the other 409 stale', async () => {
    const map = await createMap(agro, w, 'Race');
    const body = (name: string) => ({
      version: map.version,
      name,
      geometry: polygon(cell(0.2, 0.2, 0.4, 0.4)),
      classValue: null,
      productivityIndex: null,
    });
    const [a, b] = await Promise.all([
      agro.post(`/api/zone-maps/${map.id}/zones`, body('First')),
      w.callers.admin.post(`/api/zone-maps/${map.id}/zones`, body('Second')),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const after = expectMap(await agro.get(`/api/zone-maps/${map.id}`));
    expect(after.version).toBe(map.version + 1);
    expect(after.zones.features).toHaveLength(2);
  });
});

describe('an empty zone map', () => {
  it('exports as an empty collection and an empty shapefile that GDAL opens', async () => {
    let map = await createMap(agro, w, 'Empty');
    map = expectMap(
      await del(
        agro,
        `/api/zone-maps/${map.id}/zones/${map.zones.features[0].properties.id}?version=${map.version}`,
      ),
    );
    expect(map.zones.features).toEqual([]);
    expect(rel(map.analysis.gapAreaM2, map.analysis.boundaryAreaM2)).toBeLessThan(1e-9);
    const geojson = await getBytes(agro, `/api/zone-maps/${map.id}/export?format=geojson`);
    expect(geojson.status).toBe(200);
    expect(JSON.parse((geojson.body as Buffer).toString('utf8'))).toEqual({
      type: 'FeatureCollection',
      features: [],
    });
    const shp = await getBytes(agro, `/api/zone-maps/${map.id}/export?format=shapefile`);
    expect(shp.status).toBe(200);
    expect(shp.headers['content-type']).toBe('application/zip');
    const dir = mkdtempSync(path.join(os.tmpdir(), 'sowright-empty-'));
    try {
      writeFileSync(path.join(dir, 'empty.zip'), shp.body as Buffer);
      const info = execFileSync('ogrinfo', ['-al', '-so', `/vsizip/${path.join(dir, 'empty.zip')}`], {
        encoding: 'utf8',
      });
      expect(info).toMatch(/Feature Count: 0\b/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
