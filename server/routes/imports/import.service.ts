import { createHash } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { MultiPolygon } from 'geojson';
import { Field } from '../../db/associations';
import { Import } from '../../db/models/import.model';
import { Upload } from '../../db/models/upload.model';
import { ConflictError, DomainError, NotFoundError, ValidationError } from '../../errors';
import { assertFound, scopedWhere } from '../../lib/scope';
import { parseInWorker } from '../../jobs/parse-runner';
import type { Actor } from '../../types';
import type { ImportPreview, ImportPurpose, PreviewFeature } from '../../../shared/schemas/import.schema';
import { FileReadError } from './import-errors';
import { projectionFor } from './parsers/projections';
import type { ParseOutcome, PreviewFeatureIn } from './parsers/types';

/** Uploads larger than this answer 413 (multer counts the bytes as they arrive). */
export const MAX_UPLOAD_BYTES = 30 * 1024 * 1024;

const db = (): Sequelize => Field.sequelize!;

/** [lon, lat] near which the data should lie: the field's boundary, else the workspace's fields; null if none. */
async function referenceFor(workspaceId: string, fieldId: string): Promise<number[] | null> {
  const [row] = await db().query<{ lon: number | null; lat: number | null }>(
    `SELECT ST_X(c) AS lon, ST_Y(c) AS lat FROM (
       SELECT ST_Centroid(coalesce(
         (SELECT boundary FROM fields WHERE id = $2 AND workspace_id = $1 AND boundary IS NOT NULL),
         (SELECT ST_ConvexHull(ST_Collect(boundary)) FROM fields WHERE workspace_id = $1 AND boundary IS NOT NULL))) AS c) s`,
    { bind: [workspaceId, fieldId], type: QueryTypes.SELECT },
  );
  return row && row.lon !== null && row.lat !== null ? [row.lon, row.lat] : null;
}

async function findField(actor: Actor, fieldId: string) {
  return assertFound(await Field.findOne({ where: scopedWhere(actor, { id: fieldId }) }), 'Field');
}

/** An import of the actor's workspace (and, for farmers and consultants, of their growers' fields). */
async function findImport(actor: Actor, id: string) {
  const imp = assertFound(await Import.findOne({ where: { id, workspaceId: actor.workspaceId } }), 'Import');
  if (actor.growerScope)
    await findField(actor, imp.fieldId).catch(() => Promise.reject(new NotFoundError('Import')));
  return imp;
}

async function parseStored(imp: Import, crsCode = imp.crsCode): Promise<ParseOutcome> {
  const upload = assertFound(
    await Upload.findOne({ where: { id: imp.uploadId, workspaceId: imp.workspaceId } }),
    'Upload',
  );
  return parseInWorker({
    bytes: upload.content,
    fileName: upload.originalName,
    purpose: imp.purpose,
    crsCode,
    reference: await referenceFor(imp.workspaceId, imp.fieldId),
  });
}

type Checked = {
  valid: boolean;
  reason: string | null;
  location: number[] | null;
  area_m2: number;
  repair: MultiPolygon | null;
  repair_area_m2: number | null;
};

/**
 * Validity of each geometry as GEOS decides it (PostGIS `ST_IsValidDetail`, `ST_IsValidReason`), its ellipsoidal
 * area (`ST_Area(geography)`, GeographicLib's algorithm), and for an invalid one what `ST_MakeValid`, keeping
 * polygons only, would give instead (RFC 7946 winding), with its area.
 */
export async function checkGeometries(geometries: MultiPolygon[]): Promise<Checked[]> {
  if (geometries.length === 0) return [];
  const sql = `
    WITH input AS (
      SELECT ord AS i, ST_SetSRID(ST_GeomFromGeoJSON(f), 4326) AS g
        FROM jsonb_array_elements($1::jsonb) WITH ORDINALITY AS t(f, ord)
    ), d AS MATERIALIZED (
      SELECT i, g, ST_IsValidDetail(g) AS det FROM input
    ), r AS (
      SELECT i, g, (det).valid AS valid, (det).location AS loc,
             CASE WHEN (det).valid THEN NULL ELSE ST_IsValidReason(g) END AS reason,
             CASE WHEN (det).valid THEN NULL ELSE ST_ForcePolygonCCW(ST_Multi(ST_CollectionExtract(ST_MakeValid(g), 3))) END AS fixed
        FROM d
    )
    SELECT valid, reason,
           CASE WHEN loc IS NULL THEN NULL ELSE json_build_array(ST_X(loc), ST_Y(loc)) END AS location,
           ST_Area(g::geography, true) AS area_m2,
           CASE WHEN fixed IS NULL OR ST_IsEmpty(fixed) THEN NULL ELSE ST_AsGeoJSON(fixed, 15)::json END AS repair,
           CASE WHEN fixed IS NULL OR ST_IsEmpty(fixed) THEN NULL ELSE ST_Area(fixed::geography, true) END AS repair_area_m2
      FROM r ORDER BY i`;
  const run = (gs: MultiPolygon[]) =>
    db().query<Checked>(sql, { bind: [JSON.stringify(gs)], type: QueryTypes.SELECT });
  try {
    return await run(geometries);
  } catch {
    // Find the geometry PostGIS could not take, to name it.
    for (const [i, g] of geometries.entries()) {
      await run([g]).catch(() => {
        throw new DomainError('invalid_geometry', `Feature ${i + 1} cannot be read as a polygon`, [
          { path: ['features', i], message: 'PostGIS cannot read this shape' },
        ]);
      });
    }
    throw new DomainError('invalid_geometry', 'The shapes cannot be read as polygons');
  }
}

