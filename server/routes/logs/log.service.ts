import { QueryTypes } from 'sequelize';
import type { z } from 'zod';
import { Prescription } from '../../db/associations';
import { ConflictError, NotFoundError, ValidationError } from '../../errors';
import type { Actor } from '../../types';
import type { FileStore, ReceivedFile } from '../../logs/file-store';
import { readFile } from 'node:fs/promises';
import { FileReadError } from '../imports/import-errors';
import { findPrescription } from '../prescriptions/prescription.dto';
import { CROP_LABELS } from '../../../shared/schemas/crops';
import {
  cleaningSettingsSchema,
  columnMappingSchema,
  type ColumnMapping,
  type Log,
  type createLogSchema,
} from '../../../shared/schemas/as-applied.schema';
import { readCsvHeader, suggestMapping } from '../../../shared/audit/csv-log';
import { pointsFileToCsv } from '../../logs/points-to-csv';

const db = () => Prescription.sequelize!;

/** A season's log for a large planter is a few million points at about 76 bytes each. */
export const MAX_LOG_BYTES = 600 * 1024 * 1024;

/** Scope of a raw query on a table with workspace_id and grower_id (alias `l`). */
export function logScope(actor: Actor) {
  return {
    sql: 'l.workspace_id = :scopeWs AND (CAST(:scopeAll AS boolean) OR l.grower_id = ANY(CAST(:scopeGrowers AS uuid[])))',
    replacements: {
      scopeWs: actor.workspaceId,
      scopeAll: actor.growerScope === null,
      scopeGrowers: `{${(actor.growerScope ?? []).join(',')}}`,
    },
  };
}

function formatOf(name: string, bytes: Uint8Array): 'csv' | 'geojson' | 'shapefile' {
  if (bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 3 && bytes[3] === 4)
    return 'shapefile';
  let i = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  while (
    i < bytes.length &&
    i < 4096 &&
    (bytes[i] === 0x20 || bytes[i] === 0x0a || bytes[i] === 0x0d || bytes[i] === 0x09)
  )
    i++;
  if (bytes[i] === 0x7b) return 'geojson';
  if (/\.(csv|txt)$/i.test(name) || bytes[i] !== 0x3c) return 'csv';
  throw new FileReadError(
    'Sowright reads as-applied logs as CSV, GeoJSON points or a zipped point shapefile',
  );
}

/** The approved (or since replaced) prescription a log was planted with, in the actor's scope. */
async function plantedWith(actor: Actor, prescriptionId: string) {
  const rx = await findPrescription(actor, prescriptionId).catch(() => {
    throw new ValidationError('Choose the prescription the field was planted with', [
      { path: ['prescriptionId'], message: 'Unknown prescription' },
    ]);
  });
  if (rx.status === 'draft') {
    throw new ValidationError('A log is checked against an approved prescription', [
      {
        path: ['prescriptionId'],
        message: `Version ${rx.versionNo} is a draft: choose the version that was planted`,
      },
    ]);
  }
  return rx;
}

async function rememberedMapping(planterId: string | null): Promise<ColumnMapping | null> {
  if (!planterId) return null;
  const [row] = await db().query<{ mapping: unknown }>(
    'SELECT mapping FROM planter_log_mappings WHERE planter_id = :planterId',
    {
      replacements: { planterId },
      type: QueryTypes.SELECT,
    },
  );
  const parsed = row ? columnMappingSchema.safeParse(row.mapping) : null;
  return parsed?.success ? parsed.data : null;
}

/**
 * Keeps the file (once per field and content) and answers what the mapping step needs: its columns, a few
 * rows, the mapping suggested from the header names and the one last used with this planter.
 */
