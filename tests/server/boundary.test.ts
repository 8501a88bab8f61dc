import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { fieldSchema } from '../../shared/schemas/field.schema';
import { importPreviewSchema } from '../../shared/schemas/import.schema';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { startTestApp, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { collection, square, upload } from './imports-support';

let t: TestApp;
let w: World;
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'boundary');
});
afterAll(() => t.close());

const agro = () => w.callers.agronomist;
const bowTie = [
  [-93.6, 42],
  [-93.598, 42.002],
  [-93.598, 42],
  [-93.6, 42.002],
  [-93.6, 42],
];

/** The field as the database holds it: boundary text, validity, area, version. */
async function stored(fieldId: string) {
  const [row] = await t.sequelize.query<{
    wkt: string | null;
    valid: boolean | null;
    area_m2: number | null;
    version: number;
  }>(
    'SELECT ST_AsText(boundary) AS wkt, ST_IsValid(boundary) AS valid, area_m2, version FROM fields WHERE id = $1',
    { bind: [fieldId], type: QueryTypes.SELECT },
  );
  return row;
}

async function importOf(fieldId: string, geojson: object) {
  const res = await upload(agro(), fieldId, 'boundary', 'b.geojson', JSON.stringify(geojson));
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return importPreviewSchema.parse(res.body);
}

describe('PUT /api/fields/:id/boundary', () => {
  it('an invalid feature without repair: 422 naming reason and place, the field unchanged', async () => {
    const fieldId = w.a.field.id;
    const before = await stored(fieldId);
    const p = await importOf(fieldId, { type: 'Polygon', coordinates: [bowTie] });
    expect(p.features[0].validity.valid).toBe(false);
    const res = await agro().put(`/api/fields/${fieldId}/boundary`, {
      importId: p.id,
      featureIndexes: [0],
      repair: false,
      version: before.version,
    });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('invalid_geometry');
    expect(res.body.error.details[0].path).toEqual(['featureIndexes', 0]);
    expect(res.body.error.details[0].message).toMatch(/Feature 1.*Self-intersection.*near -93\.59/);
    expect(await stored(fieldId)).toEqual(before);
  });

  it('with repair: stores the valid repair, with the area the preview showed', async () => {
    const fieldId = w.a.field.id;
    const p = await importOf(fieldId, { type: 'Polygon', coordinates: [bowTie] });
    const { version } = await stored(fieldId);
    const res = await agro().put(`/api/fields/${fieldId}/boundary`, {
      importId: p.id,
      featureIndexes: [0],
      repair: true,
      version,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const field = fieldSchema.parse(res.body);
    expect(field.version).toBe(version + 1);
    expect(field.areaM2).toBeCloseTo(p.features[0].repair!.areaM2, 3);
    const after = await stored(fieldId);
    expect(after.valid).toBe(true);
    expect(after.area_m2).toBeCloseTo(p.features[0].repair!.areaM2, 3);
  });

  it('a stale version: 409, the field unchanged', async () => {
    const fieldId = w.a.field.id;
    const before = await stored(fieldId);
    const res = await agro().put(`/api/fields/${fieldId}/boundary`, {
      geometry: { type: 'Polygon', coordinates: [square(-93.6, 42, 0.003)] },
      repair: false,
      version: before.version - 1,
    });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('stale');
    expect(await stored(fieldId)).toEqual(before);
  });

  it('unions the chosen features into one MultiPolygon', async () => {
    const fieldId = w.b.field.id;
    const p = await importOf(
      fieldId,
      collection([square(-93.6, 42, 0.002)], [square(-93.598, 42, 0.002)], [square(-93.59, 42, 0.001)]),
    );
    const { version } = await stored(fieldId);
    const res = await agro().put(`/api/fields/${fieldId}/boundary`, {
      importId: p.id,
      featureIndexes: [0, 1],
      repair: false,
      version,
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    // Two squares sharing an edge dissolve into one polygon of their summed area.
    expect(res.body.boundary.coordinates).toHaveLength(1);
    expect(res.body.areaM2 / (p.features[0].areaM2 + p.features[1].areaM2)).toBeCloseTo(1, 6);
    expect(res.body.areaM2).toBeCloseTo(geodesicAreaM2(res.body.boundary), 2);
  });

  it('refuses a feature index the import does not have', async () => {
    const fieldId = w.b.field.id;
    const p = await importOf(fieldId, collection([square(-93.6, 42, 0.002)]));
    const { version } = await stored(fieldId);
    const res = await agro().put(`/api/fields/${fieldId}/boundary`, {
      importId: p.id,
      featureIndexes: [5],
      repair: false,
      version,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toEqual(['featureIndexes', 0]);
  });

  it('a drawn polygon: valid stored; invalid refused; out of range refused naming the coordinate', async () => {
    const fieldId = w.b.field.id;
    let { version } = await stored(fieldId);
    const ok = await agro().put(`/api/fields/${fieldId}/boundary`, {
      geometry: { type: 'Polygon', coordinates: [square(-93.61, 42.01, 0.004)] },
      repair: false,
      version,
    });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    version = ok.body.version;
    const bad = await agro().put(`/api/fields/${fieldId}/boundary`, {
      geometry: { type: 'Polygon', coordinates: [bowTie] },
      repair: false,
      version,
    });
    expect(bad.status).toBe(422);
    expect(bad.body.error.details[0].path).toEqual(['geometry']);
    const far = await agro().put(`/api/fields/${fieldId}/boundary`, {
      geometry: {
        type: 'Polygon',
        coordinates: [
          [
            [-93.6, 42],
            [-93.5, 42],
            [-93.5, 95],
            [-93.6, 42],
          ],
        ],
      },
      repair: false,
      version,
    });
    expect(far.status).toBe(422);
    expect(far.body.error.message).toMatch(/coordinate 3/);
    const fixed = await agro().put(`/api/fields/${fieldId}/boundary`, {
      geometry: { type: 'Polygon', coordinates: [bowTie] },
      repair: true,
      version,
    });
    expect(fixed.status).toBe(200);
    expect((await stored(fieldId)).valid).toBe(true);
  });

  it('admin and agronomist only; another workspace’s field is 404', async () => {
    const fieldId = w.a.field.id;
    const { version } = await stored(fieldId);
    const body = {
      geometry: { type: 'Polygon', coordinates: [square(-93.6, 42, 0.003)] },
      repair: false,
      version,
    };
    expect((await w.callers.farmer.put(`/api/fields/${fieldId}/boundary`, body)).status).toBe(403);
    expect((await w.callers.consultant.put(`/api/fields/${fieldId}/boundary`, body)).status).toBe(403);
    const other = await makeWorld(t.app, 'boundary-other');
    expect((await other.callers.agronomist.put(`/api/fields/${fieldId}/boundary`, body)).status).toBe(404);
    expect((await w.callers.admin.put(`/api/fields/${fieldId}/boundary`, body)).status).toBe(200);
  });
});