async function previewFeatures(features: PreviewFeatureIn[], warnings: string[]): Promise<PreviewFeature[]> {
  const checked = await checkGeometries(features.map((f) => f.geometry));
  return features.map((f, k) => {
    const c = checked[k];
    if (!c.valid && !c.repair)
      warnings.push(`Feature ${f.index + 1} is not a valid polygon and no polygon is left once repaired`);
    return {
      index: f.index,
      layer: f.layer,
      properties: f.properties,
      geometry: f.geometry,
      areaM2: Number(c.area_m2),
      validity: { valid: c.valid, reason: c.reason, location: c.location },
      repair: c.repair ? { geometry: c.repair, areaM2: Number(c.repair_area_m2) } : null,
    };
  });
}

async function toPreview(imp: Import, fileName: string, outcome: ParseOutcome): Promise<ImportPreview> {
  const warnings = [...outcome.warnings];
  const wantPoints = imp.purpose === 'points';
  if (outcome.coordinates.kind === 'geographic') {
    if (!wantPoints && outcome.features.length === 0) {
      throw new FileReadError(
        `The file holds no polygons (its layers: ${outcome.layers.map((l) => `${l.name}: ${l.geometryType}`).join(', ')})`,
      );
    }
    if (wantPoints && !outcome.pointCount) throw new FileReadError('The file holds no points');
  }
  return {
    id: imp.id,
    purpose: imp.purpose,
    format: outcome.format,
    fileName,
    layers: outcome.layers,
    coordinates: outcome.coordinates,
    features: wantPoints ? [] : await previewFeatures(outcome.features, warnings),
    ...(wantPoints
      ? { pointCount: outcome.pointCount ?? 0, numericProperties: outcome.numericProperties ?? [] }
      : {}),
    warnings,
  };
}

/** A stored file name: the last path part, no control characters, at most 255 characters. */
function safeName(original: string): string {
  const name = (original.split(/[\\/]/).pop() ?? '')
    // eslint-disable-next-line no-control-regex
    .replace(/[\u0000-\u001f\u007f]/g, '')
    .trim()
    .slice(0, 255);
  return name || 'upload';
}

/**
 * POST /api/imports: reads the file in the parse worker (nothing is stored if it cannot be read), then keeps
 * the original bytes (the same file for the same field and purpose is one upload: INSERT … ON CONFLICT) and
 * a new import in one transaction, and answers the preview.
 */
export async function createImport(
  actor: Actor,
  file: { buffer: Buffer; originalname: string } | undefined,
  input: { purpose: ImportPurpose; fieldId: string },
): Promise<ImportPreview> {
  if (!file)
    throw new ValidationError('Attach the file as "file"', [{ path: ['file'], message: 'Attach a file' }]);
  const field = await findField(actor, input.fieldId);
  const fileName = safeName(file.originalname);
  const outcome = await parseInWorker({
    bytes: file.buffer,
    fileName,
    purpose: input.purpose,
    crsCode: null,
    reference: await referenceFor(actor.workspaceId, field.id),
  });
  const draft = Import.build({
    workspaceId: actor.workspaceId,
    uploadId: '',
    fieldId: field.id,
    purpose: input.purpose,
    format: outcome.format,
    crsCode: null,
    createdBy: actor.userId,
  });
  // Check before storing, so a file that is refused leaves nothing behind.
  const preview = await toPreview(draft, fileName, outcome);
  const sha256 = createHash('sha256').update(file.buffer).digest('hex');
  await db().transaction(async (transaction) => {
    const [upload] = await db().query<{ id: string }>(
      `INSERT INTO uploads (workspace_id, field_id, purpose, original_name, size_bytes, sha256, content, created_by)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8)
       ON CONFLICT (workspace_id, field_id, purpose, sha256) DO UPDATE SET sha256 = EXCLUDED.sha256
       RETURNING id`,
      {
        bind: [
          actor.workspaceId,
          field.id,
          input.purpose,
          fileName,
          file.buffer.length,
          sha256,
          file.buffer,
          actor.userId,
        ],
        type: QueryTypes.SELECT,
        transaction,
      },
    );
    await Import.create({ ...draft.get(), uploadId: upload.id }, { transaction });
  });
  return preview;
}

