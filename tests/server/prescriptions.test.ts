import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { prescriptionListSchema, seedOrderSchema } from '../../shared/schemas/prescription.schema';
import { rateFromSi } from '../../shared/rates/rate-units';
import { M2_PER_AC } from '../../shared/units';
import { del, getBytes, rel } from './zone-maps.helpers';
import { cornProduct, draftFor, expectRx, halvesMap, perAc, saveBody } from './prescriptions.helpers';

let t: TestApp;
let w: World;
let productId: string;
let zoneMapId: string;

beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'rx');
  productId = (await cornProduct(w.callers.agronomist)).id;
  zoneMapId = (await halvesMap(w.callers.agronomist, w)).id;
});
afterAll(() => t.close());

describe('a draft prescription', () => {
  it('copies the zones at the default rate and adds up to the field', async () => {
    const rx = await draftFor(w.callers.agronomist, w, zoneMapId, productId);
    expect(rx.status).toBe('draft');
    expect(rx.versionNo).toBe(1);
    const names = rx.zones.map((z) => z.name).sort();
    expect(names).toEqual(expect.arrayContaining(['East', 'West']));
    for (const z of rx.zones) expect(z.rateSi).toBeCloseTo(perAc(32_000), 12);
    // Zones plus the uncovered part are the boundary (ellipsoidal areas from PostGIS).
    const zoned = rx.zones.reduce((s, z) => s + z.areaM2, 0);
    expect(rel(zoned + rx.uncoveredAreaM2, rx.boundaryAreaM2)).toBeLessThan(1e-6);
    // Totals leave out slivers under 10 m² (shared/rates/totals.ts UNCOVERED_MIN_M2).
    expect(Math.abs(rx.totals.field.areaM2 - rx.boundaryAreaM2)).toBeLessThan(10);
    // The planter check runs for a seed product with a planter: 32 000 seeds/ac is deliverable.
    expect(rx.check?.blocking).toBe(false);
    expect(rx.check?.holesPerDisc).toBe(30);
  });

  it('saves rates with the version it read; a stale save answers 409 and changes nothing', async () => {
    const rx = await draftFor(w.callers.agronomist, w, zoneMapId, productId);
    const saved = expectRx(
      await w.callers.agronomist.put(
        `/api/prescriptions/${rx.id}`,
        saveBody(rx, { West: 30_000, East: 36_000 }),
      ),
    );
    expect(saved.version).toBeGreaterThan(rx.version);
    const east = saved.zones.find((z) => z.name === 'East')!;
    expect(rateFromSi(east.rateSi, 'seeds/ac')).toBeCloseTo(36_000, 6);

    const stale = await w.callers.agronomist.put(
      `/api/prescriptions/${rx.id}`,
      saveBody(rx, { West: 25_000 }),
    );
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale');
    const again = expectRx(await w.callers.agronomist.get(`/api/prescriptions/${rx.id}`));
    expect(rateFromSi(again.zones.find((z) => z.name === 'West')!.rateSi, 'seeds/ac')).toBeCloseTo(30_000, 6);
  });

  it('refuses a rate outside the bounds, naming the zone and where it is', async () => {
    const rx = await draftFor(w.callers.agronomist, w, zoneMapId, productId);
    const body = saveBody(rx, { East: 70_000 });
    const res = await w.callers.agronomist.put(`/api/prescriptions/${rx.id}`, body);
    expect(res.status).toBe(400);
    const i = body.rates.findIndex((r) => r.zoneId === rx.zones.find((z) => z.name === 'East')!.id);
    const detail = res.body.error.details.find(
      (d: { path: unknown[] }) => d.path.join('.') === `rates.${i}.rateSi`,
    );
    expect(detail.message).toMatch(/East/);
    expect(detail.message).toMatch(/70,000 seeds\/ac/);
    expect(detail.message).toMatch(/above the highest rate 60,000 seeds\/ac/);
  });

  it('refuses seed of another crop than the season’s', async () => {
    const soy = await w.callers.agronomist.post('/api/products', {
      kind: 'seed',
      name: 'Test soybean 2.8',
      crop: 'soybean',
      rateKind: 'count',
      unitName: 'unit',
      unitSize: 140_000,
      pricePerUnit: 60,
    });
    expect(soy.status).toBe(201);
    const res = await w.callers.agronomist.post('/api/prescriptions', {
      zoneMapId,
      productId: soy.body.id,
      planterId: null,
      name: 'Wrong crop',
      rateUnit: 'seeds/ac',
      defaultRateSi: perAc(140_000),
      outOfFieldRateSi: 0,
      minRateSi: perAc(100_000),
      maxRateSi: perAc(180_000),
    });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toEqual(['productId']);
    expect(res.body.error.details[0].message).toMatch(/soybean seed, but this season grows corn/);
  });
});

