// Not a test: measures the import of a zone layer of 10 000 vertices and of a 200 000-point CSV through the
// real API on a throwaway PostgreSQL cluster. Run: `node --import tsx tests/server/imports-measure.ts`.
// Prints wall time per import and the process's peak resident memory (main thread and parse worker share it).
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
// @ts-expect-error plain JavaScript module of the project's scripts
import { freePort, startCluster, stopCluster } from '../../scripts/pg.mjs';
import { createSequelize } from '../../server/db/sequelize';
import { initModels } from '../../server/db/associations';
import { createMigrator } from '../../server/db/umzug';
import { createApp } from '../../server/app';
import { FileStore } from '../../server/logs/file-store';
import { makeWorld } from '../helpers/factory';
import { upload } from './imports-support';

const baseDir = mkdtempSync(path.join(os.tmpdir(), 'sowright-measure-'));
const db = await startCluster({ baseDir, port: await freePort(), dbName: 'sowright_measure' });
const rssMb = () => process.resourceUsage().maxRSS / 1024;

/** Zones in a 4 × 5 grid over about 1 km², each a wavy ellipse (star-shaped, so valid) of the same vertex count. */
function zoneLayer(totalVertices: number) {
  const zones = 20;
  const perZone = Math.floor(totalVertices / zones);
  const features = [];
  for (let k = 0; k < zones; k++) {
    const cx = -93.6 + (k % 4) * 0.003 + 0.0015;
    const cy = 42 + Math.floor(k / 4) * 0.002 + 0.001;
    const ring: number[][] = [];
    for (let i = 0; i < perZone - 1; i++) {
      const a = (2 * Math.PI * i) / (perZone - 1);
      const r = 1 + 0.05 * Math.sin(7 * a);
      ring.push([cx + 0.0014 * r * Math.cos(a), cy + 0.0009 * r * Math.sin(a)]);
    }
    ring.push(ring[0]);
    features.push({
      type: 'Feature',
      properties: { name: `Zone ${k + 1}`, class: (k % 5) + 1 },
      geometry: { type: 'Polygon', coordinates: [ring] },
    });
  }
  return { type: 'FeatureCollection', features };
}

function pointCsv(n: number) {
  const lines = ['longitude,latitude,yield_t_ha,moisture_pct,ec_ms_m'];
  for (let i = 0; i < n; i++) {
    const lon = -93.6 + (i % 500) * 0.00002;
    const lat = 42 + Math.floor(i / 500) * 0.00001;
    lines.push(
      `${lon.toFixed(7)},${lat.toFixed(7)},${(9 + Math.sin(i / 50)).toFixed(2)},${(15 + (i % 7) / 3).toFixed(1)},${(20 + (i % 13)).toFixed(1)}`,
    );
  }
  return lines.join('\n');
}

try {
  const sequelize = createSequelize(db.url);
  initModels(sequelize);
  await createMigrator(sequelize).up();
  const app = createApp({
    sequelize,
    jwtSecret: randomBytes(32).toString('base64url'),
    mailer: { send: async () => undefined } as never,
    appUrl: 'http://localhost',
    version: 'measure',
    files: new FileStore(mkdtempSync(path.join(os.tmpdir(), 'sowright-measure-'))),
    enqueueLog: () => Promise.reject(new Error('logs are not measured here')),
  });
  const w = await makeWorld(app, 'measure');
  // Warm the parse worker once, so the figures are of the import, not of starting a thread.
  await upload(w.callers.agronomist, w.a.field.id, 'zones', 'warm.geojson', JSON.stringify(zoneLayer(200)));

  const zones = JSON.stringify(zoneLayer(10_000));
  const points = pointCsv(200_000);
  for (const [label, purpose, name, body] of [
    ['zone layer, 10 000 vertices (GeoJSON)', 'zones', 'zones.geojson', zones],
    ['the same again (warm database connection)', 'zones', 'zones-2.geojson', zones],
    ['data layer, 200 000 points (CSV)', 'points', 'points.csv', points],
    ['the same again', 'points', 'points-2.csv', points],
  ] as const) {
    const before = rssMb();
    const t0 = performance.now();
    const res = await upload(w.callers.agronomist, w.a.field.id, purpose, name, body);
    const ms = performance.now() - t0;
    if (res.status !== 201)
      throw new Error(`${label}: ${res.status} ${JSON.stringify(res.body).slice(0, 300)}`);
    const size = (Buffer.byteLength(body) / 1024 / 1024).toFixed(1);
    const count =
      purpose === 'points' ? `${res.body.pointCount} points` : `${res.body.features.length} features`;
    console.log(
      `${label}: ${size} MB, ${count}, ${ms.toFixed(0)} ms, peak RSS ${rssMb().toFixed(0)} MB (was ${before.toFixed(0)} MB)`,
    );
  }
  await sequelize.close();
} finally {
  stopCluster(db.dataDir);
  rmSync(baseDir, { recursive: true, force: true });
}
process.exit(0);