/** GET /api/imports/:id: the preview again (the stored file read anew, with any coordinate system chosen). */
export async function getImportPreview(actor: Actor, id: string): Promise<ImportPreview> {
  const imp = await findImport(actor, id);
  const upload = assertFound(await Upload.findByPk(imp.uploadId, { attributes: ['originalName'] }), 'Upload');
  return toPreview(imp, upload.originalName, await parseStored(imp));
}

/** POST /api/imports/:id/coordinates: the preview reprojected from the EPSG code the user chose. */
export async function chooseImportCoordinates(
  actor: Actor,
  id: string,
  code: string,
): Promise<ImportPreview> {
  const imp = await findImport(actor, id);
  if (!projectionFor(code)) {
    throw new FileReadError(
      `Sowright cannot reproject from ${code}; choose one of the suggested systems or a UTM zone`,
      'unknown_crs',
      [{ path: ['code'], message: `Unknown to Sowright: ${code}` }],
    );
  }
  const outcome = await parseStored(imp, code);
  if (!outcome.crsChosen)
    throw new ConflictError(
      'This file says which coordinate system it is in; there is nothing to choose',
      'conflict',
    );
  const upload = assertFound(await Upload.findByPk(imp.uploadId, { attributes: ['originalName'] }), 'Upload');
  const preview = await toPreview(imp, upload.originalName, outcome);
  imp.crsCode = code;
  await imp.save();
  return preview;
}

/** Features of a geographic reading; refuses one whose coordinate system is still to be chosen. */
async function readFeatures(actor: Actor, importId: string) {
  const imp = await findImport(actor, importId);
  const outcome = await parseStored(imp);
  if (outcome.coordinates.kind === 'projected') {
    throw new FileReadError('Choose the coordinate system of this file first', 'coordinates_unknown');
  }
  return { imp, outcome };
}

/**
 * The polygon features of an import in WGS84 (RFC 7946 winding), each valid as PostGIS decides or replaced
 * by its repair (`ST_MakeValid`, polygons kept); features that leave no polygon when repaired are left out.
 * Throws NotFoundError for an import of another workspace.
 */
export async function loadImportFeatures(
  actor: Actor,
  importId: string,
): Promise<{ index: number; properties: Record<string, unknown>; geometry: MultiPolygon }[]> {
  const { imp, outcome } = await readFeatures(actor, importId);
  if (imp.purpose === 'points') throw new ValidationError('This import is a point layer, not polygons');
  const checked = await checkGeometries(outcome.features.map((f) => f.geometry));
  return outcome.features.flatMap((f, k) => {
    const c = checked[k];
    const geometry = c.valid ? f.geometry : c.repair;
    return geometry ? [{ index: f.index, properties: f.properties, geometry }] : [];
  });
}

/** The same, with validity and repair kept apart (for setting a boundary, where the user decides). */
export async function loadImportCandidates(actor: Actor, importId: string) {
  const { imp, outcome } = await readFeatures(actor, importId);
  return { imp, features: outcome.features };
}

/**
 * The points of a point import in WGS84 with the value of one numeric attribute; points without a value
 * for it are left out. Throws NotFoundError for an import of another workspace, and a validation error
 * when the attribute is not a numeric property of the file.
 */
export async function loadImportPoints(
  actor: Actor,
  importId: string,
  attribute: string,
): Promise<{ lon: number; lat: number; value: number }[]> {
  const { imp, outcome } = await readFeatures(actor, importId);
  if (imp.purpose !== 'points' || !outcome.points)
    throw new ValidationError('This import is not a point layer');
  const numeric = new Set((outcome.numericProperties ?? []).map((p) => p.name));
  const column = outcome.points.columns.find((c) => c.name === attribute);
  if (!column || !numeric.has(attribute)) {
    throw new ValidationError(`"${attribute}" is not a numeric attribute of this file`, [
      { path: ['attribute'], message: 'Not a numeric attribute of the file' },
    ]);
  }
  const { lon, lat } = outcome.points;
  const out: { lon: number; lat: number; value: number }[] = [];
  for (let i = 0; i < lon.length; i++) {
    const value = column.values[i];
    if (!Number.isNaN(value)) out.push({ lon: lon[i], lat: lat[i], value });
  }
  return out;
}
