import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type request from 'supertest';
import { ROLES, type Role } from '../../shared/schemas/auth.schema';
import type { Prescription } from '../../shared/schemas/prescription.schema';
import { startTestApp, type Caller, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { del } from './zone-maps.helpers';
import { cornProduct, draftFor, expectRx, halvesMap, perAc, saveBody } from './prescriptions.helpers';

/**
 * Who may do what with products and prescriptions: every route × every role, on grower A (whom the farmer
 * and the consultant belong to), grower B (whom they do not) and another workspace (nobody here).
 */
let t: TestApp;
let w: World;
let other: World;
let productId: string;
let rxA: Prescription;
let rxB: Prescription;
let rxOther: Prescription;

async function approvedOn(world: World, side: 'a' | 'b') {
  const agr = world.callers.agronomist;
  const product = await cornProduct(agr);
  const map = await agr.post('/api/zone-maps', {
    fieldId: world[side].field.id,
    seasonId: world[side].season.id,
    name: 'Z',
  });
  expect(map.status).toBe(201);
  const rx = expectRx(
    await agr.post('/api/prescriptions', {
      zoneMapId: map.body.id,
      productId: product.id,
      planterId: world[side].planter.id,
      name: 'Access',
      rateUnit: 'seeds/ac',
      defaultRateSi: perAc(32_000),
      outOfFieldRateSi: 0,
      minRateSi: perAc(20_000),
      maxRateSi: perAc(40_000),
    }),
    201,
  );
  return expectRx(await agr.post(`/api/prescriptions/${rx.id}/approve`, { version: rx.version }));
}

beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'rx-access');
  other = await makeWorld(t.app, 'rx-access-other');
  productId = (await cornProduct(w.callers.agronomist)).id;
  rxA = await approvedOn(w, 'a');
  rxB = await approvedOn(w, 'b');
  rxOther = await approvedOn(other, 'a');
});
afterAll(() => t.close());

type Cell = 'ok' | '403' | '404';
const cell = (res: request.Response): string =>
  res.status >= 200 && res.status < 300 ? 'ok' : String(res.status);
const matrix = (admin: Cell, agronomist: Cell, farmer: Cell, consultant: Cell) => ({
  admin,
  agronomist,
  farmer,
  consultant,
});

type Route = {
  label: string;
  expect: Record<Role, Cell>;
  send: (c: Caller) => Promise<request.Response> | request.Test;
};

const routes = (): Route[] => [
  { label: 'GET /api/products', expect: matrix('ok', 'ok', 'ok', 'ok'), send: (c) => c.get('/api/products') },
  {
    label: 'GET /api/products/:id',
    expect: matrix('ok', 'ok', 'ok', 'ok'),
    send: (c) => c.get(`/api/products/${productId}`),
  },
  {
    label: 'GET /api/products/:id of another workspace',
    expect: matrix('404', '404', '404', '404'),
    send: (c) => c.get(`/api/products/${rxOther.product.id}`),
  },
  {
    label: 'POST /api/products',
    expect: matrix('ok', 'ok', '403', '403'),
    send: (c) =>
      c.post('/api/products', {
        kind: 'other',
        name: 'Starter',
        crop: null,
        rateKind: 'mass',
        unitName: 'bag',
        unitSize: 22.68,
        pricePerUnit: 30,
      }),
  },
  {
    label: 'GET /api/prescriptions/:id of A',
    expect: matrix('ok', 'ok', 'ok', 'ok'),
    send: (c) => c.get(`/api/prescriptions/${rxA.id}`),
  },
  {
    label: 'GET /api/prescriptions/:id of B',
    expect: matrix('ok', 'ok', '404', '404'),
    send: (c) => c.get(`/api/prescriptions/${rxB.id}`),
  },
  {
    label: 'GET /api/prescriptions/:id of another workspace',
    expect: matrix('404', '404', '404', '404'),
    send: (c) => c.get(`/api/prescriptions/${rxOther.id}`),
  },
  {
    label: 'GET export of A',
    expect: matrix('ok', 'ok', 'ok', '403'),
    send: (c) => c.get(`/api/prescriptions/${rxA.id}/export?format=geojson`),
  },
  {
    label: 'GET export of B',
    expect: matrix('ok', 'ok', '404', '403'),
    send: (c) => c.get(`/api/prescriptions/${rxB.id}/export?format=geojson`),
  },
  {
    label: 'GET export of another workspace',
    expect: matrix('404', '404', '404', '403'),
    send: (c) => c.get(`/api/prescriptions/${rxOther.id}/export?format=geojson`),
  },
  {
    label: 'GET /api/seed-orders of A',
    expect: matrix('ok', 'ok', 'ok', 'ok'),
    send: (c) => c.get(`/api/seed-orders?growerId=${w.a.grower.id}&year=2027`),
  },
  {
    label: 'GET /api/seed-orders of B',
    expect: matrix('ok', 'ok', '404', '404'),
    send: (c) => c.get(`/api/seed-orders?growerId=${w.b.grower.id}&year=2027`),
  },
  {
    label: 'GET /api/seed-orders of another workspace',
    expect: matrix('404', '404', '404', '404'),
    send: (c) => c.get(`/api/seed-orders?growerId=${other.a.grower.id}&year=2027`),
  },
  {
    label: 'POST new-version of another workspace',
    expect: matrix('404', '404', '403', '403'),
    send: (c) => c.post(`/api/prescriptions/${rxOther.id}/new-version`, {}),
  },
];

