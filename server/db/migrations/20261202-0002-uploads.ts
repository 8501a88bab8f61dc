import type { MigrationContext } from '../umzug';

/**
 * Every uploaded file kept as sent (RELIABILITY.md "Original files are kept"), and each reading of one.
 * The same bytes uploaded twice for the same field and purpose are one upload (unique content hash), so a
 * retry never doubles data. An import is one reading of an upload: the coordinate system the user chose.
 */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    CREATE TABLE uploads (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      field_id uuid NOT NULL REFERENCES fields(id),
      purpose text NOT NULL CHECK (purpose IN ('boundary', 'zones', 'points')),
      original_name text NOT NULL CHECK (length(original_name) BETWEEN 1 AND 255),
      size_bytes integer NOT NULL CHECK (size_bytes >= 0),
      sha256 text NOT NULL CHECK (sha256 ~ '^[0-9a-f]{64}$'),
      content bytea NOT NULL,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      CHECK (octet_length(content) = size_bytes)
    );
    CREATE UNIQUE INDEX uploads_content_unique ON uploads (workspace_id, field_id, purpose, sha256);

    CREATE TABLE imports (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      upload_id uuid NOT NULL REFERENCES uploads(id) ON DELETE CASCADE,
      field_id uuid NOT NULL REFERENCES fields(id),
      purpose text NOT NULL CHECK (purpose IN ('boundary', 'zones', 'points')),
      format text NOT NULL CHECK (format IN ('geojson', 'shapefile', 'kml', 'kmz', 'csv')),
      -- The EPSG code the user chose for projected coordinates without a known system; null until then.
      crs_code text CHECK (crs_code IS NULL OR crs_code ~ '^EPSG:[0-9]{4,6}$'),
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX imports_workspace ON imports (workspace_id);
    CREATE INDEX imports_upload ON imports (upload_id);
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query('DROP TABLE IF EXISTS imports, uploads CASCADE;');
}
