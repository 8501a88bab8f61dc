import { QueryTypes, type Sequelize } from 'sequelize';
import pg from 'pg';
import { appendFileSync } from 'node:fs';
import type { MultiPolygon } from 'geojson';
import type { FileStore } from './file-store';
import type { BinaryColumn } from './copy-binary';
import { apartTables, attachLogTables, copyLogTable, storePoints } from './store-points';
import { runPipelineInWorker, LogReadError } from './pipeline-runner';
import type { PipelineOutput, StoredPoints } from './pipeline';
import { cleaningSettingsSchema, columnMappingSchema } from '../../shared/schemas/as-applied.schema';
import type { RateUnit } from '../../shared/rates/rate-units';
import type { UnitSystem } from '../../shared/units';

type LogContext = {
  id: string;
  workspaceId: string;
  growerId: string;
  status: string;
  mapping: unknown;
  cleaning: unknown;
  meteredOn: 'wheel' | 'radar' | 'gnss';
  sha256: string;
  fileName: string;
  format: 'csv' | 'geojson' | 'shapefile';
  prescriptionId: string;
  defaultRateSi: number;
  rateUnit: RateUnit;
  rowCount: number;
  rowSpacingM: number;
  productSnapshot: {
    unitSize: number;
    pricePerUnit: number | null;
    currency: string;
    unitName: string;
    kind: 'seed' | 'other';
  } | null;
  band: number | null;
  unitSystem: UnitSystem | null;
  createdBy: string | null;
  planterId: string;
  seasonId: string;
  rowsPerSection: number;
  displaySectionLimit: number;
  holesPerDisc: number | null;
  discRpmMax: number;
};

export type ImportDeps = {
  sequelize: Sequelize;
  databaseUrl: string;
  files: FileStore;
  /** Told when an audit is ready (e-mail to the grower's people). */
  onReady?: (logId: string) => Promise<void>;
};

/** A log's points as binary COPY columns (store-points.ts), in the partition's column order. */
export function pointColumns(logId: string, out: StoredPoints): { name: string; column: BinaryColumn }[] {
  const c = out.columns;
  return [
    { name: 'log_id', column: { type: 'uuid', value: logId } },
    { name: 'seq', column: { type: 'rowNumber' } },
    { name: 't', column: { type: 'float8', values: c.t } },
    { name: 'geom', column: { type: 'point4326', lon: c.lon, lat: c.lat } },
    { name: 'target', column: { type: 'float4', values: c.target } },
    { name: 'applied', column: { type: 'float4', values: c.applied } },
    { name: 'applied_true', column: { type: 'float4', values: out.trueApplied } },
    { name: 'wheel_mps', column: { type: 'float4', values: c.wheelMps } },
    { name: 'gnss_mps', column: { type: 'float4', values: c.gnssMps } },
    { name: 'width_m', column: { type: 'float4', values: c.widthM } },
    { name: 'area_m2', column: { type: 'float4', values: out.area } },
    { name: 'zone', column: { type: 'int2', values: out.zone } },
    { name: 'removed_by', column: { type: 'int2', values: out.removedBy } },
  ];
}

/** A log's tile cells as binary COPY columns. */
export function cellColumns(logId: string, out: StoredPoints): { name: string; column: BinaryColumn }[] {
  const c = out.cells;
  return [
    { name: 'log_id', column: { type: 'uuid', value: logId } },
    { name: 'z', column: { type: 'int2', values: c.z } },
    { name: 'tx', column: { type: 'int4', values: c.tx } },
    { name: 'ty', column: { type: 'int4', values: c.ty } },
    { name: 'gx', column: { type: 'int2', values: c.gx } },
    { name: 'gy', column: { type: 'int2', values: c.gy } },
    { name: 'n', column: { type: 'int4', values: c.n } },
    { name: 'target', column: { type: 'float4', values: c.target } },
    { name: 'applied', column: { type: 'float4', values: c.applied } },
    { name: 'applied_true', column: { type: 'float4', values: c.appliedTrue } },
    { name: 'speed', column: { type: 'float4', values: c.speed } },
    { name: 'err', column: { type: 'float4', values: errorPct(c.applied, c.target, c.length) } },
    { name: 'true_err', column: { type: 'float4', values: errorPct(c.appliedTrue, c.target, c.length) } },
  ];
}

/** Applied against target, %, to 0.01 (NaN where either is missing or the target is 0). */
function errorPct(applied: ArrayLike<number>, target: ArrayLike<number>, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++)
    out[i] = target[i] === 0 ? Number.NaN : Math.round((10_000 * (applied[i] - target[i])) / target[i]) / 100;
  return out;
}

