import type { MigrationContext } from '../umzug';

/**
 * Pre-averaged cells of each log's kept points for the map's middle zooms (shared/audit/tile-cells.ts):
 * a tile at those zooms is an indexed read of at most 128 × 128 rows, in tile coordinates already.
 */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    CREATE TABLE as_applied_cells (
      log_id uuid NOT NULL REFERENCES as_applied_logs(id) ON DELETE CASCADE,
      z smallint NOT NULL,
      tx integer NOT NULL,
      ty integer NOT NULL,
      gx smallint NOT NULL,
      gy smallint NOT NULL,
      n integer NOT NULL,
      target real,
      applied real,
      applied_true real,
      speed real
    );
    CREATE INDEX as_applied_cells_tile ON as_applied_cells (log_id, z, tx, ty);
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query('DROP TABLE IF EXISTS as_applied_cells;');
}
