import type { MigrationContext } from '../umzug';

/**
 * The tolerance band a log is audited with belongs to the log's settings (beside its cleaning), so the
 * audit's band changes together with its figures when the import runs again, never before.
 */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    ALTER TABLE as_applied_logs
      ADD COLUMN band_fraction double precision NOT NULL DEFAULT 0.15 CHECK (band_fraction > 0 AND band_fraction < 1);
    UPDATE as_applied_logs l SET band_fraction = a.band_fraction FROM audits a WHERE a.log_id = l.id;
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query('ALTER TABLE as_applied_logs DROP COLUMN IF EXISTS band_fraction;');
}
