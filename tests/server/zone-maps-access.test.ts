import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type request from 'supertest';
import type { Role } from '../../shared/schemas/auth.schema';
import type { ZoneMap } from '../../shared/schemas/zone-map.schema';
import { Zone } from '../../server/db/models/zone.model';
import { startTestApp, type Caller, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { addZone, cell, createMap, del, expectMap, polygon, verticalLine } from './zone-maps.helpers';

let t: TestApp;
let w: World;
let other: World;
/** Grower A's map in our workspace, grower B's map in our workspace, and a map of another workspace. */
let mapA: ZoneMap;
let mapB: ZoneMap;
let foreign: ZoneMap;
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'zone-access');
  other = await makeWorld(t.app, 'zone-access-other');
  mapA = await addZone(
    w.callers.agronomist,
    await createMap(w.callers.agronomist, w, 'A map'),
    'West',
    polygon(cell(0, 0, 0.5, 1)),
  );
  mapB = expectMap(
    await w.callers.agronomist.post('/api/zone-maps', {
      fieldId: w.b.field.id,
      seasonId: w.b.season.id,
      name: 'B map',
    }),
    201,
  );
  foreign = await addZone(
    other.callers.agronomist,
    await createMap(other.callers.agronomist, other, 'Foreign'),
    'West',
    polygon(cell(0, 0, 0.5, 1)),
  );
});
afterAll(() => t.close());

/** Every route that takes a zone map id, with a body valid for that map (so only scope or role decides). */
function routesFor(map: ZoneMap) {
  const [z0, z1] = map.zones.features.map((f) => f.properties.id);
  const v = map.version;
  return {
    read: {
      'GET /:id': (c: Caller) => c.get(`/api/zone-maps/${map.id}`),
      'GET /:id/export geojson': (c: Caller) => c.get(`/api/zone-maps/${map.id}/export?format=geojson`),
      'GET /:id/export shapefile': (c: Caller) => c.get(`/api/zone-maps/${map.id}/export?format=shapefile`),
    },
    write: {
      'POST /:id/new-version': (c: Caller) => c.post(`/api/zone-maps/${map.id}/new-version`, {}),
      'POST /:id/archive': (c: Caller) => c.post(`/api/zone-maps/${map.id}/archive`),
      'POST /:id/restore': (c: Caller) => c.post(`/api/zone-maps/${map.id}/restore`),
      'POST /:id/zones': (c: Caller) =>
        c.post(`/api/zone-maps/${map.id}/zones`, {
          version: v,
          name: 'N',
          geometry: polygon(cell(0.6, 0.6, 0.9, 0.9)),
          classValue: null,
          productivityIndex: null,
        }),
      'PUT /:id/zones/:zoneId': (c: Caller) =>
        c.put(`/api/zone-maps/${map.id}/zones/${z0}`, {
          version: v,
          name: 'Renamed',
          classValue: 1,
          productivityIndex: null,
        }),
      'DELETE /:id/zones/:zoneId': (c: Caller) => del(c, `/api/zone-maps/${map.id}/zones/${z0}?version=${v}`),
      'POST /:id/split': (c: Caller) =>
        c.post(`/api/zone-maps/${map.id}/split`, { version: v, zoneId: z0, line: verticalLine(0.25) }),
      'POST /:id/merge': (c: Caller) =>
        c.post(`/api/zone-maps/${map.id}/merge`, { version: v, zoneIds: [z0, z1] }),
      'POST /:id/resolve-overlap': (c: Caller) =>
        c.post(`/api/zone-maps/${map.id}/resolve-overlap`, { version: v, keepZoneId: z1, loseZoneId: z0 }),
      'POST /:id/fill-gaps': (c: Caller) => c.post(`/api/zone-maps/${map.id}/fill-gaps`, { version: v }),
    } as Record<string, (c: Caller) => request.Test>,
  };
}

const allRoutes = (map: ZoneMap) => {
  const r = routesFor(map);
  return { ...r.read, ...r.write };
};

async function zonesOf(mapId: string) {
  return (await Zone.findAll({ where: { zoneMapId: mapId }, order: [['id', 'ASC']] })).map((z) =>
    z.get({ plain: true }),
  );
}

