import { QueryTypes } from 'sequelize';
import type { MultiPolygon } from 'geojson';
import { ZoneMap } from '../../db/models/zone-map.model';
import { safeFileName, writePolygonShapefile, zipShapefile, type DbfField } from '../../lib/shapefile-write';
import type { Actor } from '../../types';
import { findZoneMap } from './zone-map.service';

/** m² per international acre, exact (NIST SP 811 B.8; DOMAIN.md §1). */
const M2_PER_ACRE = 4046.8564224;
const M2_PER_HA = 10_000;

/** The attribute fields of an exported zone, in order; shapefile names are the same (all ≤ 10 ASCII). */
const FIELDS: DbfField[] = [
  { key: 'name', type: 'C' },
  { key: 'class', type: 'N', width: 4, decimals: 0 },
  { key: 'index', type: 'N', width: 12, decimals: 4 },
  { key: 'area_ha', type: 'N', width: 18, decimals: 6 },
  { key: 'area_ac', type: 'N', width: 18, decimals: 6 },
];

const round6 = (v: number) => Math.round(v * 1e6) / 1e6;

type ExportZone = {
  name: string;
  classValue: number | null;
  productivityIndex: number | null;
  areaM2: number;
  geometry: string;
};

/**
 * Zones with geometry as PostGIS writes it: RFC 7946 winding and 7 decimals (about 1 cm) for GeoJSON, full
 * precision for the shapefile (whose writer winds rings the shapefile way).
 */
async function exportZones(zoneMapId: string, rfc7946: boolean) {
  const geometry = rfc7946 ? 'ST_AsGeoJSON(ST_ForcePolygonCCW(geometry), 7)' : 'ST_AsGeoJSON(geometry, 15)';
  return ZoneMap.sequelize!.query<ExportZone>(
    `SELECT name, class_value AS "classValue", productivity_index AS "productivityIndex", area_m2 AS "areaM2",
            ${geometry} AS geometry
       FROM zones WHERE zone_map_id = :zoneMapId ORDER BY sort_order, created_at, id`,
    { replacements: { zoneMapId }, type: QueryTypes.SELECT },
  );
}

const propertiesOf = (z: ExportZone) => ({
  name: z.name,
  class: z.classValue,
  index: z.productivityIndex,
  area_ha: round6(z.areaM2 / M2_PER_HA),
  area_ac: round6(z.areaM2 / M2_PER_ACRE),
});

export type ExportFile = { body: Buffer; contentType: string; fileName: string };

/** The zone map as an RFC 7946 GeoJSON file or a zipped polygon shapefile in WGS84. */
export async function exportZoneMap(
  actor: Actor,
  id: string,
  format: 'geojson' | 'shapefile',
): Promise<ExportFile> {
  const map = await findZoneMap(actor, id);
  const base = safeFileName([
    map.grower?.name ?? 'grower',
    map.field?.name ?? 'field',
    map.name,
    `v${map.versionNo}`,
  ]);
  const zones = await exportZones(map.id, format === 'geojson');
  if (format === 'geojson') {
    const collection = {
      type: 'FeatureCollection',
      features: zones.map((z) => ({
        type: 'Feature',
        properties: propertiesOf(z),
        geometry: JSON.parse(z.geometry) as MultiPolygon,
      })),
    };
    return {
      body: Buffer.from(JSON.stringify(collection), 'utf8'),
      contentType: 'application/geo+json',
      fileName: `${base}.geojson`,
    };
  }
  const parts = writePolygonShapefile(
    zones.map((z) => ({ geometry: JSON.parse(z.geometry) as MultiPolygon, properties: propertiesOf(z) })),
    FIELDS,
  );
  return { body: await zipShapefile(base, parts), contentType: 'application/zip', fileName: `${base}.zip` };
}
