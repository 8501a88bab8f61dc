import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importPreviewSchema } from '../../shared/schemas/import.schema';
import { startTestApp, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { collection, square, upload } from './imports-support';

let t: TestApp;
let w: World;
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'imports');
});
afterAll(() => t.close());

describe('GeoJSON', () => {
  it('imports a FeatureCollection with areas and validity', async () => {
    const res = await upload(w.callers.agronomist, w.a.field.id, 'zones', 'zones.geojson', JSON.stringify(collection([square(-93.6, 42, 0.002)], [square(-93.598, 42, 0.002)])));
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const p = importPreviewSchema.parse(res.body);
    expect(p.features).toHaveLength(2);
    expect(p.features[0].validity.valid).toBe(true);
  });
});