async function contextOf(sequelize: Sequelize, logId: string): Promise<LogContext | null> {
  const [row] = await sequelize.query<LogContext>(
    `SELECT l.id, l.workspace_id AS "workspaceId", l.grower_id AS "growerId", l.status, l.mapping, l.cleaning,
            l.metered_on AS "meteredOn", lf.sha256, lf.original_name AS "fileName", lf.format,
            r.id AS "prescriptionId", r.default_rate_si AS "defaultRateSi", r.rate_unit AS "rateUnit",
            pl.row_count AS "rowCount", pl.row_spacing_m AS "rowSpacingM", r.product_snapshot AS "productSnapshot",
            l.band_fraction AS band, u.unit_system AS "unitSystem", l.created_by AS "createdBy",
            l.planter_id AS "planterId", l.crop_season_id AS "seasonId",
            pl.rows_per_section AS "rowsPerSection", pl.display_section_limit AS "displaySectionLimit",
            pl.disc_rpm_max AS "discRpmMax",
            (SELECT (h->>'holes')::int FROM crop_seasons s, jsonb_array_elements(pl.holes_per_disc) h
              WHERE s.id = l.crop_season_id AND h->>'crop' = s.crop LIMIT 1) AS "holesPerDisc"
       FROM as_applied_logs l
       JOIN log_files lf ON lf.id = l.file_id
       JOIN prescriptions r ON r.id = l.prescription_id
       JOIN planters pl ON pl.id = l.planter_id
       LEFT JOIN users u ON u.id = l.created_by
      WHERE l.id = :logId`,
    { replacements: { logId }, type: QueryTypes.SELECT },
  );
  return row ?? null;
}

/** SOWRIGHT_IMPORT_TRACE=<file>: each import appends when its steps end (ms since it began), for tuning. */
const TRACE_FILE = process.env.SOWRIGHT_IMPORT_TRACE;
function tracer(logId: string) {
  if (!TRACE_FILE) return () => {};
  const t0 = performance.now();
  return (step: string) =>
    appendFileSync(
      TRACE_FILE,
      `${logId.slice(0, 8)} ${(performance.now() - t0).toFixed(0).padStart(6)} ms ${step}\n`,
    );
}

/**
 * The background import of one log (a pg-boss job): read the kept file in a worker thread, clean, join,
 * audit; then store every point with COPY and the audit in ONE transaction, replacing what an earlier run
 * stored. A failure at any step stores nothing and leaves the log `failed` with the line that broke.
 */
