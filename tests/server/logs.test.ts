import { afterAll, beforeAll, describe, expect, it, onTestFinished } from 'vitest';
import { QueryTypes } from 'sequelize';
import { VectorTile } from '@mapbox/vector-tile';
import Pbf from 'pbf';
import { startTestApp, type TestApp } from '../helpers/app';
import { makeWorld, type World } from '../helpers/factory';
import { auditSchema, CLEANING_STEPS } from '../../shared/schemas/as-applied.schema';
import type { Prescription } from '../../shared/schemas/prescription.schema';
import { del, getBytes } from './zone-maps.helpers';
import { shapefileOf, zipShapefile } from './imports-support';
import { approvedHalves, logCsvFor, mappingOf, preview, settled, uploadLog } from './logs.helpers';
import { perAc } from './prescriptions.helpers';
import { storeSettings } from '../../server/logs/store-points';

const SPLIT_ROWS = storeSettings.splitRows;

let t: TestApp;
let w: World;
let rx: Prescription;

beforeAll(async () => {
  t = await startTestApp();
  w = await makeWorld(t.app, 'logs');
  rx = await approvedHalves(w);
});
afterAll(() => t.close());

const pointCount = async (logId: string) =>
  (
    await t.sequelize.query<{ n: number }>(
      'SELECT count(*)::int AS n FROM as_applied_points WHERE log_id = :logId',
      {
        replacements: { logId },
        type: QueryTypes.SELECT,
      },
    )
  )[0].n;

/** The agronomist reads a log again with its cleaning settings and another band; answers it when ready. */
async function readAgain(log: { id: string; version: number; cleaning: unknown }, bandFraction: number) {
  const res = await w.callers.agronomist.post(`/api/logs/${log.id}/clean`, {
    version: log.version,
    cleaning: log.cleaning,
    bandFraction,
  });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  const done = await settled(w.callers.agronomist, log.id);
  expect(done.status).toBe('ready');
  return done;
}

