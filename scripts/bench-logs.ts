// The as-applied part of `npm run bench` (PERFORMANCE.md targets 1–4), run by scripts/bench.mjs with tsx
// against the throwaway cluster and server it started. Nothing here is a test: it measures, prints and
// writes its figures as JSON for bench.mjs's table. Everything it makes is invented and seeded.
//
//   bench-logs.ts run   env BENCH_URL, BENCH_COOKIE, DATABASE_URL, BENCH_DIR, BENCH_OUT [, BENCH_BIG=1]
//   bench-logs.ts rss <file.csv> <input.json>   one pipeline run in this process; prints its peak RSS (JSON)
import {
  closeSync,
  copyFileSync,
  createReadStream,
  existsSync,
  openSync,
  readFileSync,
  readSync,
  statSync,
  truncateSync,
  writeFileSync,
  writeSync,
} from 'node:fs';
import { spawnSync } from 'node:child_process';
import http from 'node:http';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import pg from 'pg';
import Papa from 'papaparse';
import { booleanPointInPolygon } from '@turf/turf';
import type { MultiPolygon, Polygon, Position } from 'geojson';
import { seededRandom, syntheticLog } from '../shared/audit/synthetic-log';
import { logToCsv, parseLogCsv, readCsvHeader, suggestMapping } from '../shared/audit/csv-log';
import { zoneIndexOf } from '../shared/audit/zone-join';
import { cleanLog } from '../shared/audit/clean-log';
import { selectColumns, type LogColumns } from '../shared/audit/log-columns';
import { cleaningSettingsSchema } from '../shared/schemas/as-applied.schema';
import { rateToSi } from '../shared/rates/rate-units';
import { runPipeline, type PipelineInput, type PipelineStage } from '../server/logs/pipeline';
import { apartTables, copyLogTable, pointParts, storePoints } from '../server/logs/store-points';
import { cellColumns, pointColumns } from '../server/logs/import-log';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const say = (msg: string) => process.stdout.write(`[bench] ${msg}\n`);
const fmt = (n: number, d = 0) =>
  n.toLocaleString('en-US', { maximumFractionDigits: d, minimumFractionDigits: d });
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor((xs.length - 1) / 2)];
const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil(q * s.length) - 1)];
};

/* ------------------------------------------------------------------ the workload: field and zones */

/** Where the invented field lies (near 45° N) and its shape: 8 × 5 cells of a jittered grid, 1 040 m × 625 m. */
const LON0 = -96.31;
const LAT0 = 45.02;
const NX = 8;
const NY = 5;
const WIDTH_M = 1040;
const HEIGHT_M = 625;
/** Points between two grid nodes along a zone edge (40 zones × (4 × 42 + 1) ≈ 6 800 vertices). */
const EDGE_POINTS = 41;
/** Largest sideways wander of an edge, m, and of a grid node, as a fraction of a cell. */
const EDGE_WANDER_M = 5;
const NODE_JITTER = 0.18;
/** Metres per degree at LAT0 (spherical approximation: the field is invented, only its size matters). */
const M_PER_DEG_LAT = 111_132;
const M_PER_DEG_LON = 111_320 * Math.cos((LAT0 * Math.PI) / 180);

type Xy = [number, number];

/**
 * A field split into NX × NY irregular zones: a grid whose nodes are jittered and whose edges wander
 * (a smooth seeded curve, pinned at both nodes). Neighbouring zones share each edge point for point, and the
 * field's boundary is the outer ring of the same edges, so the zones tile the field exactly.
 */
export function benchField(seed: number): { boundary: Polygon; zones: Polygon[]; areaM2: number } {
  const random = seededRandom(seed);
  const cw = WIDTH_M / NX;
  const ch = HEIGHT_M / NY;
  const node: Xy[][] = [];
  for (let i = 0; i <= NX; i++) {
    node.push([]);
    for (let j = 0; j <= NY; j++) {
      const edgeX = i === 0 || i === NX;
      const edgeY = j === 0 || j === NY;
      const jx = edgeX ? (random() - 0.5) * 16 : (random() * 2 - 1) * NODE_JITTER * cw;
      const jy = edgeY ? (random() - 0.5) * 16 : (random() * 2 - 1) * NODE_JITTER * ch;
      node[i].push([i * cw + jx, j * ch + jy]);
    }
  }
  const wander = (a: Xy, b: Xy): Xy[] => {
    const [f1, f2] = [1 + Math.floor(random() * 2), 2 + Math.floor(random() * 2)];
    const [p1, p2] = [random() * 2 * Math.PI, random() * 2 * Math.PI];
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
    const [nx, ny] = [-(b[1] - a[1]) / len, (b[0] - a[0]) / len];
    const pts: Xy[] = [a];
    for (let k = 1; k <= EDGE_POINTS; k++) {
      const t = k / (EDGE_POINTS + 1);
      const off =
        EDGE_WANDER_M *
        Math.sin(Math.PI * t) *
        (0.6 * Math.sin(2 * Math.PI * f1 * t + p1) + 0.4 * Math.sin(2 * Math.PI * f2 * t + p2));
      pts.push([a[0] + (b[0] - a[0]) * t + nx * off, a[1] + (b[1] - a[1]) * t + ny * off]);
    }
    pts.push(b);
    return pts;
  };
  // h[i][j]: node (i, j) → (i + 1, j); v[i][j]: node (i, j) → (i, j + 1).
  const h = Array.from({ length: NX }, (_, i) =>
    Array.from({ length: NY + 1 }, (_, j) => wander(node[i][j], node[i + 1][j])),
  );
  const v = Array.from({ length: NX + 1 }, (_, i) =>
    Array.from({ length: NY }, (_, j) => wander(node[i][j], node[i][j + 1])),
  );
  const deg = ([x, y]: Xy): Position => [
    Math.round((LON0 + x / M_PER_DEG_LON) * 1e9) / 1e9,
    Math.round((LAT0 + y / M_PER_DEG_LAT) * 1e9) / 1e9,
  ];
  const ring = (edges: Xy[][]): Position[] => {
    const out: Xy[] = [];
    for (const e of edges) out.push(...e.slice(0, -1));
    out.push(out[0]);
    return out.map(deg);
  };
  const rev = (e: Xy[]) => [...e].reverse();
  const zones: Polygon[] = [];
  for (let j = 0; j < NY; j++)
    for (let i = 0; i < NX; i++)
      zones.push({
        type: 'Polygon',
        coordinates: [ring([h[i][j], v[i + 1][j], rev(h[i][j + 1]), rev(v[i][j])])],
      });
  const outer: Xy[][] = [];
  for (let i = 0; i < NX; i++) outer.push(h[i][0]);
  for (let j = 0; j < NY; j++) outer.push(v[NX][j]);
  for (let i = NX - 1; i >= 0; i--) outer.push(rev(h[i][NY]));
  for (let j = NY - 1; j >= 0; j--) outer.push(rev(v[0][j]));
  const boundary: Polygon = { type: 'Polygon', coordinates: [ring(outer)] };
  // Shoelace in metres, for the printout.
  const flat = outer.flatMap((e) => e.slice(0, -1));
  let a2 = 0;
  for (let k = 0; k < flat.length; k++) {
    const [x1, y1] = flat[k];
    const [x2, y2] = flat[(k + 1) % flat.length];
    a2 += x1 * y2 - x2 * y1;
  }
  return { boundary, zones, areaM2: a2 / 2 };
}

