import { QueryTypes } from 'sequelize';
import type { MultiPolygon } from 'geojson';
import type { MigrationContext } from '../umzug';
import { zonesFromPoints } from '../../../shared/geo/zones-from-points';
import { DEMO_WORKSPACE } from './20261202-0001-demo';
// A small seeded generator (mulberry32), so the demo is the same on every machine.
import { seededRandom } from '../../../shared/audit/synthetic-log';

/**
 * Invented last-season yield points over a field: a slope across the field, a rolling swell and noise,
 * in bushels per acre. Nothing here is measured; it only gives the demo zones a plausible shape.
 */
function inventedYieldPoints(boundary: MultiPolygon, seed: number) {
  const random = seededRandom(seed);
  const ring = boundary.coordinates[0][0];
  const lons = ring.map((p) => p[0]);
  const lats = ring.map((p) => p[1]);
  const [w, e, s, n] = [Math.min(...lons), Math.max(...lons), Math.min(...lats), Math.max(...lats)];
  const points: { lon: number; lat: number; value: number }[] = [];
  for (let i = 0; i < 1600; i++) {
    const u = random();
    const v = random();
    const slope = 40 * u - 15 * v;
    const swell = 22 * Math.sin(u * 5.1 + seed) * Math.cos(v * 3.7);
    points.push({
      lon: w + u * (e - w),
      lat: s + v * (n - s),
      value: 185 + slope + swell + 8 * (random() - 0.5),
    });
  }
  return points;
}

const NAMES = ['Lower ground', 'Middle ground', 'Better ground'];

/** One zone map per demo field for its crop season, built from invented yield points (three zones). */
export async function up({ context: sequelize }: MigrationContext) {
  const fields = await sequelize.query<{
    field_id: string;
    workspace_id: string;
    grower_id: string;
    season_id: string;
    boundary: string;
  }>(
    `SELECT f.id AS field_id, f.workspace_id, f.grower_id, s.id AS season_id, ST_AsGeoJSON(f.boundary) AS boundary
       FROM fields f
       JOIN workspaces w ON w.id = f.workspace_id AND w.name = :ws
       JOIN crop_seasons s ON s.field_id = f.id
      WHERE f.boundary IS NOT NULL
        AND NOT EXISTS (SELECT 1 FROM zone_maps z WHERE z.field_id = f.id)
      ORDER BY f.name`,
    { replacements: { ws: DEMO_WORKSPACE }, type: QueryTypes.SELECT },
  );
  await sequelize.transaction(async (transaction) => {
    for (const [i, f] of fields.entries()) {
      const boundary = JSON.parse(f.boundary) as MultiPolygon;
      const result = zonesFromPoints(inventedYieldPoints(boundary, i + 1), boundary, {
        classes: 3,
        method: 'quantile',
        cellSizeM: 12,
        minAreaM2: 6000,
      });
      const [map] = await sequelize.query<{ id: string }>(
        `INSERT INTO zone_maps (workspace_id, grower_id, field_id, crop_season_id, name, version_no, source, source_note)
         VALUES (:ws, :grower, :field, :season, 'Yield history zones', 1, 'from-data',
                 'Invented demo yield (bu/ac): equal counts (quantiles), 3 classes, 12 m cells')
         RETURNING id`,
        {
          replacements: { ws: f.workspace_id, grower: f.grower_id, field: f.field_id, season: f.season_id },
          type: QueryTypes.SELECT,
          transaction,
        },
      );
      const meanOfField =
        result.zones.reduce((sum, z) => sum + z.meanValue * z.areaM2, 0) /
        result.zones.reduce((sum, z) => sum + z.areaM2, 0);
      for (const [order, z] of result.zones.entries()) {
        await sequelize.query(
          `INSERT INTO zones (zone_map_id, workspace_id, name, class_value, productivity_index, is_default, mean_value,
                              geometry, sort_order)
           VALUES (:map, :ws, :name, :cls, :index, false, :mean,
                   ST_Multi(ST_CollectionExtract(ST_MakeValid(ST_SetSRID(ST_GeomFromGeoJSON(:geom), 4326)), 3)), :order)`,
          {
            replacements: {
              map: map.id,
              ws: f.workspace_id,
              name: NAMES[z.classIndex] ?? `Class ${z.classIndex + 1}`,
              cls: z.classIndex + 1,
              index: Math.round((z.meanValue / meanOfField) * 100) / 100,
              mean: Math.round(z.meanValue * 10) / 10,
              geom: JSON.stringify(z.geometry),
              order,
            },
            transaction,
          },
        );
      }
    }
  });
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query(
    `DELETE FROM zone_maps WHERE workspace_id IN (SELECT id FROM workspaces WHERE name = :ws) AND name = 'Yield history zones'`,
    { replacements: { ws: DEMO_WORKSPACE } },
  );
}