describe('importing a log', () => {
  it('reads, cleans and audits a CSV in the background, keeps every point once, and e-mails the farmer', async () => {
    const { bytes } = logCsvFor(rx, { noiseCv: 0.03 });
    const { log, status } = await uploadLog(w.callers.farmer, rx, bytes);
    expect(status).toBe(201);
    const done = await settled(w.callers.farmer, log.id);
    expect(done.status, JSON.stringify(done.error)).toBe('ready');
    expect(done.pointsRead).toBeGreaterThan(500);
    expect(done.pointsKept).toBeLessThanOrEqual(done.pointsRead!);
    expect(done.cleaningReport!.map((s) => s.step)).toEqual([...CLEANING_STEPS]);
    expect(await pointCount(log.id)).toBe(done.pointsRead);

    const audit = auditSchema.parse((await w.callers.farmer.get(`/api/logs/${log.id}/audit`)).body);
    expect(audit.status).toBe('open');
    // 3 % noise against a ±15 % band: P(|Z| ≤ 5) ≈ 1 (normal distribution; derived), so nearly all in band.
    expect(audit.result.field.inBandShare).toBeGreaterThan(0.97);
    expect(Math.abs(audit.result.field.biasPct)).toBeLessThan(1);
    expect(audit.result.zones.map((z) => z.name).sort()).toEqual(expect.arrayContaining(['East', 'West']));
    const east = audit.result.zones.find((z) => z.name === 'East')!;
    expect(east.stats.meanTargetSi).toBeCloseTo(perAc(36_000), 6);

    const mail = await t.mailbox.waitFor(
      (m) => m.to.includes(w.people.farmer.email) && m.text.includes(log.id),
    );
    expect(mail.subject).toMatch(/Planting audit ready/);
  });

  it('answers the same log when the same file comes twice', async () => {
    const { bytes } = logCsvFor(rx, { noiseCv: 0.03 }, { seed: 21 });
    const first = await uploadLog(w.callers.agronomist, rx, bytes);
    expect(first.status).toBe(201);
    const again = await preview(w.callers.farmer, rx.id, bytes, 'same-bytes-other-name.csv');
    expect(again.body.existingLogId).toBe(first.log.id);
    const second = await uploadLog(w.callers.farmer, rx, bytes, 'gnss', 'same-bytes-other-name.csv');
    expect(second.status).toBe(200);
    expect(second.log.id).toBe(first.log.id);
    const [{ n }] = await t.sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM as_applied_logs l JOIN log_files f ON f.id = l.file_id
        WHERE l.id = :id OR f.sha256 = (SELECT sha256 FROM log_files WHERE id = (SELECT file_id FROM as_applied_logs WHERE id = :id))`,
      { replacements: { id: first.log.id }, type: QueryTypes.SELECT },
    );
    expect(n).toBe(1);
    await settled(w.callers.farmer, first.log.id);
  });

  it('fails a log with a bad line, names the line, and stores none of its points', async () => {
    const { bytes } = logCsvFor(rx, { noiseCv: 0.03 }, { seed: 33 });
    const lines = bytes.toString('utf8').split('\n');
    const mapping = mappingOf(bytes);
    const header = lines[0].split(',');
    const col = header.indexOf(mapping.fields.applied!.column);
    const cells = lines[150].split(',');
    cells[col] = 'abc';
    lines[150] = cells.join(',');
    const { log } = await uploadLog(w.callers.farmer, rx, Buffer.from(lines.join('\n')));
    const done = await settled(w.callers.farmer, log.id);
    expect(done.status).toBe('failed');
    expect(done.error?.line).toBe(151); // lines[150] is the 151st line of the file
    expect(done.error?.message).toMatch(/abc/);
    expect(await pointCount(log.id)).toBe(0);
  });

  it('reads a failed file again when it is mapped anew: same log, no second one', async () => {
    const { bytes } = logCsvFor(rx, { noiseCv: 0.03 }, { seed: 35 });
    const mapping = mappingOf(bytes);
    const wrong = {
      ...mapping,
      fields: {
        ...mapping.fields,
        time: { ...mapping.fields.time!, unit: mapping.fields.time!.unit === 'iso' ? 'epoch-ms' : 'iso' },
      },
    };
    const p = await preview(w.callers.farmer, rx.id, bytes);
    const first = await w.callers.farmer.post('/api/logs', {
      fileId: p.body.fileId,
      prescriptionId: rx.id,
      planterId: rx.planter!.id,
      mapping: wrong,
      meteredOn: 'gnss',
    });
    expect(first.status).toBe(201);
    const failed = await settled(w.callers.farmer, first.body.id);
    expect(failed.status).toBe('failed');
    const again = await w.callers.farmer.post('/api/logs', {
      fileId: p.body.fileId,
      prescriptionId: rx.id,
      planterId: rx.planter!.id,
      mapping,
      meteredOn: 'gnss',
    });
    expect(again.status).toBe(200);
    expect(again.body.id).toBe(first.body.id);
    const fixed = await settled(w.callers.farmer, first.body.id);
    expect(fixed.status, JSON.stringify(fixed.error)).toBe('ready');
    expect(await pointCount(fixed.id)).toBe(fixed.pointsRead);
  });

  it('stores nothing half when the database connection dies mid-storage, and a retry stores exactly one copy', async () => {
    // Points in two parts, the second COPYed and committed on a connection of its own: it must go too.
    storeSettings.splitRows = 1000;
    onTestFinished(() => {
      storeSettings.splitRows = SPLIT_ROWS;
    });
    const { bytes } = logCsvFor(rx, { noiseCv: 0.03 }, { seed: 44, speedMps: 0.95 });
    const { log } = await uploadLog(w.callers.agronomist, rx, bytes);
    // Wait for the storing step, then kill the import's own connection (as a crash of the database would).
    let killed = 0;
    for (let i = 0; i < 3000 && killed === 0; i++) {
      const rows = await t.sequelize.query<{ n: number }>(
        `SELECT count(pg_terminate_backend(pid))::int AS n FROM pg_stat_activity
          WHERE application_name = 'sowright-log-import' AND state <> 'idle'`,
        { type: QueryTypes.SELECT },
      );
      killed = rows[0].n;
      if (!killed) await new Promise((r) => setTimeout(r, 5));
    }
    expect(killed).toBeGreaterThan(0);
    const failed = await settled(w.callers.agronomist, log.id);
    expect(failed.status).toBe('failed');
    expect(await pointCount(log.id)).toBe(0);
    // No table of the log is left behind (the cells' table is committed apart, and dropped on failure).
    const [{ left }] = await t.sequelize.query<{ left: number }>(
      `SELECT count(*)::int AS left FROM pg_class WHERE relkind IN ('r', 'p') AND relname LIKE :pattern`,
      { replacements: { pattern: `as_applied_%_${log.id.replace(/-/g, '')}%` }, type: QueryTypes.SELECT },
    );
    expect(left).toBe(0);

    const done = await readAgain(failed, 0.15);
    expect(done.pointsRead).toBeGreaterThan(1000);
    expect(await pointCount(log.id)).toBe(done.pointsRead);
    expect(await seqSpan(log.id)).toEqual({
      n: done.pointsRead,
      distinct: done.pointsRead,
      lo: 0,
      hi: done.pointsRead! - 1,
    });
  });
});

/** Every point once: as many distinct `seq` as rows, from 0 without a gap. */
const seqSpan = async (logId: string) => {
  const [r] = await t.sequelize.query<{ n: number; distinct: number; lo: number; hi: number }>(
    `SELECT count(*)::int AS n, count(DISTINCT seq)::int AS distinct, min(seq) AS lo, max(seq) AS hi
       FROM as_applied_points WHERE log_id = :id`,
    { replacements: { id: logId }, type: QueryTypes.SELECT },
  );
  return r;
};

describe('where a log is stored', () => {
  const tables = async (logId: string) =>
    t.sequelize.query<{ relname: string; parent: string | null; rows: number }>(
      `SELECT c.relname, p.relname AS parent, c.reltuples::int AS rows
         FROM pg_class c LEFT JOIN pg_inherits i ON i.inhrelid = c.oid LEFT JOIN pg_class p ON p.oid = i.inhparent
        WHERE c.relkind IN ('r', 'p') AND c.relname LIKE :pattern ORDER BY c.relname`,
      { replacements: { pattern: `as_applied_%_${logId.replace(/-/g, '')}%` }, type: QueryTypes.SELECT },
    );

  it('keeps each log in partitions of its own, replaced whole by a re-read and dropped with the log', async () => {
    const { bytes, log: written } = logCsvFor(rx, { noiseCv: 0.03 }, { seed: 61 });
    const { log } = await uploadLog(w.callers.agronomist, rx, bytes);
    const done = await settled(w.callers.agronomist, log.id);
    expect(done.status).toBe('ready');
    const hex = log.id.replace(/-/g, '');
    // Below the split size: the points' table holds one part.
    expect(done.pointsRead!).toBeLessThan(SPLIT_ROWS);
    expect((await tables(log.id)).map((r) => [r.relname, r.parent])).toEqual([
      [`as_applied_cells_${hex}`, 'as_applied_cells'],
      [`as_applied_points_${hex}`, 'as_applied_points'],
      [`as_applied_points_${hex}_0`, `as_applied_points_${hex}`],
    ]);
    const before = await pointCount(log.id);
    expect(before).toBe(done.pointsRead);

    // Read again with another band, its points now in two parts written at once: the same points, once, in
    // a partition of the same name; no table left over.
    storeSettings.splitRows = 1000;
    onTestFinished(() => {
      storeSettings.splitRows = SPLIT_ROWS;
    });
    await readAgain(done, 0.1);
    expect(await pointCount(log.id)).toBe(before);
    expect(await seqSpan(log.id)).toEqual({ n: before, distinct: before, lo: 0, hi: before - 1 });
    const parts = await tables(log.id);
    expect(parts.map((r) => [r.relname, r.parent])).toEqual([
      [`as_applied_cells_${hex}`, 'as_applied_cells'],
      [`as_applied_points_${hex}`, 'as_applied_points'],
      [`as_applied_points_${hex}_0`, `as_applied_points_${hex}`],
      [`as_applied_points_${hex}_1`, `as_applied_points_${hex}`],
    ]);
    const [half] = await t.sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM "as_applied_points_${hex}_0"`,
      { type: QueryTypes.SELECT },
    );
    expect(half.n).toBe(Math.ceil(before / 2));
    // The stored points are where the file put them: the first row's position, as written (rounded to the
    // file's decimals), to 1e-7 degree (about 1 cm).
    const [row] = await t.sequelize.query<{ lon: number; lat: number; seq: number }>(
      `SELECT ST_X(geom) AS lon, ST_Y(geom) AS lat, seq FROM as_applied_points WHERE log_id = :id ORDER BY seq LIMIT 1`,
      { replacements: { id: log.id }, type: QueryTypes.SELECT },
    );
    expect(row.seq).toBe(0);
    expect(row.lon).toBeCloseTo(written.lon[0], 7);
    expect(row.lat).toBeCloseTo(written.lat[0], 7);

    const removed = await del(w.callers.agronomist, `/api/logs/${log.id}`);
    expect(removed.status).toBe(204);
    expect(await tables(log.id)).toEqual([]);
    expect(await pointCount(log.id)).toBe(0);
  });
});