export async function importLog(deps: ImportDeps, logId: string) {
  const { sequelize } = deps;
  const ctx = await contextOf(sequelize, logId);
  if (!ctx) return;
  const trace = tracer(logId);
  let pending: Promise<void> = Promise.resolve();
  let store: Promise<pg.Client> | null = null;
  const setStatus = async (status: string, progress: number) => {
    await sequelize.query(
      `UPDATE as_applied_logs SET status = :status, progress = :progress,
              started_at = COALESCE(started_at, now()), updated_at = now()
        WHERE id = :logId AND status NOT IN ('ready', 'failed')`,
      { replacements: { status, progress, logId } },
    );
  };
  try {
    await sequelize.query(
      `UPDATE as_applied_logs SET started_at = now(), finished_at = NULL, error = NULL WHERE id = :logId`,
      {
        replacements: { logId },
      },
    );
    await setStatus('reading', 0);
    const zones = await sequelize.query<{ zoneId: string; name: string; targetSi: number; geometry: string }>(
      `SELECT id AS "zoneId", name, rate_si AS "targetSi", ST_AsGeoJSON(geometry, 15) AS geometry
         FROM prescription_zones WHERE prescription_id = :id ORDER BY sort_order, name, id`,
      { replacements: { id: ctx.prescriptionId }, type: QueryTypes.SELECT },
    );
    const [boundary] = await sequelize.query<{ geometry: string }>(
      'SELECT ST_AsGeoJSON(boundary, 15) AS geometry FROM prescriptions WHERE id = :id',
      { replacements: { id: ctx.prescriptionId }, type: QueryTypes.SELECT },
    );
    const product = ctx.productSnapshot ?? {
      unitSize: 80_000,
      pricePerUnit: null,
      currency: 'USD',
      unitName: 'unit',
      kind: 'seed' as const,
    };
    // A CSV is read from its file a piece at a time (never whole in memory); the other formats whole.
    const bytes = ctx.format === 'csv' ? new Uint8Array(0) : await deps.files.readShared(ctx.sha256);
    trace('file read');
    let lastWrite = 0;
    let lastStage = '';
    const output = await runPipelineInWorker(
      {
        bytes,
        file: ctx.format === 'csv' ? deps.files.pathOf(ctx.sha256) : undefined,
        fileName: ctx.fileName,
        format: ctx.format,
        mapping: columnMappingSchema.parse(ctx.mapping),
        cleaning: cleaningSettingsSchema.parse(ctx.cleaning ?? {}),
        boundary: JSON.parse(boundary.geometry) as MultiPolygon,
        zones: zones.map((z) => ({ ...z, geometry: JSON.parse(z.geometry) as MultiPolygon })),
        defaultTargetSi: ctx.defaultRateSi,
        bandFraction: ctx.band ?? 0.15,
        fallbackWidthM: ctx.rowCount * ctx.rowSpacingM,
        planter: {
          rowCount: ctx.rowCount,
          rowSpacingM: ctx.rowSpacingM,
          rowsPerSection: ctx.rowsPerSection,
          displaySectionLimit: ctx.displaySectionLimit,
          holesPerDisc: ctx.holesPerDisc,
          discRpmMax: ctx.discRpmMax,
        },
        meteredOn: ctx.meteredOn,
        unitSize: product.unitSize,
        pricePerUnit: product.pricePerUnit,
        findings: {
          rateUnit: ctx.rateUnit,
          unitSystem: ctx.unitSystem ?? 'imperial',
          unitName: product.unitName,
          currency: product.currency,
          productKind: product.kind,
        },
      },
      (stage, fraction) => {
        if (stage !== lastStage) trace(`stage ${(lastStage = stage)}`);
        const now = Date.now();
        if (now - lastWrite < 400 && fraction !== 1) return;
        lastWrite = now;
        pending = pending.then(() => setStatus(stage, fraction)).catch(() => {});
      },
      (points) => {
        // The COPY of the points runs on the database's core while the worker computes the diagnostics.
        trace('points from the worker');
        store = beginStore(deps, ctx, points, trace);
        store.catch(() => {});
      },
    );
    // Both reading threads are done with the bytes (the worker answered): kept for the next log.
    if (bytes.byteLength > 0) deps.files.releaseShared(bytes);
    trace('worker done');
    await pending;
    await setStatus('storing', 0);
    const client = await (store ?? beginStore(deps, ctx, output, trace));
    trace('points and cells copied');
    store = null;
    await finishStore(client, ctx, output, trace);
    trace('committed');
    await deps
      .onReady?.(logId)
      .catch((err: Error) => process.stderr.write(`[logs] ready mail: ${err.message}\n`));
  } catch (err) {
    // A storing transaction still open (the pipeline failed after the points were known) stores nothing.
    const open = await (store as Promise<pg.Client> | null)?.catch(() => null);
    if (open) await endStore(open, false);
    await dropUnattached(sequelize, logId).catch(() => {});
    // Progress writes still queued must land before `failed`, never after it.
    await pending.catch(() => {});
    // A reading error names its line; anything else (the database, the disk) stored nothing and says so.
    const line = err instanceof LogReadError ? err.line : null;
    const message =
      err instanceof LogReadError
        ? err.message
        : `Storing the log failed (${(err as Error).message}); nothing of it was kept: run it again`;
    await sequelize.query(
      `UPDATE as_applied_logs SET status = 'failed', progress = 0, error = :error, finished_at = now(),
              updated_at = now() WHERE id = :logId`,
      { replacements: { logId, error: JSON.stringify({ line, message }) } },
    );
  }
}

/**
 * Storing is ONE transaction on a connection of our own: it opens as soon as the points are known and COPYs
 * them and their tile cells into new tables (store-points.ts); `finishStore` adds the audit, the logbook and
 * the status, attaches the tables and commits. Any failure rolls all of it back.
 */
async function beginStore(
  deps: ImportDeps,
  ctx: LogContext,
  points: StoredPoints,
  trace: (step: string) => void,
): Promise<pg.Client> {
  const client = await connect(deps);
  // The cells go into their table on a second connection at the same time (the database has two cores);
  // that table is only attached by the main transaction, so until it commits the cells are not the log's.
  const cells = copyCellsApart(deps, ctx, points).then(() => trace('cells copied, indexed, committed'));
  try {
    await client.query('BEGIN');
    await storePoints(
      client,
      () => connect(deps),
      ctx.id,
      points.columns.n,
      pointColumns(ctx.id, points),
      trace,
    );
    trace('points copied and indexed');
    await cells;
    return client;
  } catch (err) {
    await cells.catch(() => {});
    await endStore(client, false);
    throw err;
  }
}

