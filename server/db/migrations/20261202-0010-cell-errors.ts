import type { MigrationContext } from '../umzug';

/**
 * Each tile cell keeps its error (applied vs target, %, as logged and corrected), computed at import, so a
 * tile is a plain read of single-precision values (ST_AsMVT writes them as 4-byte floats) with no numeric
 * rounding per cell. Cells already stored get theirs here.
 */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    ALTER TABLE as_applied_cells ADD COLUMN err real, ADD COLUMN true_err real;
    UPDATE as_applied_cells
       SET err = round((100 * (applied - target) / NULLIF(target, 0))::numeric, 2),
           true_err = round((100 * (applied_true - target) / NULLIF(target, 0))::numeric, 2);
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query('ALTER TABLE as_applied_cells DROP COLUMN err, DROP COLUMN true_err;');
}