describe('the audit', () => {
  it('finds the seed a slipping wheel added that the log does not show (DOMAIN.md §5)', async () => {
    const { bytes } = logCsvFor(rx, { slip: { fraction: 0.1 }, noiseCv: 0.02 }, { seed: 55 });
    const { log } = await uploadLog(w.callers.agronomist, rx, bytes, 'wheel');
    const done = await settled(w.callers.agronomist, log.id);
    expect(done.status, JSON.stringify(done.error)).toBe('ready');
    const audit = auditSchema.parse((await w.callers.agronomist.get(`/api/logs/${log.id}/audit`)).body);
    const speed = audit.result.speed!;
    expect(speed.meteredOn).toBe('wheel');
    expect(speed.meanSlip).toBeCloseTo(0.1, 2);
    // 10 % slip: true population = target / (1 − 0.1) = +11.1 %, not +10 % (DOMAIN.md §5, derived).
    expect(speed.populationError).toBeGreaterThan(0.106);
    expect(speed.populationError).toBeLessThan(0.116);
    // The log itself shows about the target.
    expect(Math.abs(audit.result.field.biasPct)).toBeLessThan(1);
    expect(audit.result.fieldTrue!.biasPct).toBeGreaterThan(10.6);
    expect(speed.unitsHidden).toBeGreaterThan(0);
    expect(audit.result.findings[0].kind).toBe('speed-source');
    expect(audit.result.findings[0].text).toMatch(/wheel/i);

    const csv = await getBytes(w.callers.consultant, `/api/logs/${log.id}/audit/zones.csv`);
    expect(csv.status).toBe(200);
    const text = (csv.body as Buffer).toString('utf8');
    expect(text).toMatch(/Whole field/);
    expect(text).toMatch(/true_bias_pct/);
  });

  it('serves the kept points as vector tiles with the error of each point', async () => {
    const [log] = (await w.callers.consultant.get('/api/logs')).body.items.filter(
      (l: { status: string }) => l.status === 'ready',
    );
    // The tiles holding a point inside the field (tests/helpers/factory.ts: −93.6 … −93.595, 42.0 … 42.005):
    // zooms 15 and 18 are served from the cells averaged at import (zoom 15 from zoom 14's), zoom 19 from
    // the stored points.
    const lon = -93.5975;
    const lat = 42.0025;
    for (const z of [15, 18, 19]) {
      const x = Math.floor(((lon + 180) / 360) * 2 ** z); // the slippy-map tile formula (from memory)
      const y = Math.floor(
        ((1 - Math.log(Math.tan((lat * Math.PI) / 180) + 1 / Math.cos((lat * Math.PI) / 180)) / Math.PI) /
          2) *
          2 ** z,
      );
      const res = await getBytes(w.callers.consultant, `/api/logs/${log.id}/tiles/${z}/${x}/${y}`);
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toMatch(/vnd.mapbox-vector-tile/);
      const tile = new VectorTile(new Pbf(res.body as Buffer));
      const layer = tile.layers.points;
      expect(layer.length).toBeGreaterThan(10);
      const errs: number[] = [];
      for (let i = 0; i < layer.length; i++) {
        const p = layer.feature(i).properties;
        expect(typeof p.applied).toBe('number');
        errs.push(Number(p.err));
        // err is applied against target in % (to 0.01; the rates travel as single-precision floats).
        const err = (100 * (Number(p.applied) - Number(p.target))) / Number(p.target);
        expect(Math.abs(Number(p.err) - err)).toBeLessThan(0.02);
        const [px, py] = layer
          .feature(i)
          .loadGeometry()[0]
          .map((pt) => [pt.x, pt.y])[0];
        expect(px).toBeGreaterThanOrEqual(0);
        expect(py).toBeLessThanOrEqual(layer.extent);
        // Zoom 15 shows its quarter of zoom 14's cells: 64 a side, centres on a 64-unit grid of the 4096 extent.
        if (z === 15) expect([px % 64, py % 64]).toEqual([32, 32]);
        if (z === 18) expect([px % 32, py % 32]).toEqual([16, 16]);
      }
      // The logged rate was on target: errors centre near zero at every zoom.
      const mean = errs.reduce((a, b) => a + b, 0) / errs.length;
      expect(Math.abs(mean)).toBeLessThan(3);
    }
    // A log read before the cells existed (none stored), or before zoom 18 had them, still gets those tiles,
    // from the points.
    // Tiles not asked for above (the server keeps tiles it made, by log version): zoom 14, and the zoom 18
    // tile of another corner of the field.
    const tileAt = async (z: number) => {
      const [tLon, tLat] = z === 18 ? [-93.5995, 42.0005] : [lon, lat];
      const x = Math.floor(((tLon + 180) / 360) * 2 ** z);
      const y = Math.floor(
        ((1 - Math.log(Math.tan((tLat * Math.PI) / 180) + 1 / Math.cos((tLat * Math.PI) / 180)) / Math.PI) /
          2) *
          2 ** z,
      );
      const res = await getBytes(w.callers.consultant, `/api/logs/${log.id}/tiles/${z}/${x}/${y}`);
      return new VectorTile(new Pbf(res.body as Buffer)).layers.points;
    };
    for (const [where, z] of [
      ['z = 18', 18],
      ['true', 14],
    ] as const) {
      await t.sequelize.query(`DELETE FROM as_applied_cells WHERE log_id = :id AND ${where}`, {
        replacements: { id: log.id },
      });
      expect((await tileAt(z)).length).toBeGreaterThan(10);
    }
  });
});

