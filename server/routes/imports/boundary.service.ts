import { QueryTypes } from 'sequelize';
import type { z } from 'zod';
import type { MultiPolygon } from 'geojson';
import { Field } from '../../db/associations';
import { DomainError, ValidationError } from '../../errors';
import { assertFound, assertVersion, scopedWhere } from '../../lib/scope';
import { assertValidBoundary } from '../../lib/geometry';
import type { Actor } from '../../types';
import type { setBoundarySchema } from '../../../shared/schemas/import.schema';
import { normaliseFeatures } from '../../../shared/geo/normalise-features';
import { GeoInputError } from '../../../shared/geo/geo-input-error';
import { assertDegreesInRange, assertNoAntimeridianCrossing } from '../../../shared/geo/detect-coordinates';
import { getField } from '../fields/field.service';
import { checkGeometries, loadImportCandidates } from './import.service';

type Piece = { label: string; path: (string | number)[]; geometry: MultiPolygon };

/** A drawn geometry as one piece: closed rings, 2D, numbers on the globe (else 422 naming the place). */
function drawnPiece(geometry: unknown): Piece {
  try {
    const { features } = normaliseFeatures({ type: 'Feature', geometry, properties: {} });
    if (features.length === 0) throw new GeoInputError('The drawn boundary is empty');
    assertDegreesInRange(features);
    assertNoAntimeridianCrossing(features);
    return { label: 'The drawn boundary', path: ['geometry'], geometry: features[0].geometry };
  } catch (err) {
    if (err instanceof GeoInputError)
      throw new DomainError('invalid_geometry', err.message, [{ path: ['geometry'], message: err.message }]);
    throw err;
  }
}

async function importedPieces(
  actor: Actor,
  fieldId: string,
  importId: string,
  indexes: number[],
): Promise<Piece[]> {
  const { imp, features } = await loadImportCandidates(actor, importId);
  if (imp.fieldId !== fieldId)
    throw new ValidationError('This import was made for another field', [
      { path: ['importId'], message: 'Made for another field' },
    ]);
  if (imp.purpose === 'points')
    throw new ValidationError('This import is a point layer', [
      { path: ['importId'], message: 'A point layer has no boundary' },
    ]);
  return [...new Set(indexes)].map((index, k) => {
    const f = features.find((x) => x.index === index);
    if (!f)
      throw new ValidationError(`The file has no polygon feature ${index}`, [
        { path: ['featureIndexes', k], message: 'No such polygon feature' },
      ]);
    return { label: `Feature ${index + 1}`, path: ['featureIndexes', k], geometry: f.geometry };
  });
}

/**
 * PUT /api/fields/:id/boundary: the chosen import features (unioned in PostGIS into one MultiPolygon) or a
 * drawn geometry become the field's boundary. Validity is decided by PostGIS; an invalid piece without
 * `repair: true` answers `invalid_geometry` naming reason and place, with `repair` its `ST_MakeValid`
 * (polygons only) is stored. Nothing invalid is stored; a stale `version` answers 409.
 */
export async function setFieldBoundary(
  actor: Actor,
  fieldId: string,
  input: z.output<typeof setBoundarySchema>,
) {
  const field = assertFound(await Field.findOne({ where: scopedWhere(actor, { id: fieldId }) }), 'Field');
  assertVersion(field.version, input.version);
  const pieces =
    'importId' in input
      ? await importedPieces(actor, fieldId, input.importId, input.featureIndexes)
      : [drawnPiece(input.geometry)];
  const checked = await checkGeometries(pieces.map((p) => p.geometry));
  const geometries = pieces.map((piece, k) => {
    const c = checked[k];
    if (c.valid) return piece.geometry;
    const where = c.location ? ` near ${c.location.map((v) => v.toFixed(7)).join(', ')}` : '';
    const message = `${piece.label} is not a valid polygon: ${c.reason ?? 'invalid'}${where}`;
    if (!input.repair) throw new DomainError('invalid_geometry', message, [{ path: piece.path, message }]);
    if (!c.repair)
      throw new DomainError('invalid_geometry', `${message}; no polygon is left once repaired`, [
        { path: piece.path, message },
      ]);
    return c.repair;
  });
  const [row] = await Field.sequelize!.query<{ geom: MultiPolygon }>(
    `WITH input AS (SELECT ST_SetSRID(ST_GeomFromGeoJSON(f), 4326) AS g FROM jsonb_array_elements($1::jsonb) f)
     SELECT ST_AsGeoJSON(ST_ForcePolygonCCW(ST_Multi(
              CASE WHEN count(*) = 1 THEN ST_CollectionExtract(ST_Collect(g), 3)
                   ELSE ST_CollectionExtract(ST_UnaryUnion(ST_Collect(g)), 3) END)), 15)::json AS geom
       FROM input`,
    { bind: [JSON.stringify(geometries)], type: QueryTypes.SELECT },
  );
  const boundary = row.geom as { type: 'MultiPolygon'; coordinates: number[][][][] };
  await assertValidBoundary(Field.sequelize!, boundary);
  field.boundary = boundary;
  await field.save();
  return getField(actor, fieldId);
}