const vertexCount = (g: MultiPolygon) =>
  g.coordinates.reduce((s, p) => s + p.reduce((t, r) => t + r.length, 0), 0);

/* ------------------------------------------------------------------ the API */

type Api = {
  get<T = unknown>(url: string): Promise<T>;
  send<T = unknown>(method: string, url: string, body?: unknown): Promise<T>;
};

function api(base: string, cookie: string): Api {
  const call = async <T>(method: string, url: string, body?: unknown): Promise<T> => {
    const init = {
      method,
      headers: { cookie, 'x-sowright-request': '1', ...(body ? { 'content-type': 'application/json' } : {}) },
      body: body ? JSON.stringify(body) : undefined,
    };
    // A GET on a kept-alive connection the server closed while idle is tried once more.
    const res = await fetch(`${base}${url}`, init).catch((err: Error) => {
      if (method !== 'GET') throw err;
      return fetch(`${base}${url}`, init);
    });
    const text = await res.text();
    if (!res.ok) throw new Error(`${method} ${url} answered ${res.status}: ${text.slice(0, 400)}`);
    return (text ? JSON.parse(text) : null) as T;
  };
  return { get: (url) => call('GET', url), send: (method, url, body) => call(method, url, body) };
}

type Rx = {
  id: string;
  version: number;
  boundary: MultiPolygon;
  defaultRateSi: number;
  planter: { id: string } | null;
  check: { blocking: boolean } | null;
  zones: { id: string; name: string; rateSi: number; geometry: MultiPolygon }[];
};

/**
 * The benchmark's field, season, product, zone map (40 zones through the zone API) and an approved
 * prescription, made as the demo agronomist on the demo workspace's first grower.
 */
async function makePrescription(a: Api, field: ReturnType<typeof benchField>) {
  const growers = await a.get<{ items: { id: string }[] }>('/api/growers');
  const grower = growers.items[0];
  const farms = await a.get<{ items: { id: string }[] }>(`/api/farms?growerId=${grower.id}`);
  type Planter = {
    id: string;
    name: string;
    rowCount: number;
    rowSpacingM: number;
    rowsPerSection: number;
    displaySectionLimit: number;
    holesPerDisc: { crop: string; holes: number }[];
    discRpmMax: number;
  };
  const planters = await a.get<{ items: Planter[] }>(`/api/planters?growerId=${grower.id}`);
  if (!farms.items.length || !planters.items.length)
    throw new Error('the demo grower has no farm or no planter: run the demo seed (server/db/cli.ts seed)');
  const planter = planters.items[0];
  const f = await a.send<{ id: string; areaM2: number }>('POST', '/api/fields', {
    farmId: farms.items[0].id,
    name: 'Benchmark field',
    notes: 'Invented by npm run bench',
    boundary: field.boundary,
  });
  const season = await a.send<{ id: string }>('POST', '/api/seasons', {
    fieldId: f.id,
    year: 2027,
    crop: 'corn',
    plannedPlantingDate: null,
  });
  const product = await a.send<{ id: string }>('POST', '/api/products', {
    kind: 'seed',
    name: 'Benchmark hybrid',
    crop: 'corn',
    rateKind: 'count',
    unitName: 'unit',
    unitSize: 80_000, // DOMAIN.md §3 (common practice: 80 000 corn seeds a unit)
    pricePerUnit: 300,
    currency: 'USD',
  });
  type ZoneMap = {
    id: string;
    version: number;
    zones: { features: { properties: { id: string; isDefault: boolean } }[] };
    analysis: { overlaps: unknown[]; gapAreaM2: number };
  };
  let map = await a.send<ZoneMap>('POST', '/api/zone-maps', {
    fieldId: f.id,
    seasonId: season.id,
    name: 'Benchmark zones',
  });
  // The new map's one default zone covers the field: the 40 zones replace it.
  for (const d of map.zones.features.filter((z) => z.properties.isDefault))
    map = await a.send('DELETE', `/api/zone-maps/${map.id}/zones/${d.properties.id}?version=${map.version}`);
  for (const [k, zone] of field.zones.entries()) {
    map = await a.send('POST', `/api/zone-maps/${map.id}/zones`, {
      version: map.version,
      name: `Zone ${String(k + 1).padStart(2, '0')}`,
      geometry: zone,
      classValue: null,
      productivityIndex: null,
    });
  }
  if (map.analysis.overlaps.length)
    throw new Error(
      `the benchmark zones overlap (${map.analysis.overlaps.length} overlaps): the grid is wrong`,
    );
  const perAc = (x: number) => rateToSi(x, 'seeds/ac');
  let rx = await a.send<Rx>('POST', '/api/prescriptions', {
    zoneMapId: map.id,
    productId: product.id,
    planterId: planter.id,
    name: 'Benchmark rates',
    rateUnit: 'seeds/ac',
    defaultRateSi: perAc(32_000),
    outOfFieldRateSi: 0,
    minRateSi: perAc(20_000),
    maxRateSi: perAc(40_000),
  });
  const random = seededRandom(404);
  rx = await a.send<Rx>('PUT', `/api/prescriptions/${rx.id}`, {
    version: rx.version,
    name: 'Benchmark rates',
    productId: product.id,
    planterId: planter.id,
    rateUnit: 'seeds/ac',
    defaultRateSi: perAc(32_000),
    outOfFieldRateSi: 0,
    minRateSi: perAc(20_000),
    maxRateSi: perAc(40_000),
    rates: rx.zones.map((z) => ({ zoneId: z.id, rateSi: perAc(28_000 + 500 * Math.floor(random() * 21)) })),
  });
  if (rx.check?.blocking)
    rx = await a.send<Rx>('POST', `/api/prescriptions/${rx.id}/accept-check`, {
      version: rx.version,
      reason: 'Benchmark prescription: invented rates, never planted',
    });
  rx = await a.send<Rx>('POST', `/api/prescriptions/${rx.id}/approve`, { version: rx.version });
  return { rx, planter, fieldAreaM2: f.areaM2 };
}

