import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type request from 'supertest';
import type { z } from 'zod';
import geodesic from 'geographiclib-geodesic';
import { Field, Grower, Planter } from '../../server/db/associations';
import { growerListSchema, growerSchema } from '../../shared/schemas/grower.schema';
import { farmListSchema, farmSchema } from '../../shared/schemas/farm.schema';
import { fieldListSchema, fieldSchema } from '../../shared/schemas/field.schema';
import { seasonListSchema, seasonSchema } from '../../shared/schemas/season.schema';
import { planterListSchema, planterSchema } from '../../shared/schemas/planter.schema';
import { startTestApp, type Caller, type TestApp } from '../helpers/app';
import { makeWorld, planterBody, squareBoundary, type World } from '../helpers/factory';
import { KINDS, createBody, rowOf, tag, updateBody, type Kind } from '../helpers/register';

// The package is CommonJS: take its named members from the default export.
const { Geodesic, PolygonArea } = geodesic;

let t: TestApp;
let w: World;
/** Every call here is the agronomist's, who keeps the register. */
let agro: Caller;
beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'register');
  agro = w.callers.agronomist;
});
afterAll(() => t.close());

type Item = { id: string; version: number; archivedAt: string | null; [k: string]: unknown };

const SCHEMAS: Record<Kind, { one: z.ZodObject; list: z.ZodType }> = {
  growers: { one: growerSchema, list: growerListSchema },
  farms: { one: farmSchema, list: farmListSchema },
  fields: { one: fieldSchema, list: fieldListSchema },
  seasons: { one: seasonSchema, list: seasonListSchema },
  planters: { one: planterSchema, list: planterListSchema },
};

/** The answer has exactly the shape of the shared response schema: it parses, and carries no other key. */
function expectShape(kind: Kind, res: request.Response, status = 200): Item {
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  const schema = SCHEMAS[kind].one;
  schema.parse(res.body);
  expect(Object.keys(res.body).sort()).toEqual(Object.keys(schema.shape).sort());
  return res.body as Item;
}

async function create(kind: Kind, body: Record<string, unknown>): Promise<Item> {
  return expectShape(kind, await agro.post(`/api/${kind}`, body), 201);
}

async function list(kind: Kind, query = ''): Promise<Item[]> {
  const res = await agro.get(`/api/${kind}${query}`);
  expect(res.status).toBe(200);
  SCHEMAS[kind].list.parse(res.body);
  return res.body.items as Item[];
}

/** The ids of `items`, in list order, keeping only those in `ids`. */
const orderOf = (items: Item[], ids: string[]) => items.map((i) => i.id).filter((id) => ids.includes(id));

/**
 * Three records per kind, created out of order, and the order the list must give them in: by name for the
 * named kinds; seasons, which have no name, newest year first.
 */
function threeOf(kind: Kind): { bodies: Record<string, unknown>[]; listed: number[] } {
  if (kind === 'seasons') {
    return {
      bodies: [2095, 2093, 2094].map((year) => ({ ...createBody(w, kind, 'a'), year, crop: 'sunflower' })),
      listed: [0, 2, 1],
    };
  }
  const suffix = tag();
  return {
    bodies: ['Cedar', 'Alder', 'Birch'].map((n) => createBody(w, kind, 'a', `${n} ${suffix}`)),
    listed: [1, 2, 0],
  };
}

/** A change to make in an update, for each kind. */
const CHANGE: Record<Kind, () => Record<string, unknown>> = {
  growers: () => ({ name: `Renamed ${tag()}`, phone: '555 0199' }),
  farms: () => ({ name: `Renamed ${tag()}` }),
  fields: () => ({ name: `Renamed ${tag()}` }),
  seasons: () => ({ plannedPlantingDate: '2031-04-25' }),
  planters: () => ({ name: `Renamed ${tag()}`, rowsPerSection: 4 }),
};

