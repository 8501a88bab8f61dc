import type { MigrationContext } from '../umzug';

/**
 * Zone maps and their zones. A zone map belongs to a field and a crop season; `version_no` counts the maps of
 * one (field, season) from 1 (a new version copies the zones), `version` is the optimistic lock. Zone
 * geometry is a valid MultiPolygon in WGS84 (GEOS decides), and its area is generated on the ellipsoid.
 */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    CREATE TABLE zone_maps (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      grower_id uuid NOT NULL REFERENCES growers(id),
      field_id uuid NOT NULL REFERENCES fields(id),
      crop_season_id uuid NOT NULL REFERENCES crop_seasons(id),
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
      version_no integer NOT NULL CHECK (version_no >= 1),
      source text NOT NULL CHECK (source IN ('drawn', 'imported', 'from-data')),
      source_note text,
      version integer NOT NULL DEFAULT 0,
      archived_at timestamptz,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX zone_maps_version_no_unique ON zone_maps (field_id, crop_season_id, version_no);
    CREATE INDEX zone_maps_workspace ON zone_maps (workspace_id);
    CREATE INDEX zone_maps_season ON zone_maps (crop_season_id);

    CREATE TABLE zones (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      zone_map_id uuid NOT NULL REFERENCES zone_maps(id) ON DELETE CASCADE,
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 60),
      class_value integer CHECK (class_value BETWEEN 0 AND 254),
      productivity_index double precision CHECK (productivity_index BETWEEN 0 AND 10),
      is_default boolean NOT NULL DEFAULT false,
      mean_value double precision,
      geometry geometry(MultiPolygon, 4326) NOT NULL CHECK (ST_IsValid(geometry) AND NOT ST_IsEmpty(geometry)),
      -- Geodesic area on the WGS84 ellipsoid (PostGIS uses GeographicLib's algorithm).
      area_m2 double precision GENERATED ALWAYS AS (ST_Area(geometry::geography, true)) STORED,
      sort_order integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX zones_zone_map ON zones (zone_map_id, sort_order);
    CREATE INDEX zones_workspace ON zones (workspace_id);
    CREATE INDEX zones_geometry ON zones USING gist (geometry);
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query(`DROP TABLE IF EXISTS zones, zone_maps CASCADE;`);
}