/* ------------------------------------------------------------------ the logs */

/** The 7 columns of the workload: time, lon, lat, wheel speed, GNSS speed, target, applied. */
const CSV_UNITS = {
  time: 'epoch-s',
  rate: 'seeds/ac',
  speed: 'm/s',
  decimals: { time: 3, position: 9, speed: 4, rate: 2 },
} as const;

/** Writes the first n points of the log as CSV, in chunks (logToCsv of each slice, one header). */
function writeLogCsv(file: string, log: LogColumns, n: number) {
  const fd = openSync(file, 'w');
  const CHUNK = 200_000;
  try {
    for (let from = 0; from < n; from += CHUNK) {
      const to = Math.min(n, from + CHUNK);
      const index = new Uint32Array(to - from);
      for (let i = 0; i < index.length; i++) index[i] = from + i;
      const text = logToCsv(selectColumns(log, index), CSV_UNITS);
      writeSync(fd, from === 0 ? text : text.slice(text.indexOf('\n') + 1));
    }
  } finally {
    closeSync(fd);
  }
}

/* ------------------------------------------------------------------ (a) the byte-level floor */

const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k);

/**
 * Read the file and scan its bytes into one Float64Array (row after row; a column is every ncol-th value):
 * count lines, then per field an optional '-', digits, an optional '.' and digits, one separator byte. No
 * mapping, no validation, no empty fields, no quotes.
 */
export function parseFloor(file: string) {
  const b = readFileSync(file);
  let lines = 0;
  for (let i = b.indexOf(10); i >= 0; i = b.indexOf(10, i + 1)) lines++;
  const headerEnd = b.indexOf(10);
  let ncol = 1;
  for (let i = 0; i < headerEnd; i++) if (b[i] === 44) ncol++;
  const out = new Float64Array((lines - 1) * ncol);
  const len = b.length;
  let k = 0;
  let i = headerEnd + 1;
  while (i < len) {
    let c = b[i];
    const neg = c === 45;
    if (neg) c = b[++i];
    let m = 0;
    while (c >= 48 && c <= 57) {
      m = m * 10 + (c - 48);
      c = b[++i];
    }
    let scale = 0;
    if (c === 46) {
      c = b[++i];
      while (c >= 48 && c <= 57) {
        m = m * 10 + (c - 48);
        scale++;
        c = b[++i];
      }
    }
    const x = m / POW10[scale];
    out[k++] = neg ? -x : x;
    i++;
  }
  return { n: k / ncol, out, bytes: len };
}

/* ------------------------------------------------------------------ (b) ours */

type BenchInput = Omit<PipelineInput, 'bytes' | 'file' | 'fileName' | 'format'>;

async function ours(file: string, input: BenchInput, diagnose = false) {
  const stages: Partial<Record<PipelineStage | 'end', number>> = {};
  const t0 = performance.now();
  // From the file, as the import reads a CSV: a piece at a time by two threads, never whole in memory.
  const tRead = performance.now();
  const rssAt = (what: string) => {
    if (process.env.BENCH_RSS_TRACE)
      process.stderr.write(`${what}: rss ${(process.memoryUsage().rss / 2 ** 20).toFixed(0)} MB\n`);
  };
  rssAt('read');
  const out = await runPipeline(
    { ...input, bytes: new Uint8Array(0), file, fileName: path.basename(file), format: 'csv', diagnose },
    (stage) => {
      if (stages[stage] === undefined) rssAt(stage);
      stages[stage] ??= performance.now();
    },
  );
  rssAt('end');
  const t1 = performance.now();
  return {
    ms: t1 - t0,
    readMs: tRead - t0,
    parseMs: (stages.cleaning ?? t1) - tRead,
    joinCleanMs: (stages.auditing ?? t1) - (stages.cleaning ?? t1),
    auditMs: t1 - (stages.auditing ?? t1),
    pointsRead: out.pointsRead,
    kept: out.removedBy.reduce((s, r) => s + (r === 0 ? 1 : 0), 0),
    zonesWithPoints: out.result.zones.filter((z) => z.stats.points > 0).length,
  };
}