describe.each(KINDS)('%s', (kind) => {
  it('creates, reads, lists in order and updates', async () => {
    const { bodies, listed } = threeOf(kind);
    const created: Item[] = [];
    for (const body of bodies) created.push(await create(kind, body));
    const { boundary: _b, growerId: _g, farmId: _f, fieldId: _fi, ...echoed } = bodies[0];
    expect(created[0]).toMatchObject(echoed);
    expect(created[0].version).toBe(0);

    for (const item of created)
      expect(expectShape(kind, await agro.get(`/api/${kind}/${item.id}`))).toEqual(item);

    const ids = created.map((c) => c.id);
    expect(orderOf(await list(kind), ids)).toEqual(listed.map((i) => ids[i]));

    const change = CHANGE[kind]();
    const updated = expectShape(
      kind,
      await agro.put(`/api/${kind}/${ids[0]}`, await updateBody(kind, ids[0], change)),
    );
    expect(updated).toMatchObject({ ...change, id: ids[0], version: 1 });
    expect(await rowOf(kind, ids[0])).toMatchObject({ ...change, version: 1 });
  });

  it('archives out of the default list, lists archived ones on request, and restores', async () => {
    const keep = await create(kind, createBody(w, kind, 'a'));
    const gone = await create(kind, createBody(w, kind, 'a'));
    const archived = expectShape(kind, await agro.post(`/api/${kind}/${gone.id}/archive`));
    expect(archived.archivedAt).not.toBeNull();
    const both = [keep.id, gone.id];

    expect(orderOf(await list(kind), both)).toEqual([keep.id]);
    expect(new Set(orderOf(await list(kind, '?archived=true'), both))).toEqual(new Set(both));
    const only = await list(kind, '?archived=only');
    expect(orderOf(only, both)).toEqual([gone.id]);
    expect(only.every((i) => i.archivedAt !== null)).toBe(true);

    const restored = expectShape(kind, await agro.post(`/api/${kind}/${gone.id}/restore`));
    expect(restored.archivedAt).toBeNull();
    expect(new Set(orderOf(await list(kind), both))).toEqual(new Set(both));
    expect(await rowOf(kind, gone.id)).toMatchObject({ archivedAt: null });
  });

  it("answers 409 stale to a second edit carrying the same version, and keeps the first one's values", async () => {
    const item = await create(kind, createBody(w, kind, 'a'));
    const first = await updateBody(kind, item.id, { notes: `first ${tag()}` });
    const second = await updateBody(kind, item.id, { notes: `second ${tag()}` });
    expect(first.version).toBe(second.version);
    expect((await agro.put(`/api/${kind}/${item.id}`, first)).status).toBe(200);
    const late = await agro.put(`/api/${kind}/${item.id}`, second);
    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe('stale');
    expect(await rowOf(kind, item.id)).toMatchObject({
      notes: first.notes,
      version: (first.version as number) + 1,
    });
  });
});

describe('concurrent edits', () => {
  it('of two simultaneous edits at one version exactly one wins; the database holds the winner', async () => {
    const item = await create('growers', createBody(w, 'growers', 'a'));
    const bodies = [
      await updateBody('growers', item.id, { notes: 'left' }),
      await updateBody('growers', item.id, { notes: 'right' }),
    ];
    const answers = await Promise.all(bodies.map((b) => agro.put(`/api/growers/${item.id}`, b)));
    expect(answers.map((a) => a.status).sort()).toEqual([200, 409]);
    const winner = answers.findIndex((a) => a.status === 200);
    expect(answers[1 - winner].body.error.code).toBe('stale');
    expect(await rowOf('growers', item.id)).toMatchObject({ notes: bodies[winner].notes, version: 1 });
  });
});

describe('duplicates', () => {
  const expectDuplicateName = (res: request.Response) => {
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('duplicate');
    expect(res.body.error.details.map((d: { path: string[] }) => d.path)).toEqual([['name']]);
  };

  it('refuses a second grower with the same name in another case', async () => {
    const name = `Meadow Bend ${tag()}`;
    await create('growers', createBody(w, 'growers', 'a', name));
    expectDuplicateName(await agro.post('/api/growers', createBody(w, 'growers', 'a', name.toUpperCase())));
    expect(await Grower.count({ where: { workspaceId: w.ws.id, name: name.toUpperCase() } })).toBe(0);
  });

  it('refuses renaming a grower to the name of another', async () => {
    const taken = await create('growers', createBody(w, 'growers', 'a'));
    const other = await create('growers', createBody(w, 'growers', 'a'));
    const res = await agro.put(
      `/api/growers/${other.id}`,
      await updateBody('growers', other.id, { name: ` ${String(taken.name).toLowerCase()} ` }),
    );
    expectDuplicateName(res);
    expect(await rowOf('growers', other.id)).toMatchObject({ name: other.name, version: 0 });
  });
});

describe('planter validation', () => {
  const expectInvalidAt = async (body: Record<string, unknown>, path: string[]) => {
    const res = await agro.post('/api/planters', body);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.map((d: { path: string[] }) => d.path)).toContainEqual(path);
    expect(await Planter.count({ where: { name: body.name as string } })).toBe(0);
  };

  it('refuses more sections than the display controls, naming rowsPerSection', async () => {
    // 24 rows at 1 row per section make 24 sections: more than a 16-section display (common practice).
    const body = { ...planterBody(w.a.grower.id), rowCount: 24, rowsPerSection: 1, displaySectionLimit: 16 };
    await expectInvalidAt(body, ['rowsPerSection']);
    // 24 rows on a 16-section display needs 2 rows per section (common practice): that one is accepted.
    const ok = await create('planters', { ...body, rowsPerSection: 2 });
    expect(ok.sectionCount).toBe(12); // ceil(24 / 2) (derived)
  });

  it('refuses a split-row planter without its interplant rows, naming interplantRowCount', async () => {
    await expectInvalidAt({ ...planterBody(w.a.grower.id), arrangement: 'split-row' }, [
      'interplantRowCount',
    ]);
  });

  it('counts sections as ceil(rows / rows per section)', async () => {
    // 23 rows split-row (12 + 11 interplant), 1 row per section: ceil(23 / 1) = 23 (derived).
    const split = {
      ...planterBody(w.a.grower.id),
      rowCount: 23,
      arrangement: 'split-row',
      interplantRowCount: 11,
      displaySectionLimit: 24,
    };
    expect((await create('planters', { ...split, rowsPerSection: 1 })).sectionCount).toBe(23);
    // The same planter at 2 rows per section: ceil(23 / 2) = 12 (derived).
    expect(
      (await create('planters', { ...split, name: `Planter ${tag()}`, rowsPerSection: 2 })).sectionCount,
    ).toBe(12);
  });
});