describe('products and prescriptions by role', () => {
  for (const role of ROLES) {
    it(`answers the ${role} as the matrix says`, async () => {
      const got: Record<string, string> = {};
      const want: Record<string, string> = {};
      for (const r of routes()) {
        got[r.label] = cell(await r.send(w.callers[role]));
        want[r.label] = r.expect[role];
      }
      expect(got).toEqual(want);
    });
  }

  it('lets only the office write a draft, and nothing of another workspace changes', async () => {
    const draft = await draftFor(
      w.callers.agronomist,
      w,
      (await halvesMap(w.callers.agronomist, w)).id,
      productId,
    );
    for (const role of ['farmer', 'consultant'] as const) {
      const c = w.callers[role];
      expect((await c.put(`/api/prescriptions/${draft.id}`, saveBody(draft, { West: 30_000 }))).status).toBe(
        403,
      );
      expect(
        (
          await c.post(`/api/prescriptions/${draft.id}/accept-check`, {
            version: draft.version,
            reason: 'long enough reason',
          })
        ).status,
      ).toBe(403);
      expect(
        (await c.post(`/api/prescriptions/${draft.id}/approve`, { version: draft.version })).status,
      ).toBe(403);
      expect((await del(c, `/api/prescriptions/${draft.id}?version=${draft.version}`)).status).toBe(403);
    }
    const foreign = await w.callers.agronomist.put(`/api/prescriptions/${rxOther.id}`, saveBody(rxOther, {}));
    expect(foreign.status).toBe(404);
    const still = expectRx(await other.callers.agronomist.get(`/api/prescriptions/${rxOther.id}`));
    expect(still.version).toBe(rxOther.version);
    expect(still.status).toBe('approved');
    // A prescription cannot be made from another workspace's zone map, nor with its product.
    const cross = await w.callers.agronomist.post('/api/prescriptions', {
      zoneMapId: rxOther.zoneMapId,
      productId,
      planterId: null,
      name: 'X',
      rateUnit: 'seeds/ac',
      defaultRateSi: perAc(30_000),
      outOfFieldRateSi: 0,
      minRateSi: perAc(20_000),
      maxRateSi: perAc(40_000),
    });
    expect(cross.status).toBe(404);
    const foreignProduct = await w.callers.agronomist.post('/api/prescriptions', {
      zoneMapId: draft.zoneMapId,
      productId: rxOther.product.id,
      planterId: null,
      name: 'X',
      rateUnit: 'seeds/ac',
      defaultRateSi: perAc(30_000),
      outOfFieldRateSi: 0,
      minRateSi: perAc(20_000),
      maxRateSi: perAc(40_000),
    });
    expect(foreignProduct.status).toBe(400);
    expect(foreignProduct.body.error.details[0].path).toEqual(['productId']);
  });
});