/** Where (b)'s time goes: each step of the pipeline timed on its own (one run, for the report). */
function oursProfile(file: string, input: BenchInput) {
  const at = [performance.now()];
  const bytes = new Uint8Array(readFileSync(file));
  at.push(performance.now());
  const parsed = parseLogCsv(bytes, input.mapping);
  at.push(performance.now());
  const zone = zoneIndexOf(
    parsed.lon,
    parsed.lat,
    input.zones.map((z) => z.geometry),
    input.boundary,
  );
  at.push(performance.now());
  cleanLog(parsed, input.cleaning, zone);
  at.push(performance.now());
  const step = (k: number) => at[k + 1] - at[k];
  return { readMs: step(0), parseMs: step(1), joinMs: step(2), cleanMs: step(3) };
}

/* ------------------------------------------------------------------ (c) the peer */

/** papaparse (streaming step callback) + Turf booleanPointInPolygon per point over the zones + a mean per zone. */
async function peer(file: string, zones: MultiPolygon[]) {
  const t0 = performance.now();
  const sum = new Float64Array(zones.length);
  const count = new Float64Array(zones.length);
  let rows = 0;
  let header = true;
  await new Promise<void>((resolve, reject) => {
    Papa.parse<string[]>(createReadStream(file), {
      step: (r) => {
        if (header) {
          header = false;
          return;
        }
        const d = r.data;
        if (d.length < 7) return;
        rows++;
        const pt = [Number(d[1]), Number(d[2])];
        const applied = Number(d[6]);
        for (let z = 0; z < zones.length; z++)
          if (booleanPointInPolygon(pt, zones[z])) {
            sum[z] += applied;
            count[z]++;
            break;
          }
      },
      complete: () => resolve(),
      error: (e: Error) => reject(e),
    });
  });
  const means = Array.from(sum, (s, z) => (count[z] ? s / count[z] : NaN));
  return { ms: performance.now() - t0, rows, zonesWithPoints: means.filter((m) => !Number.isNaN(m)).length };
}

/* ------------------------------------------------------------------ (d) peak RSS in a child */

function rssChild(file: string, inputFile: string) {
  const res = spawnSync(
    process.execPath,
    ['--import', 'tsx', path.join(ROOT, 'scripts', 'bench-logs.ts'), 'rss', file, inputFile],
    {
      cwd: ROOT,
      encoding: 'utf8',
      maxBuffer: 1 << 20,
    },
  );
  if (res.status !== 0) throw new Error(`the RSS child failed (${res.status}): ${res.stderr.slice(-2000)}`);
  return JSON.parse(res.stdout.trim().split('\n').pop()!) as {
    maxRssMb: number;
    baseRssMb: number;
    ms: number;
  };
}

/**
 * This process's peak RSS, MB: VmHWM, the high-water mark of this program's own memory. Not getrusage's
 * maxRSS: on Linux a spawned child starts with its parent's maxRSS (checked: a child of a parent holding
 * 800 MB reported maxRSS 804 MB and VmHWM 40 MB), so the bench's own memory showed up as the child's.
 */
function peakRssMb() {
  const m = /^VmHWM:\s+(\d+) kB$/m.exec(readFileSync('/proc/self/status', 'utf8'));
  return m ? Number(m[1]) / 1024 : process.resourceUsage().maxRSS / 1024;
}

async function rssMain(file: string, inputFile: string) {
  const input = JSON.parse(readFileSync(inputFile, 'utf8')) as BenchInput;
  const baseRssMb = process.memoryUsage().rss / 2 ** 20;
  const r = await ours(file, input);
  process.stdout.write(`${JSON.stringify({ maxRssMb: peakRssMb(), baseRssMb, ms: r.ms })}\n`);
}

/* ------------------------------------------------------------------ (e) psql \copy */

/** A copy of a CSV less its last `k` rows (a file of other bytes, so another upload than the first). */
function withoutLastRows(file: string, k: number, to: string) {
  if (k === 0) return file;
  copyFileSync(file, to);
  const size = statSync(to).size;
  const tail = Buffer.alloc(Math.min(size, 4096));
  const fd = openSync(to, 'r');
  readSync(fd, tail, 0, tail.length, size - tail.length);
  closeSync(fd);
  let end = tail.length - 1; // the file ends with a newline
  for (let i = 0; i < k; i++) end = tail.lastIndexOf(10, end - 1);
  truncateSync(to, size - tail.length + end + 1);
  return to;
}

/** psql on the benchmark's database: run(sql) answers stdout; timed(sql) answers the wall time, ms. */
function psqlOn(databaseUrl: string) {
  const u = new URL(databaseUrl);
  const bin = existsSync('/usr/lib/postgresql/15/bin/psql') ? '/usr/lib/postgresql/15/bin/psql' : 'psql';
  const env = { ...process.env, PGPASSWORD: decodeURIComponent(u.password) };
  const args = [
    '-h',
    u.hostname,
    '-p',
    u.port,
    '-U',
    decodeURIComponent(u.username),
    '-d',
    u.pathname.slice(1),
  ];
  const run = (sql: string) => {
    const r = spawnSync(bin, [...args, '-v', 'ON_ERROR_STOP=1', '-qAt', '-c', sql], {
      env,
      encoding: 'utf8',
    });
    if (r.status !== 0) throw new Error(`psql failed: ${r.stderr}`);
    return r.stdout;
  };
  const timed = (sql: string) => {
    const t0 = performance.now();
    run(sql);
    return performance.now() - t0;
  };
  return { run, timed };
}

const quoted = (file: string) => `'${file.replace(/'/g, "''")}'`;