describe('roles', () => {
  it('lets the consultant comment and sign off but not upload; a signed-off audit is frozen', async () => {
    const { bytes } = logCsvFor(rx, { noiseCv: 0.03 }, { seed: 66 });
    expect((await preview(w.callers.consultant, rx.id, bytes)).status).toBe(403);
    const { log } = await uploadLog(w.callers.farmer, rx, bytes);
    const done = await settled(w.callers.farmer, log.id);
    const c = await w.callers.consultant.post(`/api/logs/${log.id}/audit/comments`, {
      body: 'Row 7 looks light; check the meter.',
    });
    expect(c.status).toBe(201);
    expect(auditSchema.parse(c.body).comments[0].author.role).toBe('consultant');
    const audit = auditSchema.parse(c.body);
    expect(
      (await w.callers.farmer.post(`/api/logs/${log.id}/audit/sign-off`, { version: audit.version })).status,
    ).toBe(403);
    expect(
      (await w.callers.agronomist.post(`/api/logs/${log.id}/audit/sign-off`, { version: audit.version }))
        .status,
    ).toBe(403);
    const signed = await w.callers.consultant.post(`/api/logs/${log.id}/audit/sign-off`, {
      version: audit.version,
    });
    expect(signed.status, JSON.stringify(signed.body)).toBe(200);
    expect(signed.body.status).toBe('signed-off');
    expect(signed.body.signedOffBy.name).toBe('Test consultant');
    const again = await w.callers.farmer.post(`/api/logs/${log.id}/clean`, {
      version: done.version,
      cleaning: done.cleaning,
      bandFraction: 0.1,
    });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('frozen');
    const mail = await t.mailbox.waitFor(
      (m) => m.to.includes(w.people.farmer.email) && /signed off/.test(m.subject) && m.text.includes(log.id),
    );
    expect(mail.text).toMatch(/will not change/);
  });

  it('shows the farmer and the consultant only their growers’ logs', async () => {
    const map = await w.callers.agronomist.post('/api/zone-maps', {
      fieldId: w.b.field.id,
      seasonId: w.b.season.id,
      name: 'B',
    });
    const product = (await w.callers.agronomist.get('/api/products')).body.items[0];
    const made = await w.callers.agronomist.post('/api/prescriptions', {
      zoneMapId: map.body.id,
      productId: product.id,
      planterId: w.b.planter.id,
      name: 'B',
      rateUnit: 'seeds/ac',
      defaultRateSi: perAc(32_000),
      outOfFieldRateSi: 0,
      minRateSi: perAc(20_000),
      maxRateSi: perAc(40_000),
    });
    const rxB = (
      await w.callers.agronomist.post(`/api/prescriptions/${made.body.id}/approve`, {
        version: made.body.version,
      })
    ).body as Prescription;
    const { bytes } = logCsvFor(rxB, { noiseCv: 0.03 }, { seed: 77 });
    const { log } = await uploadLog(w.callers.agronomist, rxB, bytes);
    for (const who of [w.callers.farmer, w.callers.consultant]) {
      expect((await who.get(`/api/logs/${log.id}`)).status).toBe(404);
      expect((await who.get(`/api/logs/${log.id}/audit`)).status).toBe(404);
      const list = (await who.get('/api/logs')).body.items as { growerId: string }[];
      expect(list.length).toBeGreaterThan(0);
      expect(list.every((l) => l.growerId === w.a.grower.id)).toBe(true);
    }
    // The farmer cannot upload against another grower's prescription either.
    expect((await preview(w.callers.farmer, rxB.id, bytes)).status).toBe(400);
    await settled(w.callers.agronomist, log.id);
  });
});

