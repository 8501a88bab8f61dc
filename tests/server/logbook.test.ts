import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import type { Prescription } from '../../shared/schemas/prescription.schema';
import { del } from './zone-maps.helpers';
import { approvedHalves, logCsvFor, settled, uploadLog } from './logs.helpers';

let t: TestApp;
let w: World;
let rx: Prescription;

beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'logbook');
  rx = await approvedHalves(w);
});
afterAll(() => t.close());

type Book = {
  total: { areaM2: number; quantity: number; distanceM: number; hours: number };
  seasons: { year: number; areaM2: number }[];
  entries: { kind: string; note: string; areaM2: number }[];
};
const book = async (): Promise<Book> =>
  (await w.callers.farmer.get(`/api/planters/${w.a.planter.id}/logbook`)).body;

describe('the planter logbook', () => {
  it('adds what each log planted, per season and in total, and takes a deleted log off with a note', async () => {
    expect((await book()).total.areaM2).toBe(0);
    const first = logCsvFor(rx, { noiseCv: 0.03 }, { seed: 1 });
    const second = logCsvFor(rx, { noiseCv: 0.03 }, { seed: 2 });
    const a = await settled(w.callers.farmer, (await uploadLog(w.callers.farmer, rx, first.bytes)).log.id);
    const b = await settled(w.callers.farmer, (await uploadLog(w.callers.farmer, rx, second.bytes)).log.id);
    expect([a.status, b.status]).toEqual(['ready', 'ready']);

    const both = await book();
    // Each synthetic log plants the whole field once (24 rows × 0.762 m swath): about the field's area each,
    // and distance × swath = area (derived).
    const field = rx.boundaryAreaM2;
    expect(both.total.areaM2 / (2 * field)).toBeGreaterThan(0.9);
    expect(both.total.areaM2 / (2 * field)).toBeLessThan(1.1);
    expect(both.total.distanceM * 24 * 0.762).toBeCloseTo(both.total.areaM2, -1);
    // Hours: distance ÷ speed (5 mph = 2.2352 m/s, NIST SP 811 exact) within the generator's 1 % speed noise.
    expect(both.total.hours * 3600 * 2.2352).toBeGreaterThan(both.total.distanceM * 0.95);
    expect(both.total.hours * 3600 * 2.2352).toBeLessThan(both.total.distanceM * 1.05);
    expect(both.seasons).toHaveLength(1);
    expect(both.seasons[0].year).toBe(2027);
    expect(both.entries.filter((e) => e.kind === 'log')).toHaveLength(2);

    const removed = await del(w.callers.agronomist, `/api/logs/${a.id}`);
    expect(removed.status).toBe(204);
    const after = await book();
    const deleted = after.entries.find((e) => e.kind === 'deleted')!;
    expect(deleted.note).toMatch(/deleted by Test agronomist/);
    expect(deleted.areaM2).toBeLessThan(0);
    const onlyB = both.entries.filter((e) => e.kind === 'log')[1].areaM2;
    expect(after.total.areaM2).toBeCloseTo(onlyB, 3);
  });

  it('cannot be edited by hand: the database refuses to change an entry, and no route writes one', async () => {
    await expect(t.sequelize.query('UPDATE planter_logbook SET area_m2 = 0')).rejects.toThrow(
      /cannot be changed/,
    );
    expect(
      (await w.callers.admin.post(`/api/planters/${w.a.planter.id}/logbook`, { areaM2: 1 })).status,
    ).toBe(404);
    // Another grower's planter stays hidden from the farmer.
    expect((await w.callers.farmer.get(`/api/planters/${w.b.planter.id}/logbook`)).status).toBe(404);
  });
});
