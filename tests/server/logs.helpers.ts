import { expect } from 'vitest';
import request from 'supertest';
import type { MultiPolygon } from 'geojson';
import type { Caller } from '../helpers/app';
import type { World } from '../helpers/factory';
import { logSchema, type ColumnMapping, type Log } from '../../shared/schemas/as-applied.schema';
import type { Prescription } from '../../shared/schemas/prescription.schema';
import { syntheticLog } from '../../shared/audit/synthetic-log';
import { logToCsv, readCsvHeader, suggestMapping } from '../../shared/audit/csv-log';
import { cornProduct, draftFor, expectRx, halvesMap, saveBody } from './prescriptions.helpers';

/** Grower A's field split in halves at 30 000 (west) and 36 000 (east) seeds/ac, approved. */
export async function approvedHalves(w: World): Promise<Prescription> {
  const agr = w.callers.agronomist;
  const product = await cornProduct(agr);
  const map = await halvesMap(agr, w);
  const draft = await draftFor(agr, w, map.id, product.id);
  const saved = expectRx(
    await agr.put(`/api/prescriptions/${draft.id}`, saveBody(draft, { West: 30_000, East: 36_000 })),
  );
  return expectRx(await agr.post(`/api/prescriptions/${draft.id}/approve`, { version: saved.version }));
}

type Faults = Parameters<typeof syntheticLog>[0]['faults'];

/** A synthetic log over the prescription's zones (24 × 30-in rows: 18.288 m swath), as CSV bytes. */
export function logCsvFor(
  rx: Prescription,
  faults: Faults = {},
  opts: { seed?: number; speedMps?: number } = {},
) {
  const log = syntheticLog({
    boundary: rx.boundary as MultiPolygon,
    zones: rx.zones.map((z) => ({ geometry: z.geometry as MultiPolygon, targetSi: z.rateSi })),
    defaultTargetSi: rx.defaultRateSi,
    swathM: 24 * 0.762,
    speedMps: opts.speedMps ?? 2.2352,
    hz: 1,
    startTime: Date.UTC(2027, 3, 28, 14) / 1000,
    seed: opts.seed ?? 7,
    faults,
  });
  return { log, bytes: Buffer.from(logToCsv(log), 'utf8') };
}

export function mappingOf(bytes: Uint8Array): ColumnMapping {
  const h = readCsvHeader(bytes);
  return suggestMapping(h.columns, h.sample);
}

/** POST /api/logs/preview with a file, as the upload page sends it. */
export const preview = (c: Caller, prescriptionId: string, bytes: Buffer, name = 'planting.csv') =>
  request(c.app)
    .post('/api/logs/preview')
    .set('Cookie', c.cookie)
    .set('X-Sowright-Request', '1')
    .field('prescriptionId', prescriptionId)
    .attach('file', bytes, name);

/** Uploads and starts a log; answers the log as created. */
export async function uploadLog(
  c: Caller,
  rx: Prescription,
  bytes: Buffer,
  meteredOn: 'wheel' | 'radar' | 'gnss' = 'gnss',
  name = 'planting.csv',
): Promise<{ status: number; log: Log }> {
  const p = await preview(c, rx.id, bytes, name);
  expect(p.status, JSON.stringify(p.body)).toBe(200);
  const res = await c.post('/api/logs', {
    fileId: p.body.fileId,
    prescriptionId: rx.id,
    planterId: rx.planter!.id,
    mapping: p.body.remembered ?? p.body.suggested,
    meteredOn,
  });
  expect([200, 201], JSON.stringify(res.body)).toContain(res.status);
  return { status: res.status, log: logSchema.parse(res.body) };
}

/** Polls the log until it is ready or failed (the import runs as a pg-boss job). */
export async function settled(c: Caller, id: string, timeoutMs = 60_000): Promise<Log> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const log = logSchema.parse((await c.get(`/api/logs/${id}`)).body);
    if (log.status === 'ready' || log.status === 'failed') return log;
    if (Date.now() > until) throw new Error(`log ${id} still ${log.status} after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 200));
  }
}
