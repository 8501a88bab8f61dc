import { QueryTypes, type Transaction } from 'sequelize';
import type { Feature, MultiPolygon } from 'geojson';
import { Zone } from '../../db/models/zone.model';
import { DomainError } from '../../errors';

/**
 * Reading and writing zone rows through SQL, so that PostGIS decides validity: geometry computed in
 * shared/geo is stored as it is when GEOS finds it valid, else as ST_MakeValid makes it with polygons
 * only; an empty result is refused. Nothing invalid reaches the table (its CHECK says so too).
 */

/** What shared/geo's zone operations take and give (DEVELOPERS.md, "shared/geo"). */
export type ZoneGeoProps = {
  id: string;
  name: string;
  classValue: number | null;
  productivityIndex: number | null;
  isDefault: boolean;
};
export type ZoneGeoFeature = Feature<MultiPolygon, ZoneGeoProps>;

export type ZoneRow = ZoneGeoProps & {
  meanValue: number | null;
  areaM2: number;
  sortOrder: number;
  geometry: MultiPolygon;
};

/**
 * A geometry sent by a person (drawn or edited) as PostGIS reads it: refused with a 422 that names the reason
 * and the place when it cannot be read, is empty, or is not valid (a bow-tie, a hole outside its shell…).
 */
export async function assertValidInput(geometry: unknown, transaction?: Transaction, path = 'geometry') {
  const refuse = (message: string) =>
    new DomainError('invalid_geometry', message, [{ path: [path], message }]);
  let row: { valid: boolean; reason: string; location: string | null; empty: boolean } | undefined;
  try {
    [row] = await sequelize().query<{
      valid: boolean;
      reason: string;
      location: string | null;
      empty: boolean;
    }>(
      `SELECT ST_IsValid(g) AS valid, ST_IsValidReason(g) AS reason, ST_AsText((ST_IsValidDetail(g)).location) AS location,
              ST_IsEmpty(g) AS empty
         FROM (SELECT ST_Force2D(ST_SetSRID(ST_GeomFromGeoJSON(:geojson), 4326)) AS g) s`,
      { replacements: { geojson: JSON.stringify(geometry) }, type: QueryTypes.SELECT, transaction },
    );
  } catch (err) {
    const detail = err instanceof Error ? err.message.replace(/^.*?:\s*/, '') : '';
    throw refuse(`The zone's shape cannot be read as a polygon${detail ? `: ${detail}` : ''}`);
  }
  if (!row || row.empty) throw refuse("The zone's shape is empty");
  if (!row.valid) {
    const place = row.location
      ? ` near ${row.location
          .replace(/^POINT\(|\)$/g, '')
          .split(' ')
          .join(', ')} (lon, lat)`
      : '';
    throw refuse(`The zone's shape is not a valid polygon: ${row.reason.replace(/\[.*\]$/, '')}${place}`);
  }
}

export type ZoneInput = Omit<ZoneRow, 'id' | 'areaM2' | 'sortOrder'> & { sortOrder?: number };

const sequelize = () => Zone.sequelize!;

/** GeoJSON in, a valid 2D MultiPolygon in WGS84 out (or an empty one). */
const VALID_GEOMETRY = `(
  SELECT ST_Multi(ST_CollectionExtract(CASE WHEN ST_IsValid(g0) THEN g0 ELSE ST_MakeValid(g0) END, 3))
    FROM (SELECT ST_Force2D(ST_SetSRID(ST_GeomFromGeoJSON(:geometry), 4326)) AS g0) raw
)`;

function emptyZone(place: string): DomainError {
  const message = `${place} has no area inside the field boundary`;
  return new DomainError('invalid_geometry', message, [{ path: ['geometry'], message }]);
}

/** The zones of a map in their order, geometry wound as RFC 7946 asks (exterior counter-clockwise). */
export async function zoneRowsOf(zoneMapId: string, transaction?: Transaction): Promise<ZoneRow[]> {
  const rows = await sequelize().query<Omit<ZoneRow, 'geometry'> & { geometry: string }>(
    `SELECT id, name, class_value AS "classValue", productivity_index AS "productivityIndex",
            is_default AS "isDefault", mean_value AS "meanValue", area_m2 AS "areaM2", sort_order AS "sortOrder",
            ST_AsGeoJSON(ST_ForcePolygonCCW(geometry), 15) AS geometry
       FROM zones WHERE zone_map_id = :zoneMapId ORDER BY sort_order, created_at, id`,
    { replacements: { zoneMapId }, type: QueryTypes.SELECT, transaction },
  );
  return rows.map((r) => ({ ...r, geometry: JSON.parse(r.geometry) as MultiPolygon }));
}

export const toGeoFeature = (z: ZoneRow): ZoneGeoFeature => ({
  type: 'Feature',
  properties: {
    id: z.id,
    name: z.name,
    classValue: z.classValue,
    productivityIndex: z.productivityIndex,
    isDefault: z.isDefault,
  },
  geometry: z.geometry,
});