describe('the planter check and approval', () => {
  it('flags a rate the disc cannot deliver at the planned speed and blocks approval until accepted', async () => {
    // World planter: 30-in rows, 30-hole disc, 45 rpm top, planned 5 mph (tests/helpers/factory.ts).
    // Top rate at 5 mph = (45 × 30 / 60) / (0.762 m × 2.2352 m/s) = 13.2101 seeds/m² = 53 459 seeds/ac
    // (DOMAIN.md §4, derived), so 56 000 is flagged.
    const rx = await draftFor(w.callers.agronomist, w, zoneMapId, productId);
    const saved = expectRx(
      await w.callers.agronomist.put(`/api/prescriptions/${rx.id}`, saveBody(rx, { East: 56_000 })),
    );
    const east = saved.zones.find((z) => z.name === 'East')!;
    const zc = saved.check!.zones.find((z) => z.zoneId === east.id)!;
    expect(zc.status).toBe('flagged');
    const expectedFastest = (45 * 30) / 60 / (perAc(56_000) * 0.762);
    expect(zc.fastestSpeedMps).toBeCloseTo(expectedFastest, 9);
    expect(saved.check!.blocking).toBe(true);

    const blocked = await w.callers.agronomist.post(`/api/prescriptions/${rx.id}/approve`, {
      version: saved.version,
    });
    expect(blocked.status).toBe(409);
    expect(blocked.body.error.code).toBe('check_not_accepted');
    expect(blocked.body.error.message).toMatch(/East/);

    const short = await w.callers.agronomist.post(`/api/prescriptions/${rx.id}/accept-check`, {
      version: saved.version,
      reason: 'ok',
    });
    expect(short.status).toBe(400);
    const accepted = expectRx(
      await w.callers.agronomist.post(`/api/prescriptions/${rx.id}/accept-check`, {
        version: saved.version,
        reason: 'The grower will slow to 4 mph on the east half; checked with him.',
      }),
    );
    expect(accepted.acceptance?.zoneIds).toContain(east.id);
    expect(accepted.acceptance?.acceptedBy.name).toBe('Test agronomist');

    // A changed flagged rate voids the acceptance.
    const changed = expectRx(
      await w.callers.agronomist.put(`/api/prescriptions/${rx.id}`, saveBody(accepted, { East: 57_000 })),
    );
    expect(changed.acceptance).toBeNull();
    const fixed = expectRx(
      await w.callers.agronomist.put(`/api/prescriptions/${rx.id}`, saveBody(changed, { East: 36_000 })),
    );
    expect(fixed.check!.blocking).toBe(false);
    const approved = expectRx(
      await w.callers.agronomist.post(`/api/prescriptions/${rx.id}/approve`, { version: fixed.version }),
    );
    expect(approved.status).toBe('approved');
  });

  it('approval freezes the version, keeps who and when, and e-mails the grower’s farmer', async () => {
    const rx = await draftFor(w.callers.agronomist, w, zoneMapId, productId);
    const approved = expectRx(
      await w.callers.agronomist.post(`/api/prescriptions/${rx.id}/approve`, { version: rx.version }),
    );
    expect(approved.approvedBy?.name).toBe('Test agronomist');
    expect(Date.parse(approved.approvedAt!)).toBeGreaterThan(Date.now() - 60_000);

    const mail = await t.mailbox.waitFor(
      (m) => m.to.includes(w.people.farmer.email) && m.text.includes(rx.id),
    );
    expect(mail.subject).toMatch(/Ready to export/);
    expect(mail.text).toContain(`http://sowright.test/prescriptions/${rx.id}`);
    expect(mail.text).toMatch(/Treated seed is a pesticide/);

    const frozen = await w.callers.agronomist.put(
      `/api/prescriptions/${rx.id}`,
      saveBody(approved, { West: 30_000 }),
    );
    expect(frozen.status).toBe(409);
    expect(frozen.body.error.code).toBe('frozen');

    // Editing makes version 2; approving it replaces version 1.
    const v2 = expectRx(await w.callers.agronomist.post(`/api/prescriptions/${rx.id}/new-version`, {}), 201);
    expect(v2.versionNo).toBe(2);
    expect(v2.lineageId).toBe(rx.lineageId);
    expect(v2.status).toBe('draft');
    const twice = await w.callers.agronomist.post(`/api/prescriptions/${rx.id}/new-version`, {});
    expect(twice.status).toBe(409);
    expect(twice.body.error.code).toBe('draft_exists');
    const v2saved = expectRx(
      await w.callers.agronomist.put(`/api/prescriptions/${v2.id}`, saveBody(v2, { West: 30_000 })),
    );
    expectRx(
      await w.callers.agronomist.post(`/api/prescriptions/${v2.id}/approve`, { version: v2saved.version }),
    );
    const v1 = expectRx(await w.callers.agronomist.get(`/api/prescriptions/${rx.id}`));
    expect(v1.status).toBe('superseded');
    expect(v1.supersededAt).not.toBeNull();
    // Version 1 keeps its rates.
    for (const z of v1.zones) expect(z.rateSi).toBeCloseTo(perAc(32_000), 12);
  });

  it('lets the farmer export an approved version but not a draft, and never change rates', async () => {
    const rx = await draftFor(w.callers.agronomist, w, zoneMapId, productId);
    const draftExport = await w.callers.farmer.get(`/api/prescriptions/${rx.id}/export?format=geojson`);
    expect(draftExport.status).toBe(409);
    expect(draftExport.body.error.code).toBe('not_approved');
    const put = await w.callers.farmer.put(`/api/prescriptions/${rx.id}`, saveBody(rx, { West: 30_000 }));
    expect(put.status).toBe(403);
    const approve = await w.callers.consultant.post(`/api/prescriptions/${rx.id}/approve`, {
      version: rx.version,
    });
    expect(approve.status).toBe(403);

    expectRx(await w.callers.agronomist.post(`/api/prescriptions/${rx.id}/approve`, { version: rx.version }));
    const file = await getBytes(w.callers.farmer, `/api/prescriptions/${rx.id}/export?format=geojson`);
    expect(file.status).toBe(200);
    expect(file.headers['content-type']).toMatch(/application\/geo\+json/);
    const fc = JSON.parse((file.body as Buffer).toString('utf8'));
    expect(fc.features).toHaveLength(rx.zones.length);
    const consultant = await w.callers.consultant.get(`/api/prescriptions/${rx.id}/export?format=geojson`);
    expect(consultant.status).toBe(403);
    // The farmer's list of what is ready to export holds it.
    const list = prescriptionListSchema.parse(
      (await w.callers.farmer.get('/api/prescriptions?status=approved')).body,
    );
    expect(list.items.map((i) => i.id)).toContain(rx.id);
  });

  it('deletes a draft only with its version', async () => {
    const rx = await draftFor(w.callers.agronomist, w, zoneMapId, productId);
    expect(
      (await del(w.callers.agronomist, `/api/prescriptions/${rx.id}?version=${rx.version + 1}`)).status,
    ).toBe(409);
    expect(
      (await del(w.callers.agronomist, `/api/prescriptions/${rx.id}?version=${rx.version}`)).status,
    ).toBe(204);
    expect((await w.callers.agronomist.get(`/api/prescriptions/${rx.id}`)).status).toBe(404);
  });
});

