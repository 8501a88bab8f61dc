import type { MigrationContext } from '../umzug';

/**
 * The planter logbook: lifetime counters as a ledger. Each import of a log adds what it planted (a re-run
 * adds only the difference), a deleted log is subtracted with a note. Entries are never changed: the table
 * refuses UPDATE, so nobody edits a counter by hand; there is no route that writes one.
 */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    CREATE TABLE planter_logbook (
      id bigserial PRIMARY KEY,
      workspace_id uuid NOT NULL REFERENCES workspaces(id) ON DELETE CASCADE,
      planter_id uuid NOT NULL REFERENCES planters(id) ON DELETE CASCADE,
      crop_season_id uuid NOT NULL REFERENCES crop_seasons(id) ON DELETE CASCADE,
      -- No foreign key: the entry outlives its log (a deleted log is subtracted, not forgotten).
      log_id uuid NOT NULL,
      kind text NOT NULL CHECK (kind IN ('log', 'rerun', 'deleted')),
      area_m2 double precision NOT NULL,
      quantity double precision NOT NULL,
      distance_m double precision NOT NULL,
      hours double precision NOT NULL,
      note text NOT NULL,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX planter_logbook_planter ON planter_logbook (planter_id, created_at);
    CREATE FUNCTION planter_logbook_no_update() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN RAISE EXCEPTION 'planter logbook entries cannot be changed'; END $$;
    CREATE TRIGGER planter_logbook_no_update BEFORE UPDATE ON planter_logbook
      FOR EACH ROW EXECUTE FUNCTION planter_logbook_no_update();
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    DROP TABLE IF EXISTS planter_logbook;
    DROP FUNCTION IF EXISTS planter_logbook_no_update();
  `);
}