describe("another workspace's zone map", () => {
  it.each(['admin', 'agronomist', 'farmer', 'consultant'] as Role[])(
    'is 404 on every route for our %s, and stays untouched',
    async (role) => {
      const before = await zonesOf(foreign.id);
      for (const [route, call] of Object.entries(allRoutes(foreign))) {
        const res = await call(w.callers[role]);
        const expected =
          role === 'farmer' || role === 'consultant' ? (route.startsWith('GET') ? 404 : 403) : 404;
        expect(res.status, `${role} ${route}`).toBe(expected);
      }
      expect(await zonesOf(foreign.id)).toEqual(before);
      expect(expectMap(await other.callers.agronomist.get(`/api/zone-maps/${foreign.id}`))).toEqual(foreign);
    },
  );

  it('is not listed, and its field and season cannot start a map here', async () => {
    const list = await w.callers.admin.get(`/api/zone-maps?fieldId=${other.a.field.id}`);
    expect(list.status).toBe(200);
    expect(list.body.items).toEqual([]);
    const res = await w.callers.agronomist.post('/api/zone-maps', {
      fieldId: other.a.field.id,
      seasonId: other.a.season.id,
      name: 'Stolen',
    });
    expect(res.status).toBe(404);
    const mixed = await w.callers.agronomist.post('/api/zone-maps', {
      fieldId: w.a.field.id,
      seasonId: other.a.season.id,
      name: 'Mixed',
    });
    expect(mixed.status).toBe(404);
  });

  it("a zone id of another map is 404 on this map's zone routes", async () => {
    const theirZone = foreign.zones.features[0].properties.id;
    const agro = w.callers.agronomist;
    const fresh = expectMap(await agro.get(`/api/zone-maps/${mapA.id}`));
    const v = fresh.version;
    const own = fresh.zones.features[0].properties.id;
    const calls = [
      agro.put(`/api/zone-maps/${mapA.id}/zones/${theirZone}`, {
        version: v,
        name: 'X',
        classValue: null,
        productivityIndex: null,
      }),
      del(agro, `/api/zone-maps/${mapA.id}/zones/${theirZone}?version=${v}`),
      agro.post(`/api/zone-maps/${mapA.id}/split`, {
        version: v,
        zoneId: theirZone,
        line: verticalLine(0.25),
      }),
      agro.post(`/api/zone-maps/${mapA.id}/merge`, { version: v, zoneIds: [own, theirZone] }),
      agro.post(`/api/zone-maps/${mapA.id}/resolve-overlap`, {
        version: v,
        keepZoneId: own,
        loseZoneId: theirZone,
      }),
    ];
    for (const call of calls) expect((await call).status).toBe(404);
    expect(expectMap(await agro.get(`/api/zone-maps/${mapA.id}`))).toEqual(fresh);
  });
});

describe('roles', () => {
  it.each(['farmer', 'consultant'] as Role[])(
    'a %s reads and exports grower A’s map, cannot write (403), and never sees grower B’s',
    async (role) => {
      const c = w.callers[role];
      for (const [route, call] of Object.entries(routesFor(mapA).read))
        expect((await call(c)).status, route).toBe(200);
      const list = await c.get('/api/zone-maps');
      expect(list.body.items.map((i: { id: string }) => i.id)).toContain(mapA.id);
      expect(list.body.items.map((i: { id: string }) => i.id)).not.toContain(mapB.id);
      const before = await zonesOf(mapA.id);
      for (const [route, call] of Object.entries(routesFor(mapA).write)) {
        const res = await call(c);
        expect(res.status, route).toBe(403);
        expect(res.body.error.code).toBe('forbidden');
      }
      expect(
        (await c.post('/api/zone-maps', { fieldId: w.a.field.id, seasonId: w.a.season.id, name: 'Mine' }))
          .status,
      ).toBe(403);
      expect(await zonesOf(mapA.id)).toEqual(before);
      for (const [route, call] of Object.entries(routesFor(mapB).read))
        expect((await call(c)).status, route).toBe(404);
    },
  );

  it.each(['admin', 'agronomist'] as Role[])(
    'an %s writes: every edit route answers 200 or 201 on a map of its own',
    async (role) => {
      const c = w.callers[role];
      const mk = async () =>
        addZone(c, await createMap(c, w, `${role} map`), 'East', polygon(cell(0.5, 0, 1, 1)));
      for (const route of Object.keys(routesFor(mapA).write)) {
        const res = await routesFor(await mk()).write[route](c);
        expect(res.status, `${route}: ${JSON.stringify(res.body).slice(0, 300)}`).toBe(
          route.includes('new-version') ? 201 : 200,
        );
      }
    },
  );
});