describe('scope', () => {
  it('hides another grower’s prescriptions from the farmer and the consultant', async () => {
    const map = await w.callers.agronomist.post('/api/zone-maps', {
      fieldId: w.b.field.id,
      seasonId: w.b.season.id,
      name: 'B zones',
    });
    expect(map.status).toBe(201);
    const rx = await w.callers.agronomist.post('/api/prescriptions', {
      zoneMapId: map.body.id,
      productId,
      planterId: w.b.planter.id,
      name: 'B rates',
      rateUnit: 'seeds/ac',
      defaultRateSi: perAc(32_000),
      outOfFieldRateSi: 0,
      minRateSi: perAc(20_000),
      maxRateSi: perAc(40_000),
    });
    expect(rx.status).toBe(201);
    for (const who of [w.callers.farmer, w.callers.consultant]) {
      expect((await who.get(`/api/prescriptions/${rx.body.id}`)).status).toBe(404);
      const list = prescriptionListSchema.parse((await who.get('/api/prescriptions')).body);
      expect(list.items.every((i) => i.growerId === w.a.grower.id)).toBe(true);
      expect((await who.get(`/api/seed-orders?growerId=${w.b.grower.id}&year=2027`)).status).toBe(404);
    }
    // A planter of grower A cannot be used on grower B's field.
    const wrong = await w.callers.agronomist.post('/api/prescriptions', {
      zoneMapId: map.body.id,
      productId,
      planterId: w.a.planter.id,
      name: 'B rates',
      rateUnit: 'seeds/ac',
      defaultRateSi: perAc(32_000),
      outOfFieldRateSi: 0,
      minRateSi: perAc(20_000),
      maxRateSi: perAc(40_000),
    });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.details[0].path).toEqual(['planterId']);
  });
});