export async function previewLog(
  actor: Actor,
  files: FileStore,
  input: { prescriptionId: string; planterId: string | null; fileName: string; file: ReceivedFile },
) {
  const rx = await plantedWith(actor, input.prescriptionId);
  const format = formatOf(input.fileName, input.file.head);
  const table =
    format === 'csv'
      ? input.file.head
      : await pointsFileToCsv(new Uint8Array(await readFile(input.file.tmp)), input.fileName);
  const header = readCsvHeader(table);
  const { sha256, sizeBytes } = await files.adopt(input.file);
  const [file] = await db().query<{ id: string }>(
    `INSERT INTO log_files (workspace_id, field_id, original_name, format, size_bytes, sha256, created_by)
     VALUES (:ws, :fieldId, :name, :format, :size, :sha256, :userId)
     ON CONFLICT (workspace_id, field_id, sha256) DO UPDATE SET original_name = log_files.original_name
     RETURNING id`,
    {
      replacements: {
        ws: actor.workspaceId,
        fieldId: rx.fieldId,
        name: input.fileName.slice(0, 255) || 'log.csv',
        format,
        size: sizeBytes,
        sha256,
        userId: actor.userId,
      },
      type: QueryTypes.SELECT,
    },
  );
  const [existing] = await db().query<{ id: string }>(
    'SELECT id FROM as_applied_logs WHERE workspace_id = :ws AND file_id = :fileId',
    { replacements: { ws: actor.workspaceId, fileId: file.id }, type: QueryTypes.SELECT },
  );
  return {
    fileId: file.id,
    fileName: input.fileName,
    sizeBytes,
    format,
    columns: header.columns,
    sample: header.sample,
    suggested: suggestMapping(header.columns, header.sample),
    remembered: await rememberedMapping(input.planterId ?? rx.planterId),
    existingLogId: existing?.id ?? null,
  };
}

type LogRow = {
  id: string;
  growerId: string;
  fieldId: string;
  fieldName: string;
  seasonId: string;
  seasonYear: number;
  seasonCrop: string;
  planterId: string;
  planterName: string;
  prescriptionId: string;
  prescriptionName: string;
  prescriptionVersionNo: number;
  fileName: string;
  sizeBytes: string;
  status: Log['status'];
  progress: number;
  error: { line: number | null; message: string } | null;
  pointsRead: number | null;
  pointsKept: number | null;
  cleaning: unknown;
  cleaningReport: Log['cleaningReport'];
  startedAt: Date | null;
  finishedAt: Date | null;
  createdAt: Date;
  version: number;
};

const LOG_SELECT = `
  SELECT l.id, l.grower_id AS "growerId", l.field_id AS "fieldId", f.name AS "fieldName",
         l.crop_season_id AS "seasonId", s.year AS "seasonYear", s.crop AS "seasonCrop",
         l.planter_id AS "planterId", pl.name AS "planterName", l.prescription_id AS "prescriptionId",
         r.name AS "prescriptionName", r.version_no AS "prescriptionVersionNo",
         lf.original_name AS "fileName", lf.size_bytes AS "sizeBytes", l.status, l.progress, l.error,
         l.points_read AS "pointsRead", l.points_kept AS "pointsKept", l.cleaning,
         l.cleaning_report AS "cleaningReport", l.started_at AS "startedAt", l.finished_at AS "finishedAt",
         l.created_at AS "createdAt", l.version
    FROM as_applied_logs l
    JOIN fields f ON f.id = l.field_id
    JOIN crop_seasons s ON s.id = l.crop_season_id
    JOIN planters pl ON pl.id = l.planter_id
    JOIN prescriptions r ON r.id = l.prescription_id
    JOIN log_files lf ON lf.id = l.file_id`;

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);

function toDto(r: LogRow): Log {
  return {
    id: r.id,
    growerId: r.growerId,
    fieldId: r.fieldId,
    fieldName: r.fieldName,
    seasonId: r.seasonId,
    seasonLabel: `${r.seasonYear} ${CROP_LABELS[r.seasonCrop as keyof typeof CROP_LABELS] ?? r.seasonCrop}`,
    planterId: r.planterId,
    planterName: r.planterName,
    prescriptionId: r.prescriptionId,
    prescriptionLabel: `${r.prescriptionName} v${r.prescriptionVersionNo}`,
    fileName: r.fileName,
    sizeBytes: Number(r.sizeBytes),
    status: r.status,
    progress: r.progress,
    error: r.error,
    pointsRead: r.pointsRead,
    pointsKept: r.pointsKept,
    cleaning: cleaningSettingsSchema.parse(r.cleaning ?? {}),
    cleaningReport: r.cleaningReport,
    startedAt: iso(r.startedAt),
    finishedAt: iso(r.finishedAt),
    createdAt: new Date(r.createdAt).toISOString(),
    version: r.version,
  };
}

