import type { MigrationContext } from '../umzug';

/** Workspaces, people, sessions' tokens and the grower register. */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    CREATE EXTENSION IF NOT EXISTS postgis;

    CREATE TABLE workspaces (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE growers (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      name text NOT NULL,
      contact_name text,
      email text,
      phone text,
      notes text,
      archived_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX growers_name_unique ON growers (workspace_id, lower(name));

    CREATE TABLE users (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      email text NOT NULL,
      name text NOT NULL,
      role text NOT NULL CHECK (role IN ('admin', 'agronomist', 'farmer', 'consultant')),
      status text NOT NULL DEFAULT 'invited' CHECK (status IN ('invited', 'active', 'disabled')),
      password_hash text,
      token_version integer NOT NULL DEFAULT 0,
      unit_system text NOT NULL DEFAULT 'imperial' CHECK (unit_system IN ('imperial', 'metric')),
      grower_id uuid REFERENCES growers(id),
      last_sign_in_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CHECK (role <> 'farmer' OR grower_id IS NOT NULL)
    );
    CREATE UNIQUE INDEX users_email_unique ON users (lower(email));
    CREATE INDEX users_workspace ON users (workspace_id);

    CREATE TABLE user_tokens (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      purpose text NOT NULL CHECK (purpose IN ('invite', 'reset')),
      token_hash text NOT NULL UNIQUE,
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE consultant_growers (
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      grower_id uuid NOT NULL REFERENCES growers(id) ON DELETE CASCADE,
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      created_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (user_id, grower_id)
    );

    CREATE TABLE farms (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      grower_id uuid NOT NULL REFERENCES growers(id),
      name text NOT NULL,
      notes text,
      archived_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX farms_name_unique ON farms (grower_id, lower(name));
    CREATE INDEX farms_workspace ON farms (workspace_id);

    CREATE TABLE fields (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      grower_id uuid NOT NULL REFERENCES growers(id),
      farm_id uuid NOT NULL REFERENCES farms(id),
      name text NOT NULL,
      notes text,
      boundary geometry(MultiPolygon, 4326) CHECK (boundary IS NULL OR ST_IsValid(boundary)),
      -- Geodesic area on the WGS84 ellipsoid (PostGIS uses GeographicLib's algorithm).
      area_m2 double precision GENERATED ALWAYS AS (ST_Area(boundary::geography, true)) STORED,
      archived_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX fields_name_unique ON fields (farm_id, lower(name));
    CREATE INDEX fields_workspace ON fields (workspace_id);
    CREATE INDEX fields_boundary ON fields USING gist (boundary);

    CREATE TABLE crop_seasons (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      grower_id uuid NOT NULL REFERENCES growers(id),
      field_id uuid NOT NULL REFERENCES fields(id),
      year integer NOT NULL CHECK (year BETWEEN 1990 AND 2100),
      crop text NOT NULL,
      planned_planting_date date,
      notes text,
      archived_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX crop_seasons_unique ON crop_seasons (field_id, year, crop) WHERE archived_at IS NULL;
    CREATE INDEX crop_seasons_workspace ON crop_seasons (workspace_id);

    CREATE TABLE planters (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      grower_id uuid NOT NULL REFERENCES growers(id),
      name text NOT NULL,
      row_count integer NOT NULL CHECK (row_count BETWEEN 1 AND 96),
      row_spacing_m double precision NOT NULL CHECK (row_spacing_m > 0),
      arrangement text NOT NULL CHECK (arrangement IN ('single', 'split-row')),
      interplant_row_count integer,
      rows_per_section integer NOT NULL CHECK (rows_per_section >= 1),
      display_section_limit integer NOT NULL CHECK (display_section_limit >= 1),
      holes_per_disc jsonb NOT NULL DEFAULT '[]',
      disc_rpm_min double precision NOT NULL,
      disc_rpm_max double precision NOT NULL,
      speed_min_mps double precision NOT NULL,
      speed_planned_mps double precision NOT NULL,
      speed_max_mps double precision NOT NULL,
      ground_speed_source text NOT NULL CHECK (ground_speed_source IN ('radar', 'wheel', 'gnss')),
      notes text,
      archived_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX planters_name_unique ON planters (grower_id, lower(name));
    CREATE INDEX planters_workspace ON planters (workspace_id);
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    DROP TABLE IF EXISTS planters, crop_seasons, fields, farms, consultant_growers, user_tokens, users, growers,
      workspaces CASCADE;
  `);
}
