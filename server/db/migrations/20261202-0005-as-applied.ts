import type { MigrationContext } from '../umzug';

/**
 * As-applied logs and audits. A log file is kept as sent, on disk beside the database (`.data/log-files`,
 * content-addressed by SHA-256: a season's log runs to hundreds of megabytes, too much for a bytea row); the
 * same bytes for the same field are one file, and one file makes one log. Points are stored with COPY in one
 * transaction per import, so a failed import leaves none. An audit is frozen once signed off.
 */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    CREATE TABLE log_files (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      field_id uuid NOT NULL REFERENCES fields(id),
      original_name text NOT NULL CHECK (length(original_name) BETWEEN 1 AND 255),
      format text NOT NULL CHECK (format IN ('csv', 'geojson', 'shapefile')),
      size_bytes bigint NOT NULL CHECK (size_bytes >= 0),
      sha256 text NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX log_files_content_unique ON log_files (workspace_id, field_id, sha256);

    CREATE TABLE planter_log_mappings (
      planter_id uuid PRIMARY KEY REFERENCES planters(id) ON DELETE CASCADE,
      mapping jsonb NOT NULL,
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE as_applied_logs (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      grower_id uuid NOT NULL REFERENCES growers(id),
      field_id uuid NOT NULL REFERENCES fields(id),
      crop_season_id uuid NOT NULL REFERENCES crop_seasons(id),
      planter_id uuid NOT NULL REFERENCES planters(id),
      prescription_id uuid NOT NULL REFERENCES prescriptions(id),
      file_id uuid NOT NULL REFERENCES log_files(id),
      mapping jsonb NOT NULL,
      metered_on text NOT NULL CHECK (metered_on IN ('wheel', 'radar', 'gnss')),
      cleaning jsonb NOT NULL,
      cleaning_report jsonb,
      status text NOT NULL DEFAULT 'queued'
        CHECK (status IN ('queued', 'reading', 'cleaning', 'storing', 'auditing', 'ready', 'failed')),
      progress real NOT NULL DEFAULT 0,
      error jsonb,
      points_read integer,
      points_kept integer,
      started_at timestamptz,
      finished_at timestamptz,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    -- One file makes one log: uploading the same bytes again finds the log already made.
    CREATE UNIQUE INDEX as_applied_logs_file_unique ON as_applied_logs (workspace_id, file_id);
    CREATE INDEX as_applied_logs_field ON as_applied_logs (field_id, crop_season_id);

    CREATE TABLE as_applied_points (
      log_id uuid NOT NULL REFERENCES as_applied_logs(id) ON DELETE CASCADE,
      seq integer NOT NULL,
      t double precision NOT NULL,
      lon double precision NOT NULL,
      lat double precision NOT NULL,
      geom geometry(Point, 4326) GENERATED ALWAYS AS (ST_SetSRID(ST_MakePoint(lon, lat), 4326)) STORED,
      target real,
      applied real,
      applied_true real,
      wheel_mps real,
      gnss_mps real,
      width_m real,
      area_m2 real,
      zone smallint NOT NULL,
      removed_by smallint NOT NULL DEFAULT 0,
      PRIMARY KEY (log_id, seq)
    );
    CREATE INDEX as_applied_points_geom ON as_applied_points USING gist (geom);

    CREATE TABLE audits (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      grower_id uuid NOT NULL REFERENCES growers(id),
      log_id uuid NOT NULL UNIQUE REFERENCES as_applied_logs(id) ON DELETE CASCADE,
      band_fraction double precision NOT NULL DEFAULT 0.15 CHECK (band_fraction > 0 AND band_fraction < 1),
      result jsonb NOT NULL,
      status text NOT NULL DEFAULT 'open' CHECK (status IN ('open', 'signed-off')),
      signed_off_by uuid REFERENCES users(id) ON DELETE SET NULL,
      signed_off_by_name text,
      signed_off_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CHECK ((status = 'signed-off') = (signed_off_at IS NOT NULL))
    );

    CREATE TABLE audit_comments (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      audit_id uuid NOT NULL REFERENCES audits(id) ON DELETE CASCADE,
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      author_id uuid REFERENCES users(id) ON DELETE SET NULL,
      author_name text NOT NULL,
      author_role text NOT NULL,
      body text NOT NULL CHECK (length(body) BETWEEN 1 AND 4000),
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX audit_comments_audit ON audit_comments (audit_id, created_at);
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query(
    'DROP TABLE IF EXISTS audit_comments, audits, as_applied_points, as_applied_logs, planter_log_mappings, log_files CASCADE;',
  );
}