export async function getLog(actor: Actor, id: string): Promise<Log> {
  const scope = logScope(actor);
  const [row] = await db().query<LogRow>(`${LOG_SELECT} WHERE l.id = :id AND ${scope.sql}`, {
    replacements: { id, ...scope.replacements },
    type: QueryTypes.SELECT,
  });
  if (!row) throw new NotFoundError('Log');
  return toDto(row);
}

export async function listLogs(actor: Actor, q: { fieldId?: string; seasonId?: string; growerId?: string }) {
  const scope = logScope(actor);
  const where = [scope.sql];
  if (q.fieldId) where.push('l.field_id = :fieldId');
  if (q.seasonId) where.push('l.crop_season_id = :seasonId');
  if (q.growerId) where.push('l.grower_id = :growerId');
  const rows = await db().query<LogRow>(
    `${LOG_SELECT} WHERE ${where.join(' AND ')} ORDER BY l.created_at DESC LIMIT 500`,
    {
      replacements: {
        ...scope.replacements,
        fieldId: q.fieldId ?? null,
        seasonId: q.seasonId ?? null,
        growerId: q.growerId ?? null,
      },
      type: QueryTypes.SELECT,
    },
  );
  return { items: rows.map(toDto) };
}

export type Enqueue = (logId: string) => Promise<void>;

/**
 * Makes the log of an uploaded file and queues its import. The same file again answers the log already
 * made (idempotent). The mapping is remembered for the planter.
 */
export async function createLog(actor: Actor, input: z.output<typeof createLogSchema>, enqueue: Enqueue) {
  const rx = await plantedWith(actor, input.prescriptionId);
  const [file] = await db().query<{ id: string; fieldId: string }>(
    'SELECT id, field_id AS "fieldId" FROM log_files WHERE id = :id AND workspace_id = :ws',
    { replacements: { id: input.fileId, ws: actor.workspaceId }, type: QueryTypes.SELECT },
  );
  if (!file || file.fieldId !== rx.fieldId) {
    throw new ValidationError('Upload the file again for this field', [
      { path: ['fileId'], message: 'Unknown file for this field' },
    ]);
  }
  const [planter] = await db().query<{ id: string }>(
    'SELECT id FROM planters WHERE id = :id AND workspace_id = :ws AND grower_id = :growerId',
    {
      replacements: { id: input.planterId, ws: actor.workspaceId, growerId: rx.growerId },
      type: QueryTypes.SELECT,
    },
  );
  if (!planter)
    throw new ValidationError('Choose one of this grower’s planters', [
      { path: ['planterId'], message: 'Not a planter of this grower' },
    ]);

  const values = {
    ws: actor.workspaceId,
    growerId: rx.growerId,
    fieldId: rx.fieldId,
    seasonId: rx.cropSeasonId,
    planterId: input.planterId,
    prescriptionId: rx.id,
    fileId: file.id,
    mapping: JSON.stringify(input.mapping),
    meteredOn: input.meteredOn,
    cleaning: JSON.stringify(cleaningSettingsSchema.parse({})),
    userId: actor.userId,
  };
  // A new file makes a new log. The same file again answers the log it made — except a log that failed,
  // which takes the new mapping and is read again (the person fixed what broke).
  const [made] = await db().query<{ id: string; created: boolean; requeued: boolean }>(
    `WITH before AS (SELECT status FROM as_applied_logs WHERE workspace_id = :ws AND file_id = :fileId)
     INSERT INTO as_applied_logs (workspace_id, grower_id, field_id, crop_season_id, planter_id, prescription_id,
                                  file_id, mapping, metered_on, cleaning, created_by)
     VALUES (:ws, :growerId, :fieldId, :seasonId, :planterId, :prescriptionId, :fileId, :mapping, :meteredOn,
             :cleaning, :userId)
     ON CONFLICT (workspace_id, file_id) DO UPDATE SET
       mapping = CASE WHEN as_applied_logs.status = 'failed' THEN EXCLUDED.mapping ELSE as_applied_logs.mapping END,
       metered_on = CASE WHEN as_applied_logs.status = 'failed' THEN EXCLUDED.metered_on ELSE as_applied_logs.metered_on END,
       planter_id = CASE WHEN as_applied_logs.status = 'failed' THEN EXCLUDED.planter_id ELSE as_applied_logs.planter_id END,
       prescription_id = CASE WHEN as_applied_logs.status = 'failed' THEN EXCLUDED.prescription_id ELSE as_applied_logs.prescription_id END,
       version = as_applied_logs.version + CASE WHEN as_applied_logs.status = 'failed' THEN 1 ELSE 0 END,
       error = CASE WHEN as_applied_logs.status = 'failed' THEN NULL ELSE as_applied_logs.error END,
       status = CASE WHEN as_applied_logs.status = 'failed' THEN 'queued' ELSE as_applied_logs.status END,
       updated_at = now()
     RETURNING id, (xmax = 0) AS created, COALESCE((SELECT status FROM before) = 'failed', false) AS requeued`,
    { replacements: values, type: QueryTypes.SELECT },
  );
  await db().query(
    `INSERT INTO planter_log_mappings (planter_id, mapping) VALUES (:planterId, :mapping)
     ON CONFLICT (planter_id) DO UPDATE SET mapping = EXCLUDED.mapping, updated_at = now()`,
    { replacements: { planterId: input.planterId, mapping: JSON.stringify(input.mapping) } },
  );
  if (made.created || made.requeued) await enqueue(made.id);
  return { log: await getLog(actor, made.id), created: made.created };
}