/** psql \copy of the CSV into a plain table (seven float8 columns, no index), timed with psql's start. */
function psqlCopy(databaseUrl: string, file: string) {
  const { run, timed } = psqlOn(databaseUrl);
  run(
    'DROP TABLE IF EXISTS bench_plain_points; CREATE TABLE bench_plain_points (t float8, lon float8, lat float8, wheel_mps float8, gnss_mps float8, target float8, applied float8)',
  );
  const ms = timed(`\\copy bench_plain_points FROM ${quoted(file)} WITH (FORMAT csv, HEADER true)`);
  const n = Number(run('SELECT count(*) FROM bench_plain_points').trim());
  run('DROP TABLE bench_plain_points');
  return { ms, n };
}

/**
 * Where (e)'s time goes: the 1 M log's pipeline output stored again by the import's own steps
 * (server/logs/store-points.ts `storePoints`: the points in two parts at once on two connections, each a
 * binary COPY then its block-range index; then the cells) inside a transaction that is rolled back; the part
 * committed apart is dropped after.
 */
async function storeProfile(databaseUrl: string, file: string, input: BenchInput, logId: string) {
  const out = await runPipeline({
    ...input,
    bytes: new Uint8Array(readFileSync(file)),
    fileName: 'x.csv',
    format: 'csv',
  });
  const open = async () => {
    const c = new pg.Client({ connectionString: databaseUrl, application_name: 'sowright-bench-store' });
    await c.connect();
    return c;
  };
  const client = await open();
  const steps: string[] = [];
  try {
    await client.query('BEGIN');
    const t0 = performance.now();
    const table = await storePoints(client, open, logId, out.columns.n, pointColumns(logId, out), (step) =>
      steps.push(`${step} at ${fmt(performance.now() - t0)} ms`),
    );
    const t1 = performance.now();
    await copyLogTable(client, 'cells', logId, out.cells.length, cellColumns(logId, out));
    const t2 = performance.now();
    const { rows } = await client.query<{ mb: number }>(
      `SELECT sum(pg_total_relation_size(i.inhrelid)) / 1048576.0 AS mb FROM pg_inherits i
        WHERE i.inhparent = '"${table}"'::regclass`,
    );
    return {
      pointsMs: t1 - t0,
      parts: pointParts(out.columns.n).length,
      steps,
      cellsMs: t2 - t1,
      cells: out.cells.length,
      tableMb: Number(rows[0].mb),
    };
  } finally {
    await client.query('ROLLBACK').catch(() => {});
    for (const t of apartTables(logId)) await client.query(`DROP TABLE IF EXISTS "${t}"`).catch(() => {});
    await client.end();
  }
}

/* ------------------------------------------------------------------ (f) upload to audit ready */

/**
 * POST multipart/form-data with the file streamed from disk, as a browser sends a chosen file (the whole
 * file never sits in this process's memory).
 */