async function connect(deps: ImportDeps) {
  const client = new pg.Client({
    connectionString: deps.databaseUrl,
    application_name: 'sowright-log-import',
  });
  client.on('error', () => {});
  await client.connect();
  return client;
}

/** The log's tile cells into a new, unattached table, committed on a connection of their own. */
async function copyCellsApart(deps: ImportDeps, ctx: LogContext, points: StoredPoints) {
  const client = await connect(deps);
  try {
    await client.query('BEGIN');
    await copyLogTable(client, 'cells', ctx.id, points.cells.length, cellColumns(ctx.id, points));
    await endStore(client, true);
  } catch (err) {
    await endStore(client, false);
    throw err;
  }
}

/** A failed import leaves no table behind: the tables committed apart (cells, second part of the points) go. */
async function dropUnattached(sequelize: Sequelize, logId: string) {
  for (const table of apartTables(logId)) await sequelize.query(`DROP TABLE IF EXISTS "${table}"`);
}

async function endStore(client: pg.Client, commit: boolean) {
  try {
    if (commit) await client.query('COMMIT');
    else await client.query('ROLLBACK').catch(() => {});
  } finally {
    await client.end().catch(() => {});
  }
}

async function finishStore(
  client: pg.Client,
  ctx: LogContext,
  out: PipelineOutput,
  trace: (step: string) => void,
) {
  try {
    let kept = 0;
    for (let i = 0; i < out.removedBy.length; i++) if (out.removedBy[i] === 0) kept++;
    await client.query(
      `INSERT INTO audits (workspace_id, grower_id, log_id, band_fraction, result)
       VALUES ($1, $2, $3, $4, $5)
       ON CONFLICT (log_id) DO UPDATE SET result = EXCLUDED.result, band_fraction = EXCLUDED.band_fraction,
              version = audits.version + 1, updated_at = now()
       WHERE audits.status = 'open'`,
      [ctx.workspaceId, ctx.growerId, ctx.id, out.result.bandFraction, JSON.stringify(out.result)],
    );
    trace('audit written');
    await addToLogbook(client, ctx, out);
    await client.query(
      `UPDATE as_applied_logs SET status = 'ready', progress = 1, points_read = $2, points_kept = $3,
              cleaning_report = $4, metered_on = $5, finished_at = now(), version = version + 1, updated_at = now()
        WHERE id = $1`,
      [ctx.id, out.pointsRead, kept, JSON.stringify(out.report), out.meteredOn],
    );
    trace('logbook and status written');
    await attachLogTables(client, ctx.id, ['points', 'cells']);
    trace('tables attached');
  } catch (err) {
    await endStore(client, false);
    throw err;
  }
  await endStore(client, true);
}

/**
 * The planter logbook is a ledger: the first import adds what the log planted, a re-run adds the difference
 * (so the sums stay right), inside the same transaction as the points.
 */
async function addToLogbook(client: pg.Client, ctx: LogContext, out: PipelineOutput) {
  const { rows } = await client.query<{
    n: string;
    area: number;
    quantity: number;
    distance: number;
    hours: number;
  }>(
    `SELECT count(*) AS n, COALESCE(sum(area_m2), 0) AS area, COALESCE(sum(quantity), 0) AS quantity,
            COALESCE(sum(distance_m), 0) AS distance, COALESCE(sum(hours), 0) AS hours
       FROM planter_logbook WHERE log_id = $1`,
    [ctx.id],
  );
  const had = rows[0];
  const first = Number(had.n) === 0;
  const d = {
    area: out.logbook.areaM2 - had.area,
    quantity: out.logbook.quantity - had.quantity,
    distance: out.logbook.distanceM - had.distance,
    hours: out.logbook.hours - had.hours,
  };
  if (!first && Math.abs(d.area) < 1e-6 && Math.abs(d.quantity) < 1e-6 && Math.abs(d.hours) < 1e-9) return;
  await client.query(
    `INSERT INTO planter_logbook (workspace_id, planter_id, crop_season_id, log_id, kind, area_m2, quantity,
                                  distance_m, hours, note, created_by)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11)`,
    [
      ctx.workspaceId,
      ctx.planterId,
      ctx.seasonId,
      ctx.id,
      first ? 'log' : 'rerun',
      d.area,
      d.quantity,
      d.distance,
      d.hours,
      first ? `Log ${ctx.fileName}` : `Log ${ctx.fileName} read again (the difference)`,
      ctx.createdBy,
    ],
  );
}