/** Runs the import again with other cleaning settings or tolerance band (never on a signed-off audit). */
export async function recleanLog(
  actor: Actor,
  id: string,
  input: { version: number; cleaning: z.output<typeof cleaningSettingsSchema>; bandFraction: number },
  enqueue: Enqueue,
) {
  const log = await getLog(actor, id);
  if (log.version !== input.version) {
    throw new ConflictError(
      'Someone else changed this log since you opened it: reload it and try again',
      'stale',
    );
  }
  if (log.status !== 'ready' && log.status !== 'failed') {
    throw new ConflictError('The log is being read: wait until it is done', 'busy');
  }
  const [audit] = await db().query<{ status: string }>('SELECT status FROM audits WHERE log_id = :id', {
    replacements: { id },
    type: QueryTypes.SELECT,
  });
  if (audit?.status === 'signed-off') {
    throw new ConflictError('The audit is signed off and frozen: its cleaning cannot change', 'frozen');
  }
  // The band changes on the audit together with its figures, when the import has run again.
  await db().query(
    `UPDATE as_applied_logs SET cleaning = :cleaning, band_fraction = :band, status = 'queued', progress = 0,
            error = NULL, version = version + 1, updated_at = now() WHERE id = :id`,
    { replacements: { id, cleaning: JSON.stringify(input.cleaning), band: input.bandFraction } },
  );
  await enqueue(id);
  return getLog(actor, id);
}

/** Deletes a log; its planter's logbook keeps the history: what the log added is subtracted, with a note. */
export async function deleteLog(actor: Actor, id: string) {
  const log = await getLog(actor, id);
  const [me] = await db().query<{ name: string }>('SELECT name FROM users WHERE id = :id', {
    replacements: { id: actor.userId },
    type: QueryTypes.SELECT,
  });
  await db().transaction(async (t) => {
    await db().query(
      `INSERT INTO planter_logbook (workspace_id, planter_id, crop_season_id, log_id, kind, area_m2, quantity,
                                    distance_m, hours, note, created_by)
       SELECT workspace_id, planter_id, crop_season_id, log_id, 'deleted', -sum(area_m2), -sum(quantity),
              -sum(distance_m), -sum(hours), :note, :userId
         FROM planter_logbook WHERE log_id = :id
        GROUP BY workspace_id, planter_id, crop_season_id, log_id
       HAVING count(*) > 0`,
      {
        replacements: {
          id,
          userId: actor.userId,
          note: `Log ${log.fileName} deleted by ${me?.name ?? 'someone'} on ${new Date().toISOString().slice(0, 10)}: its counts are taken off`,
        },
        transaction: t,
      },
    );
    await db().query('DELETE FROM as_applied_logs WHERE id = :id', { replacements: { id }, transaction: t });
  });
}