function uploadMultipart(url: string, cookie: string, fields: Record<string, string>, file: string) {
  const boundary = `----sowright-bench-${Date.now().toString(16)}`;
  const head =
    Object.entries(fields)
      .map(([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`)
      .join('') +
    `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${path.basename(file)}"\r\n` +
    'Content-Type: text/csv\r\n\r\n';
  const tail = `\r\n--${boundary}--\r\n`;
  const length = Buffer.byteLength(head) + statSync(file).size + Buffer.byteLength(tail);
  return new Promise<{ status: number; body: string }>((resolve, reject) => {
    const req = http.request(
      url,
      {
        method: 'POST',
        headers: {
          cookie,
          'x-sowright-request': '1',
          'content-type': `multipart/form-data; boundary=${boundary}`,
          'content-length': length,
        },
      },
      (res) => {
        let body = '';
        res.setEncoding('utf8');
        res.on('data', (c: string) => (body += c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
      },
    );
    req.on('error', reject);
    req.write(head);
    const stream = createReadStream(file, { highWaterMark: 1 << 20 });
    stream.on('error', reject);
    stream.on('end', () => req.end(tail));
    stream.pipe(req, { end: false });
  });
}

async function uploadToReady(
  base: string,
  cookie: string,
  databaseUrl: string,
  file: string,
  rx: Rx,
  planterId: string,
) {
  const a = api(base, cookie);
  const db = new pg.Client({ connectionString: databaseUrl, application_name: 'sowright-bench-watch' });
  await db.connect();
  const seen: Record<string, number> = {};
  const t0 = performance.now();
  const pres = await uploadMultipart(`${base}/api/logs/preview`, cookie, { prescriptionId: rx.id }, file);
  if (pres.status !== 200)
    throw new Error(`POST /api/logs/preview answered ${pres.status}: ${pres.body.slice(0, 400)}`);
  const preview = JSON.parse(pres.body) as { fileId: string; suggested: unknown; remembered: unknown };
  const tPreview = performance.now();
  const log = await a.send<{ id: string }>('POST', '/api/logs', {
    fileId: preview.fileId,
    prescriptionId: rx.id,
    planterId,
    mapping: preview.remembered ?? preview.suggested,
    meteredOn: 'gnss',
  });
  // The stages as the database shows them (every 10 ms), and the answer of the API (every 50 ms).
  let watching = true;
  const watch = (async () => {
    while (watching) {
      const r = await db.query<{ status: string }>('SELECT status FROM as_applied_logs WHERE id = $1', [
        log.id,
      ]);
      const s = r.rows[0]?.status;
      if (s && seen[s] === undefined) seen[s] = performance.now();
      await new Promise((res) => setTimeout(res, 10));
    }
  })();
  let status = '';
  let last: { status: string; error: unknown; pointsRead: number | null; pointsKept: number | null } | null =
    null;
  const until = Date.now() + 10 * 60_000;
  while (status !== 'ready' && status !== 'failed') {
    if (Date.now() > until) throw new Error(`log ${log.id} still ${status} after 10 minutes`);
    await new Promise((res) => setTimeout(res, 50));
    last = await a.get(`/api/logs/${log.id}`);
    status = last!.status;
  }
  const t1 = performance.now();
  watching = false;
  await watch;
  await db.end();
  if (status === 'failed') throw new Error(`the import failed: ${JSON.stringify(last!.error)}`);
  return {
    logId: log.id,
    ms: t1 - t0,
    previewMs: tPreview - t0,
    startMs: (seen.reading ?? tPreview) - tPreview,
    pipelineMs: (seen.storing ?? t1) - (seen.reading ?? seen.queued ?? tPreview),
    storeMs: (seen.ready ?? t1) - (seen.storing ?? t1),
    storingSeen: seen.storing !== undefined && seen.ready !== undefined,
    pointsRead: last!.pointsRead,
    pointsKept: last!.pointsKept,
  };
}

/* ------------------------------------------------------------------ (g) vector tiles */

function tileOf(lon: number, lat: number, z: number) {
  const n = 2 ** z;
  const r = (lat * Math.PI) / 180;
  return {
    x: Math.floor(((lon + 180) / 360) * n),
    y: Math.floor(((1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2) * n),
  };
}

async function tiles(base: string, cookie: string, logId: string, boundary: MultiPolygon) {
  const ring = boundary.coordinates[0][0];
  const lons = ring.map((p) => p[0]);
  const lats = ring.map((p) => p[1]);
  const [w, e, s, n] = [Math.min(...lons), Math.max(...lons), Math.min(...lats), Math.max(...lats)];
  const random = seededRandom(1212);
  const once = async (z: number, x: number, y: number) => {
    const t0 = performance.now();
    const res = await fetch(`${base}/api/logs/${logId}/tiles/${z}/${x}/${y}`, { headers: { cookie } });
    const body = new Uint8Array(await res.arrayBuffer());
    if (!res.ok) throw new Error(`tile ${z}/${x}/${y} answered ${res.status}`);
    return { ms: performance.now() - t0, bytes: body.length };
  };
  // A kept-alive connection the server closed while idle fails once; the retry is timed on its own.
  const get = (z: number, x: number, y: number) => once(z, x, y).catch(() => once(z, x, y));
  const c = tileOf((w + e) / 2, (s + n) / 2, 15);
  await get(15, c.x, c.y); // warm-up, not counted
  const perZoom: { z: number; distinct: number; p50: number; p95: number; maxMs: number; maxKb: number }[] =
    [];
  const all: number[] = [];
  // The server keeps the tiles it made (by log version): the first request of each distinct tile is made,
  // a repeat comes from memory. Both are reported.
  const firsts: number[] = [];
  const seen = new Set<string>();
  let maxBytes = 0;
  for (let z = 12; z <= 18; z++) {
    const times: number[] = [];
    const keys = new Set<string>();
    let zMax = 0;
    for (let k = 0; k < 50; k++) {
      const t = tileOf(w + random() * (e - w), s + random() * (n - s), z);
      keys.add(`${t.x}/${t.y}`);
      const r = await get(z, t.x, t.y);
      times.push(r.ms);
      if (!seen.has(`${z}/${t.x}/${t.y}`)) firsts.push(r.ms);
      seen.add(`${z}/${t.x}/${t.y}`);
      zMax = Math.max(zMax, r.bytes);
    }
    all.push(...times);
    maxBytes = Math.max(maxBytes, zMax);
    perZoom.push({
      z,
      distinct: keys.size,
      p50: quantile(times, 0.5),
      p95: quantile(times, 0.95),
      maxMs: Math.max(...times),
      maxKb: zMax / 1024,
    });
    say(
      `  z${z}: ${keys.size} distinct tiles of 50, p50 ${fmt(quantile(times, 0.5), 1)} ms, p95 ${fmt(quantile(times, 0.95), 1)} ms, max ${fmt(Math.max(...times), 1)} ms, largest ${fmt(zMax / 1024, 1)} KB`,
    );
  }
  say(
    `  first request of each of the ${firsts.length} distinct tiles: p50 ${fmt(quantile(firsts, 0.5), 1)} ms, p95 ${fmt(quantile(firsts, 0.95), 1)} ms`,
  );
  return {
    p95: quantile(all, 0.95),
    firstP95: quantile(firsts, 0.95),
    firsts: firsts.length,
    maxKb: maxBytes / 1024,
    perZoom,
  };
}

/**
 * Before each timed sample: a full garbage collection (bench.mjs runs this process with --expose-gc), so no
 * sample pays for collecting the one before, and the memory it freed is there to reuse.
 */
const settle = () => (globalThis as { gc?: () => void }).gc?.();

/** (a)–(d): the floor, our audit, the peer and peak RSS (skipped by `npm run bench -- --storage`). */
async function computeFigures(
  files: Record<number, string>,
  input: BenchInput,
  inputFile: string,
  big: boolean,
) {
  // (a) and (b), alternating, median of three after a warm-up on 100 k.
  say('(a) byte-level parse floor and (b) our audit, 1 M points, in this process (median of 3)');
  parseFloor(files[100_000]);
  await ours(files[100_000], input);
  const floorMs: number[] = [];
  const oursRuns: Awaited<ReturnType<typeof ours>>[] = [];
  for (let k = 0; k < 3; k++) {
    settle();
    const t = performance.now();
    const f = parseFloor(files[1_000_000]);
    floorMs.push(performance.now() - t);
    if (f.n !== 1_000_000) throw new Error(`the floor read ${f.n} rows, not 1 000 000`);
    settle();
    oursRuns.push(await ours(files[1_000_000], input));
  }
  const floor = median(floorMs);
  const our = oursRuns.sort((x, y) => x.ms - y.ms)[1];
  say(`  (a) floor: ${fmt(floor)} ms (${floorMs.map((x) => fmt(x)).join(', ')})`);
  say(
    `  (b) ours: ${fmt(our.ms)} ms (${oursRuns.map((x) => fmt(x.ms)).join(', ')}): read ${fmt(our.readMs)}, parse ${fmt(our.parseMs)}, ` +
      `join + clean ${fmt(our.joinCleanMs)}, audit + findings ${fmt(our.auditMs)} ms; ${fmt(our.pointsRead)} read, ${fmt(our.kept)} kept, ${our.zonesWithPoints} zones with points`,
  );

  // Issue "diagnostics": the same pipeline with the diagnostics (alarm replay, lag, disc limit, rows,
  // coverage) on; target 1 is the audit itself, so they are timed apart.
  settle();
  const withDiagnostics = await ours(files[1_000_000], input, true);
  say(
    `  (b+) with the diagnostics and the map cells: ${fmt(withDiagnostics.ms)} ms, of which diagnostics and cells about ${fmt(withDiagnostics.ms - our.ms)} ms`,
  );

  const profile = oursProfile(files[1_000_000], input);
  say(
    `  (b) step by step: read ${fmt(profile.readMs)}, parseLogCsv ${fmt(profile.parseMs)}, zoneIndexOf ${fmt(profile.joinMs)}, cleanLog ${fmt(profile.cleanMs)} ms`,
  );

  let big5: { floorMs: number; oursMs: number } | null = null;
  if (big) {
    settle();
    const t = performance.now();
    parseFloor(files[5_000_000]);
    const fm = performance.now() - t;
    settle();
    const o = await ours(files[5_000_000], input);
    big5 = { floorMs: fm, oursMs: o.ms };
    say(`  5 M points: floor ${fmt(fm)} ms, ours ${fmt(o.ms)} ms (${fmt(o.ms / fm, 2)}×)`);
  }

  // (c) the peer: on 100 k first; on 1 M when that would take under a minute, else scaled.
  say('(c) peer: papaparse streaming + Turf booleanPointInPolygon over the zones + a mean per zone');
  const p100 = await peer(
    files[100_000],
    input.zones.map((z) => z.geometry),
  );
  say(`  100 k: ${fmt(p100.ms)} ms, ${p100.zonesWithPoints} zones with points`);
  let peerMs: number;
  let peerNote: string;
  if (p100.ms * 10 < 60_000) {
    settle();
    const p1m = await peer(
      files[1_000_000],
      input.zones.map((z) => z.geometry),
    );
    peerMs = p1m.ms;
    peerNote = 'measured on 1 M';
    say(`  1 M: ${fmt(p1m.ms)} ms`);
  } else {
    peerMs = p100.ms * 10;
    peerNote = 'measured on 100 k, scaled ×10 (linear)';
    say(`  1 M: ${fmt(peerMs)} ms (${peerNote})`);
  }

  // (d) peak RSS of (b) in a child of its own.
  say('(d) peak RSS of our audit in a child process of its own (tsx loaded)');
  const rss1 = rssChild(files[1_000_000], inputFile);
  say(
    `  1 M: peak ${fmt(rss1.maxRssMb)} MB (the child with tsx and nothing read: ${fmt(rss1.baseRssMb)} MB)`,
  );
  const rss5 = big ? rssChild(files[5_000_000], inputFile) : null;
  if (rss5) say(`  5 M: peak ${fmt(rss5.maxRssMb)} MB`);

  return { floor, our, profile, withDiagnostics, peerMs, peerNote, rss1, rss5, big5 };
}

/** (a) alone, median of three after a warm-up, for the storage-only run. */
function floorOnly(file: string) {
  parseFloor(file);
  const ms: number[] = [];
  for (let k = 0; k < 3; k++) {
    settle();
    const t = performance.now();
    parseFloor(file);
    ms.push(performance.now() - t);
  }
  say(`  (a) floor: ${fmt(median(ms))} ms`);
  return median(ms);
}

/* ------------------------------------------------------------------ the run */

async function main() {
  const base = process.env.BENCH_URL!;
  const cookie = process.env.BENCH_COOKIE!;
  const databaseUrl = process.env.DATABASE_URL!;
  const dir = process.env.BENCH_DIR!;
  const big = process.env.BENCH_BIG === '1';
  if (!base || !cookie || !databaseUrl || !dir || !process.env.BENCH_OUT)
    throw new Error('bench-logs.ts run needs BENCH_URL, BENCH_COOKIE, DATABASE_URL, BENCH_DIR and BENCH_OUT');
  const a = api(base, cookie);

  say('workload: a field of 40 irregular zones, a prescription through the API');
  const field = benchField(2027);
  const { rx, planter, fieldAreaM2 } = await makePrescription(a, field);
  const zoneVertices = rx.zones.reduce((s, z) => s + vertexCount(z.geometry), 0);
  say(
    `  field ${fmt(fieldAreaM2 / 1e4, 1)} ha at ${LAT0}° N, ${rx.zones.length} zones, ${fmt(zoneVertices)} vertices in all (as stored)`,
  );
  const widthM = planter.rowCount * planter.rowSpacingM;
  const sizes = big ? [100_000, 1_000_000, 5_000_000] : [100_000, 1_000_000];
  const t0 = performance.now();
  const log = syntheticLog({
    boundary: rx.boundary,
    zones: rx.zones.map((z) => ({ geometry: z.geometry, targetSi: z.rateSi })),
    defaultTargetSi: rx.defaultRateSi,
    swathM: widthM,
    speedMps: 2.2352, // 5 mph
    hz: 10,
    startTime: Date.UTC(2027, 3, 28, 13) / 1000,
    seed: 11,
    faults: { noiseCv: 0.03 },
    maxPoints: sizes[sizes.length - 1],
  });
  const seven: LogColumns = {
    ...log,
    heading: null,
    speedSource: null,
    widthM: null,
    workOn: null,
    rows: [],
  };
  const files: Record<number, string> = {};
  for (const n of sizes) {
    files[n] = path.join(dir, `log-${n}.csv`);
    writeLogCsv(files[n], seven, n);
  }
  const bytes1m = statSync(files[1_000_000]).size;
  say(
    `  synthetic logs at 10 Hz, ${fmt(widthM, 2)} m swath (the demo planter); the 1 M file ${fmt(bytes1m / 1e6, 1)} MB, ` +
      `${fmt(bytes1m / 1_000_000, 1)} bytes a row; made in ${fmt((performance.now() - t0) / 1000, 1)} s`,
  );

  const header = readCsvHeader(readFileSync(files[100_000]).subarray(0, 4096));
  // Typed through a variable, not the literal, so the bench reads with and without PipelineInput.planter.
  const inputLiteral = {
    mapping: suggestMapping(header.columns, header.sample),
    cleaning: cleaningSettingsSchema.parse({}),
    boundary: rx.boundary,
    zones: rx.zones.map((z) => ({ zoneId: z.id, name: z.name, targetSi: z.rateSi, geometry: z.geometry })),
    defaultTargetSi: rx.defaultRateSi,
    bandFraction: 0.15,
    fallbackWidthM: widthM,
    planter: {
      rowCount: planter.rowCount,
      rowSpacingM: planter.rowSpacingM,
      rowsPerSection: planter.rowsPerSection,
      displaySectionLimit: planter.displaySectionLimit,
      holesPerDisc: planter.holesPerDisc.find((h) => h.crop === 'corn')?.holes ?? null,
      discRpmMax: planter.discRpmMax,
    },
    meteredOn: 'gnss' as const,
    unitSize: 80_000,
    pricePerUnit: 300,
    findings: {
      rateUnit: 'seeds/ac' as const,
      unitSystem: 'imperial' as const,
      unitName: 'unit',
      currency: 'USD',
      productKind: 'seed' as const,
    },
  };
  const input: BenchInput = inputLiteral;
  const inputFile = path.join(dir, 'pipeline-input.json');
  writeFileSync(inputFile, JSON.stringify(input));

  const storageOnly = process.env.BENCH_PART === 'storage';
  const compute = storageOnly ? null : await computeFigures(files, input, inputFile, big);
  const floor = compute?.floor ?? floorOnly(files[1_000_000]);
  // (e) psql \copy of the same CSV into a plain table; (f) upload to audit ready through the API, whose
  // storing is a binary COPY into the log's own partition (server/logs/store-points.ts).
  // Three rounds, alternating, each figure the median of three (as (a) is): one sample of either swung by
  // up to 40 % between runs on these shared machines. Each upload is its own file (the 1 M log, then the same
  // less its last one and two rows), since the same bytes twice are one log.
  say('(e) psql \\copy of the 1 M CSV into a plain table, and (f) upload to audit ready through the API');
  say('    (preview + create, poll GET /api/logs/:id), alternating, three of each');
  const uploads = [0, 1, 2].map((k) =>
    withoutLastRows(files[1_000_000], k, path.join(dir, `upload-${k}.csv`)),
  );
  const psqlRuns: { ms: number; n: number }[] = [];
  const e2eRuns: Awaited<ReturnType<typeof uploadToReady>>[] = [];
  for (const file of uploads) {
    settle();
    psqlRuns.push(psqlCopy(databaseUrl, files[1_000_000]));
    settle();
    const r = await uploadToReady(base, cookie, databaseUrl, file, rx, planter.id);
    e2eRuns.push(r);
    say(
      `  psql \\copy ${fmt(psqlRuns.at(-1)!.ms)} ms (${fmt(psqlRuns.at(-1)!.n)} rows); upload to ready ${fmt(r.ms)} ms: preview ${fmt(r.previewMs)}, create and start ${fmt(r.startMs)}, pipeline in the worker ${fmt(r.pipelineMs)} (the points' COPY runs beside its diagnostics), then the rest of storing (cells, audit, commit) ${fmt(r.storeMs)} ms; ${fmt(r.pointsRead ?? 0)} points stored`,
    );
  }
  const psql = { ms: median(psqlRuns.map((r) => r.ms)), n: psqlRuns[0].n };
  const e2e = e2eRuns.find((r) => r.ms === median(e2eRuns.map((x) => x.ms)))!;
  say(`  medians: psql \\copy ${fmt(psql.ms)} ms, upload to ready ${fmt(e2e.ms)} ms`);

  const store = await storeProfile(databaseUrl, files[1_000_000], input, e2e.logId);
  say(
    `  (e) profile, the 1 M log stored again (rolled back): the points in ${store.parts} part(s) at once, binary COPY and ` +
      `block-range index, ${fmt(store.pointsMs)} ms (${store.steps.join(', ')}; tables ${fmt(store.tableMb)} MB); ` +
      `${fmt(store.cells)} tile cells ${fmt(store.cellsMs)} ms`,
  );

  say('(g) vector tiles of the stored 1 M-point log: 50 random tiles over the field at each zoom 12–18');
  const tile = await tiles(base, cookie, e2e.logId, rx.boundary);

  const out = {
    workload: {
      fieldHa: fieldAreaM2 / 1e4,
      zones: rx.zones.length,
      zoneVertices,
      bytesPerRow: bytes1m / 1_000_000,
      fileMb: bytes1m / 1e6,
    },
    floorMs: floor,
    ours: compute?.our ?? null,
    profile: compute?.profile ?? null,
    store,
    peerMs: compute?.peerMs ?? null,
    peerNote: compute?.peerNote ?? null,
    rss1: compute?.rss1 ?? null,
    rss5: compute?.rss5 ?? null,
    big5: compute?.big5 ?? null,
    psqlMs: psql.ms,
    e2e,
    tiles: tile,
  };
  writeFileSync(process.env.BENCH_OUT!, JSON.stringify(out, null, 2));
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const [mode, ...rest] = process.argv.slice(2);
  if (mode === 'rss') await rssMain(rest[0], rest[1]);
  else if (mode === 'run') await main();
  else {
    process.stderr.write('usage: bench-logs.ts run | bench-logs.ts rss <file.csv> <input.json>\n');
    process.exit(2);
  }
}
