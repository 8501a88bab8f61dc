import { QueryTypes, type Sequelize } from 'sequelize';
import { DomainError } from '../errors';
import type { MultiPolygonGeom } from '../../shared/geo/to-multipolygon';

/**
 * Validity is decided by GEOS through PostGIS (ST_IsValidReason), never by Turf (RELIABILITY.md).
 * Throws `invalid_geometry` with the reason and the place PostGIS names.
 */
export async function assertValidBoundary(sequelize: Sequelize, geom: MultiPolygonGeom, path = 'boundary') {
  const [row] = await sequelize.query<{ valid: boolean; reason: string; empty: boolean }>(
    `SELECT ST_IsValid(g) AS valid, ST_IsValidReason(g) AS reason, ST_IsEmpty(g) AS empty
       FROM (SELECT ST_SetSRID(ST_GeomFromGeoJSON(:geojson), 4326) AS g) s`,
    { replacements: { geojson: JSON.stringify(geom) }, type: QueryTypes.SELECT },
  );
  if (!row) throw new DomainError('invalid_geometry', 'The boundary could not be read');
  if (row.empty) {
    throw new DomainError('invalid_geometry', 'The boundary is empty', [
      { path: [path], message: 'The boundary is empty' },
    ]);
  }
  if (!row.valid) {
    const message = `The boundary is not a valid polygon: ${row.reason}`;
    throw new DomainError('invalid_geometry', message, [{ path: [path], message }]);
  }
}

/** Sequelize adds a `crs` member to geometry it reads: RFC 7946 has none, so strip it. */
export function stripCrs<T extends object | null>(geom: T): T {
  if (!geom) return geom;
  const { crs: _crs, ...rest } = geom as T & { crs?: unknown };
  return rest as T;
}