describe('field boundaries', () => {
  const fieldBody = (boundary: unknown) => ({ farmId: w.a.farm.id, name: `Field ${tag()}`, boundary });

  /** Geodesic area of one ring ([lon, lat] positions, the last repeating the first) by GeographicLib. */
  function geographicLibArea(ring: number[][]): number {
    const polygon = new PolygonArea.PolygonArea(Geodesic.WGS84, false);
    for (const [lon, lat] of ring.slice(0, -1)) polygon.AddPoint(lat, lon);
    return Math.abs(polygon.Compute(false, true).area!);
  }

  it('stores a Polygon as a MultiPolygon, reads it back without crs, with the geodesic area', async () => {
    const polygon = squareBoundary(-96.2, 41.3, 0.004);
    const field = await create('fields', fieldBody(polygon));
    for (const read of [field, expectShape('fields', await agro.get(`/api/fields/${field.id}`))]) {
      expect(read.boundary).toEqual({ type: 'MultiPolygon', coordinates: [polygon.coordinates] });
    }
    const listed = (await list('fields')).find((f) => f.id === field.id);
    expect(listed?.boundary).not.toHaveProperty('crs');
    const [stored] = await t.sequelize.query(
      'SELECT GeometryType(boundary) AS type FROM fields WHERE id = :id',
      {
        replacements: { id: field.id },
        plain: false,
        raw: true,
      },
    );
    expect(stored).toEqual([{ type: 'MULTIPOLYGON' }]);
    // PostGIS and GeographicLib use the same algorithm (DOMAIN.md §2).
    expect(Math.abs((field.areaM2 as number) - geographicLibArea(polygon.coordinates[0]))).toBeLessThan(0.01);
  });

  it('gives the area of the DOMAIN.md §2 half-mile square at 45° N', async () => {
    const ring = [
      [10, 45],
      [10.0102062, 45],
      [10.0102062, 45.0072407],
      [10, 45.0072407],
      [10, 45],
    ];
    const field = await create('fields', fieldBody({ type: 'Polygon', coordinates: [ring] }));
    expect(Math.abs((field.areaM2 as number) - 647_500.456)).toBeLessThan(0.01); // DOMAIN.md §2 table
  });

  it('accepts 3D coordinates and drops the altitude', async () => {
    const flat = squareBoundary(-95.1, 40.7);
    const withAltitude = {
      type: 'Polygon',
      coordinates: [flat.coordinates[0].map(([lon, lat], i) => [lon, lat, 300 + (i % 4)])],
    };
    const field = await create('fields', fieldBody(withAltitude));
    expect(field.boundary).toEqual({ type: 'MultiPolygon', coordinates: [flat.coordinates] });
    expect(Math.abs((field.areaM2 as number) - geographicLibArea(flat.coordinates[0]))).toBeLessThan(0.01);
  });

  it('refuses a bow-tie with 422 invalid_geometry naming the self-intersection, and stores nothing', async () => {
    const [lon, lat, d] = [-94.5, 42.2, 0.004];
    const bowTie = {
      type: 'Polygon',
      coordinates: [
        [
          [lon, lat],
          [lon + d, lat + d],
          [lon + d, lat],
          [lon, lat + d],
          [lon, lat],
        ],
      ],
    };
    const body = fieldBody(bowTie);
    const res = await agro.post('/api/fields', body);
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('invalid_geometry');
    expect(res.body.error.message).toMatch(/self-intersection/i);
    expect(await Field.count({ where: { name: body.name } })).toBe(0);
  });

  it('refuses longitude 200 with 400 and a path into boundary, and stores nothing', async () => {
    const bad = squareBoundary(200, 42.0);
    const body = fieldBody(bad);
    const res = await agro.post('/api/fields', body);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    const paths = res.body.error.details.map((d: { path: (string | number)[] }) => d.path);
    expect(paths.length).toBeGreaterThan(0);
    for (const path of paths) expect(path[0]).toBe('boundary');
    expect(await Field.count({ where: { name: body.name } })).toBe(0);
  });
});
