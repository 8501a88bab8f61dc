import type { MigrationContext } from '../umzug';

/**
 * Products and prescriptions. Every rate is SI (seeds/m², kg/m², m³/m²); a product's unit size is SI too
 * (seeds, kg or m³ per purchase unit). A prescription copies its zones from the zone map when it is made
 * (prescription_zones), so later edits of the zone map never change a prescription, and an approved version
 * keeps the product and planter as they were (snapshots). Versions of one prescription share `lineage_id`;
 * at most one draft and one approved version per lineage.
 */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    CREATE TABLE products (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      kind text NOT NULL CHECK (kind IN ('seed', 'other')),
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 80),
      crop text,
      rate_kind text NOT NULL CHECK (rate_kind IN ('count', 'mass', 'volume')),
      unit_name text NOT NULL CHECK (length(unit_name) BETWEEN 1 AND 20),
      unit_size double precision NOT NULL CHECK (unit_size > 0),
      price_per_unit numeric(12, 2) CHECK (price_per_unit >= 0),
      currency text NOT NULL DEFAULT 'USD' CHECK (currency ~ '^[A-Z]{3}$'),
      notes text,
      archived_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CHECK ((kind = 'seed') = (crop IS NOT NULL)),
      CHECK ((kind = 'seed') = (rate_kind = 'count'))
    );
    CREATE INDEX products_workspace ON products (workspace_id, name);

    CREATE TABLE prescriptions (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      grower_id uuid NOT NULL REFERENCES growers(id),
      field_id uuid NOT NULL REFERENCES fields(id),
      crop_season_id uuid NOT NULL REFERENCES crop_seasons(id),
      zone_map_id uuid NOT NULL REFERENCES zone_maps(id),
      product_id uuid NOT NULL REFERENCES products(id),
      planter_id uuid REFERENCES planters(id),
      lineage_id uuid NOT NULL,
      version_no integer NOT NULL CHECK (version_no >= 1),
      status text NOT NULL DEFAULT 'draft' CHECK (status IN ('draft', 'approved', 'superseded')),
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
      rate_unit text NOT NULL,
      default_rate_si double precision NOT NULL CHECK (default_rate_si >= 0),
      out_of_field_rate_si double precision NOT NULL CHECK (out_of_field_rate_si >= 0),
      min_rate_si double precision NOT NULL CHECK (min_rate_si >= 0),
      max_rate_si double precision NOT NULL CHECK (max_rate_si >= min_rate_si),
      -- The field's boundary when the prescription was made, and the part of it no zone covers.
      -- Filled in the transaction that creates the row (copied from the field).
      boundary geometry(MultiPolygon, 4326) CHECK (ST_IsValid(boundary)),
      boundary_area_m2 double precision GENERATED ALWAYS AS (ST_Area(boundary::geography, true)) STORED,
      uncovered_area_m2 double precision NOT NULL DEFAULT 0,
      product_snapshot jsonb,
      planter_snapshot jsonb,
      acceptance jsonb,
      approved_by uuid REFERENCES users(id) ON DELETE SET NULL,
      approved_by_name text,
      approved_at timestamptz,
      superseded_at timestamptz,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CHECK ((status = 'draft') = (approved_at IS NULL)),
      CHECK ((status = 'superseded') = (superseded_at IS NOT NULL))
    );
    CREATE UNIQUE INDEX prescriptions_lineage_version ON prescriptions (lineage_id, version_no);
    CREATE UNIQUE INDEX prescriptions_one_draft ON prescriptions (lineage_id) WHERE status = 'draft';
    CREATE UNIQUE INDEX prescriptions_one_approved ON prescriptions (lineage_id) WHERE status = 'approved';
    CREATE INDEX prescriptions_workspace ON prescriptions (workspace_id, updated_at DESC);
    CREATE INDEX prescriptions_field_season ON prescriptions (field_id, crop_season_id);

    CREATE TABLE prescription_zones (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      prescription_id uuid NOT NULL REFERENCES prescriptions(id) ON DELETE CASCADE,
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      source_zone_id uuid REFERENCES zones(id) ON DELETE SET NULL,
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 60),
      class_value integer,
      productivity_index double precision,
      is_default boolean NOT NULL DEFAULT false,
      rate_si double precision NOT NULL CHECK (rate_si >= 0),
      geometry geometry(MultiPolygon, 4326) NOT NULL CHECK (ST_IsValid(geometry) AND NOT ST_IsEmpty(geometry)),
      area_m2 double precision GENERATED ALWAYS AS (ST_Area(geometry::geography, true)) STORED,
      sort_order integer NOT NULL DEFAULT 0
    );
    CREATE INDEX prescription_zones_prescription ON prescription_zones (prescription_id, sort_order);
    CREATE INDEX prescription_zones_geometry ON prescription_zones USING gist (geometry);
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query(`DROP TABLE IF EXISTS prescription_zones, prescriptions, products CASCADE;`);
}