describe('the seed order', () => {
  it('adds up the approved prescriptions of the grower’s year, rounded per field and across fields', async () => {
    const order = seedOrderSchema.parse(
      (await w.callers.consultant.get(`/api/seed-orders?growerId=${w.a.grower.id}&year=2027`)).body,
    );
    const line = order.lines.find((l) => l.product.id === productId)!;
    expect(line.fields.length).toBeGreaterThan(0);
    // Only one version of each prescription counts, and only approved ones.
    expect(line.fields.every((f) => f.status === 'approved')).toBe(true);
    const seeds = line.fields.reduce((s, f) => s + f.quantity, 0);
    expect(line.quantity).toBeCloseTo(seeds, 3);
    expect(line.unitsAcrossFields).toBe(Math.ceil(seeds / 80_000)); // DOMAIN.md §3: 80 000 seeds a corn unit
    expect(line.unitsByField).toBe(line.fields.reduce((s, f) => s + Math.ceil(f.quantity / 80_000), 0));
    expect(line.cost).toBeCloseTo(line.unitsAcrossFields * 300, 6);
    // A field at a flat 32 000 seeds/ac: seeds = 32 000 × area in acres.
    const flat = line.fields.find((f) => Math.abs(rateFromSi(f.meanRateSi, 'seeds/ac') - 32_000) < 1e-6)!;
    expect(flat.quantity).toBeCloseTo((32_000 * flat.areaM2) / M2_PER_AC, 3);

    const csv = await getBytes(
      w.callers.farmer,
      `/api/seed-orders?growerId=${w.a.grower.id}&year=2027&format=csv`,
    );
    expect(csv.status).toBe(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    const text = (csv.body as Buffer).toString('utf8');
    expect(text.split('\n')[0]).toMatch(/grower,year,product,crop,farm,field,prescription,area_ac/);
    expect(text).toContain(`TOTAL`);
    expect(text).toContain(`,${line.unitsAcrossFields},unit,`);
  });
});