describe('other formats', () => {
  it('reads GeoJSON points with the same mapping step', async () => {
    const { bytes } = logCsvFor(rx, { noiseCv: 0.03 }, { seed: 88 });
    const lines = bytes.toString('utf8').trim().split('\n');
    const header = lines[0].split(',');
    const lonCol = header.findIndex((h) => /^lon/i.test(h));
    const latCol = header.findIndex((h) => /^lat/i.test(h));
    const features = lines.slice(1).map((line) => {
      const cells = line.split(',');
      const properties = Object.fromEntries(
        header
          .map((h, i) => [
            h,
            i === lonCol || i === latCol
              ? undefined
              : /^-?[\d.]+(e-?\d+)?$/i.test(cells[i])
                ? Number(cells[i])
                : cells[i],
          ])
          .filter(([, v]) => v !== undefined),
      );
      return {
        type: 'Feature',
        geometry: { type: 'Point', coordinates: [Number(cells[lonCol]), Number(cells[latCol])] },
        properties,
      };
    });
    const geojson = Buffer.from(JSON.stringify({ type: 'FeatureCollection', features }));
    const p = await preview(w.callers.farmer, rx.id, geojson, 'planting.geojson');
    expect(p.status, JSON.stringify(p.body)).toBe(200);
    expect(p.body.format).toBe('geojson');
    expect(p.body.columns.slice(0, 2)).toEqual(['longitude', 'latitude']);
    const res = await w.callers.farmer.post('/api/logs', {
      fileId: p.body.fileId,
      prescriptionId: rx.id,
      planterId: rx.planter!.id,
      mapping: p.body.suggested,
      meteredOn: 'gnss',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const done = await settled(w.callers.farmer, res.body.id);
    expect(done.status, JSON.stringify(done.error)).toBe('ready');
    expect(done.pointsRead).toBe(features.length);
  });

  it('reads a zipped point shapefile (written by GDAL) with short dBASE column names mapped by hand', async () => {
    const { bytes } = logCsvFor(rx, { noiseCv: 0.03 }, { seed: 99 });
    const mapping = mappingOf(bytes);
    const lines = bytes.toString('utf8').trim().split('\n');
    const header = lines[0].split(',');
    const col = (f: keyof typeof mapping.fields) => header.indexOf(mapping.fields[f]!.column);
    // dBASE names are at most 10 characters: the person maps these short names to their meaning.
    const short = { time: 'time', target: 'target', applied: 'applied' } as const;
    const features = lines.slice(1).map((line) => {
      const cells = line.split(',');
      return {
        type: 'Feature',
        geometry: { type: 'Point', coordinates: [Number(cells[col('lon')]), Number(cells[col('lat')])] },
        properties: {
          [short.time]: cells[col('time')],
          [short.target]: Number(cells[col('target')]),
          [short.applied]: Number(cells[col('applied')]),
        },
      };
    });
    const zip = await zipShapefile(
      shapefileOf({ type: 'FeatureCollection', features }, { layer: 'planting' }),
      'planting',
    );
    const p = await preview(w.callers.farmer, rx.id, zip, 'planting.zip');
    expect(p.status, JSON.stringify(p.body)).toBe(200);
    expect(p.body.format).toBe('shapefile');
    expect(p.body.columns).toEqual(
      expect.arrayContaining(['longitude', 'latitude', 'time', 'target', 'applied']),
    );
    const res = await w.callers.farmer.post('/api/logs', {
      fileId: p.body.fileId,
      prescriptionId: rx.id,
      planterId: rx.planter!.id,
      mapping: {
        fields: {
          time: { column: 'time', unit: mapping.fields.time!.unit },
          lon: { column: 'longitude', unit: null },
          lat: { column: 'latitude', unit: null },
          target: { column: 'target', unit: mapping.fields.target!.unit },
          applied: { column: 'applied', unit: mapping.fields.applied!.unit },
        },
        rows: [],
      },
      meteredOn: 'gnss',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const done = await settled(w.callers.farmer, res.body.id);
    expect(done.status, JSON.stringify(done.error)).toBe('ready');
    expect(done.pointsRead).toBe(features.length);
    const audit = auditSchema.parse((await w.callers.farmer.get(`/api/logs/${res.body.id}/audit`)).body);
    expect(Math.abs(audit.result.field.biasPct)).toBeLessThan(1);
  });
});
