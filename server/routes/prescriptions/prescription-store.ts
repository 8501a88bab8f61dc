import { QueryTypes, type Transaction } from 'sequelize';
import type { MultiPolygon } from 'geojson';
import { Prescription } from '../../db/associations';

/** The database behind prescription zones: plain SQL, since geometry and generated areas live there. */

const db = () => Prescription.sequelize!;

export type PrescriptionZoneRow = {
  id: string;
  sourceZoneId: string | null;
  name: string;
  classValue: number | null;
  productivityIndex: number | null;
  isDefault: boolean;
  areaM2: number;
  rateSi: number;
  geometry: MultiPolygon;
};

/**
 * Zones of a prescription in their order. `rfc7946`: counter-clockwise outer rings and 7 decimals (about
 * 1 cm) as the client and GeoJSON want; otherwise full precision (the export writers wind rings themselves).
 */
export async function prescriptionZones(
  prescriptionId: string,
  { rfc7946 = true, transaction }: { rfc7946?: boolean; transaction?: Transaction } = {},
): Promise<PrescriptionZoneRow[]> {
  const geometry = rfc7946 ? 'ST_AsGeoJSON(ST_ForcePolygonCCW(geometry), 7)' : 'ST_AsGeoJSON(geometry, 15)';
  const rows = await db().query<Omit<PrescriptionZoneRow, 'geometry'> & { geometry: string }>(
    `SELECT id, source_zone_id AS "sourceZoneId", name, class_value AS "classValue",
            productivity_index AS "productivityIndex", is_default AS "isDefault", area_m2 AS "areaM2",
            rate_si AS "rateSi", ${geometry} AS geometry
       FROM prescription_zones WHERE prescription_id = :prescriptionId ORDER BY sort_order, name, id`,
    { replacements: { prescriptionId }, type: QueryTypes.SELECT, transaction },
  );
  return rows.map((r) => ({ ...r, geometry: JSON.parse(r.geometry) as MultiPolygon }));
}

/** The boundary a prescription was made on, and its ellipsoidal area. */
export async function prescriptionBoundary(
  prescriptionId: string,
  { rfc7946 = true, transaction }: { rfc7946?: boolean; transaction?: Transaction } = {},
) {
  const geometry = rfc7946 ? 'ST_AsGeoJSON(ST_ForcePolygonCCW(boundary), 7)' : 'ST_AsGeoJSON(boundary, 15)';
  const [row] = await db().query<{ geometry: string; areaM2: number }>(
    `SELECT ${geometry} AS geometry, boundary_area_m2 AS "areaM2" FROM prescriptions WHERE id = :prescriptionId`,
    { replacements: { prescriptionId }, type: QueryTypes.SELECT, transaction },
  );
  return { geometry: JSON.parse(row.geometry) as MultiPolygon, areaM2: row.areaM2 };
}

/**
 * Copies a zone map's zones into a new prescription, every zone at `rateSi`, and records the field's
 * boundary and the part of it no zone covers.
 */
export async function copyZonesFromMap(
  t: Transaction,
  {
    prescriptionId,
    zoneMapId,
    fieldId,
    workspaceId,
    rateSi,
  }: {
    prescriptionId: string;
    zoneMapId: string;
    fieldId: string;
    workspaceId: string;
    rateSi: number;
  },
) {
  await db().query(
    `INSERT INTO prescription_zones
       (prescription_id, workspace_id, source_zone_id, name, class_value, productivity_index, is_default,
        rate_si, geometry, sort_order)
     SELECT :prescriptionId, :workspaceId, z.id, z.name, z.class_value, z.productivity_index, z.is_default,
            :rateSi, z.geometry, row_number() OVER (ORDER BY z.sort_order, z.created_at, z.id)
       FROM zones z WHERE z.zone_map_id = :zoneMapId`,
    { replacements: { prescriptionId, zoneMapId, workspaceId, rateSi }, transaction: t },
  );
  await db().query(
    `UPDATE prescriptions p SET boundary = f.boundary FROM fields f WHERE p.id = :prescriptionId AND f.id = :fieldId`,
    { replacements: { prescriptionId, fieldId }, transaction: t },
  );
  await updateUncoveredArea(t, prescriptionId);
}

/** Boundary area outside every zone (ellipsoidal), stored once: zones and boundary never change afterwards. */
async function updateUncoveredArea(t: Transaction, prescriptionId: string) {
  await db().query(
    `UPDATE prescriptions p SET uncovered_area_m2 = COALESCE((
        SELECT ST_Area(ST_Difference(p.boundary, ST_Union(z.geometry))::geography, true)
          FROM prescription_zones z WHERE z.prescription_id = p.id), p.boundary_area_m2)
      WHERE p.id = :prescriptionId`,
    { replacements: { prescriptionId }, transaction: t },
  );
}

/** Copies one prescription version's zones (with their rates) and boundary into another. */
export async function copyZonesFromPrescription(t: Transaction, fromId: string, toId: string) {
  await db().query(
    `INSERT INTO prescription_zones
       (prescription_id, workspace_id, source_zone_id, name, class_value, productivity_index, is_default,
        rate_si, geometry, sort_order)
     SELECT :toId, workspace_id, source_zone_id, name, class_value, productivity_index, is_default, rate_si,
            geometry, sort_order
       FROM prescription_zones WHERE prescription_id = :fromId`,
    { replacements: { fromId, toId }, transaction: t },
  );
  await db().query(
    `UPDATE prescriptions p SET boundary = o.boundary, uncovered_area_m2 = o.uncovered_area_m2
       FROM prescriptions o WHERE p.id = :toId AND o.id = :fromId`,
    { replacements: { fromId, toId }, transaction: t },
  );
}

/** Sets zone rates (SI) in one statement. */
export async function setZoneRates(
  t: Transaction,
  prescriptionId: string,
  rates: { zoneId: string; rateSi: number }[],
) {
  if (rates.length === 0) return;
  const replacements: Record<string, string | number> = { prescriptionId };
  const values = rates.map((r, i) => {
    replacements[`z${i}`] = r.zoneId;
    replacements[`r${i}`] = r.rateSi;
    return `(CAST(:z${i} AS uuid), CAST(:r${i} AS double precision))`;
  });
  await db().query(
    `UPDATE prescription_zones pz SET rate_si = v.rate
       FROM (VALUES ${values.join(', ')}) AS v(id, rate)
      WHERE pz.id = v.id AND pz.prescription_id = :prescriptionId`,
    { replacements, transaction: t },
  );
}