/** Inserts a zone; answers its id. `place` names the zone in the message if nothing of it is left. */
export async function insertZone(
  t: Transaction,
  map: { id: string; workspaceId: string },
  z: ZoneInput,
  place = `Zone "${z.name}"`,
): Promise<string> {
  const sortOrder =
    z.sortOrder ??
    (
      await sequelize().query<{ next: number }>(
        'SELECT COALESCE(max(sort_order), -1) + 1 AS next FROM zones WHERE zone_map_id = :id',
        { replacements: { id: map.id }, type: QueryTypes.SELECT, transaction: t },
      )
    )[0].next;
  const rows = await sequelize().query<{ id: string }>(
    `INSERT INTO zones (zone_map_id, workspace_id, name, class_value, productivity_index, is_default, mean_value,
                        geometry, sort_order)
     SELECT :zoneMapId, :workspaceId, :name, :classValue, :productivityIndex, :isDefault, :meanValue, g, :sortOrder
       FROM (SELECT ${VALID_GEOMETRY} AS g) s WHERE NOT ST_IsEmpty(g)
     RETURNING id`,
    {
      replacements: {
        zoneMapId: map.id,
        workspaceId: map.workspaceId,
        name: z.name,
        classValue: z.classValue,
        productivityIndex: z.productivityIndex,
        isDefault: z.isDefault,
        meanValue: z.meanValue,
        geometry: JSON.stringify(z.geometry),
        sortOrder,
      },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  if (!rows[0]) throw emptyZone(place);
  return rows[0].id;
}

/** Changes a zone's attributes and, when given, its geometry. */
export async function updateZoneRow(
  t: Transaction,
  id: string,
  z: Partial<Pick<ZoneRow, 'name' | 'classValue' | 'productivityIndex' | 'isDefault' | 'geometry'>>,
  place = 'The zone',
) {
  const sets: string[] = ['updated_at = now()'];
  const columns = {
    name: 'name',
    classValue: 'class_value',
    productivityIndex: 'productivity_index',
    isDefault: 'is_default',
  } as const;
  for (const [key, column] of Object.entries(columns)) {
    if (z[key as keyof typeof columns] !== undefined) sets.push(`${column} = :${key}`);
  }
  if (z.geometry) sets.push('geometry = s.g');
  const rows = await sequelize().query<{ id: string }>(
    `UPDATE zones SET ${sets.join(', ')}
       FROM (SELECT ${z.geometry ? VALID_GEOMETRY : 'NULL::geometry'} AS g) s
      WHERE zones.id = :id ${z.geometry ? 'AND NOT ST_IsEmpty(s.g)' : ''}
     RETURNING zones.id`,
    {
      replacements: { ...z, id, geometry: z.geometry ? JSON.stringify(z.geometry) : null },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  if (!rows[0]) throw emptyZone(place);
}

export async function deleteZoneRow(t: Transaction, id: string) {
  await sequelize().query('DELETE FROM zones WHERE id = :id', { replacements: { id }, transaction: t });
}

/** Copies every zone of one map into another (a new version). */
export async function copyZones(t: Transaction, fromMapId: string, toMapId: string) {
  await sequelize().query(
    `INSERT INTO zones (zone_map_id, workspace_id, name, class_value, productivity_index, is_default, mean_value,
                        geometry, sort_order)
     SELECT :toMapId, workspace_id, name, class_value, productivity_index, is_default, mean_value, geometry, sort_order
       FROM zones WHERE zone_map_id = :fromMapId`,
    { replacements: { fromMapId, toMapId }, transaction: t },
  );
}

/** Overlaps smaller than this (m²) are numerical dust from polygon clipping, not something to show. */
export const OVERLAP_MIN_M2 = 0.01;

export type Analysis = {
  overlaps: { aId: string; bId: string; geometry: MultiPolygon; areaM2: number }[];
  gapAreaM2: number;
  zonesAreaM2: number;
  boundaryAreaM2: number;
};

/** Overlaps between zones, and how much of the boundary no zone covers, all on the ellipsoid (PostGIS). */
export async function analyse(zoneMapId: string, fieldId: string): Promise<Analysis> {
  const overlaps = await sequelize().query<{ aId: string; bId: string; geometry: string; areaM2: number }>(
    `SELECT "aId", "bId", ST_AsGeoJSON(ST_ForcePolygonCCW(g), 15) AS geometry, ST_Area(g::geography, true) AS "areaM2"
       FROM (SELECT a.id AS "aId", b.id AS "bId",
                    ST_Multi(ST_CollectionExtract(ST_Intersection(a.geometry, b.geometry), 3)) AS g
               FROM zones a JOIN zones b
                 ON a.zone_map_id = b.zone_map_id
                AND (a.sort_order, a.id) < (b.sort_order, b.id) AND ST_Intersects(a.geometry, b.geometry)
              WHERE a.zone_map_id = :zoneMapId) pairs
      WHERE NOT ST_IsEmpty(g) AND ST_Area(g::geography, true) >= :min
      ORDER BY "areaM2" DESC`,
    { replacements: { zoneMapId, min: OVERLAP_MIN_M2 }, type: QueryTypes.SELECT },
  );
  const [areas] = await sequelize().query<{ gapAreaM2: number; zonesAreaM2: number; boundaryAreaM2: number }>(
    `SELECT COALESCE(ST_Area(ST_Difference(f.boundary, COALESCE(u.g, 'SRID=4326;POLYGON EMPTY'::geometry))::geography, true), 0) AS "gapAreaM2",
            u.total AS "zonesAreaM2", COALESCE(f.area_m2, 0) AS "boundaryAreaM2"
       FROM fields f,
            (SELECT ST_Union(geometry) AS g, COALESCE(sum(area_m2), 0) AS total FROM zones WHERE zone_map_id = :zoneMapId) u
      WHERE f.id = :fieldId`,
    { replacements: { zoneMapId, fieldId }, type: QueryTypes.SELECT },
  );
  return {
    overlaps: overlaps.map((o) => ({ ...o, geometry: JSON.parse(o.geometry) as MultiPolygon })),
    gapAreaM2: areas?.gapAreaM2 ?? 0,
    zonesAreaM2: areas?.zonesAreaM2 ?? 0,
    boundaryAreaM2: areas?.boundaryAreaM2 ?? 0,
  };
}
