import type { MigrationContext } from '../umzug';

const POINT_COLUMNS = `log_id uuid NOT NULL,
      seq integer NOT NULL,
      t double precision NOT NULL,
      geom geometry(Point, 4326) NOT NULL,
      target real,
      applied real,
      applied_true real,
      wheel_mps real,
      gnss_mps real,
      width_m real,
      area_m2 real,
      zone smallint NOT NULL,
      removed_by smallint NOT NULL DEFAULT 0`;

const CELL_COLUMNS = `log_id uuid NOT NULL,
      z smallint NOT NULL,
      tx integer NOT NULL,
      ty integer NOT NULL,
      gx smallint NOT NULL,
      gy smallint NOT NULL,
      n integer NOT NULL,
      target real,
      applied real,
      applied_true real,
      speed real`;

/**
 * A log's points and tile cells each live in a partition of their own (LIST on log_id), written by one
 * binary COPY into a table made in the same transaction, indexed after the COPY and attached at the end
 * (server/logs/store-points.ts; DEVELOPERS.md "Storing a log"). A row no longer carries a foreign key
 * check or an index update: a deleted log's partitions are dropped by the trigger below instead.
 * Points already stored are moved into partitions of the same shape.
 */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    ALTER TABLE as_applied_points RENAME TO as_applied_points_0008;
    ALTER TABLE as_applied_cells RENAME TO as_applied_cells_0008;

    CREATE TABLE as_applied_points (${POINT_COLUMNS}) PARTITION BY LIST (log_id);
    CREATE TABLE as_applied_cells (${CELL_COLUMNS}) PARTITION BY LIST (log_id);

    CREATE FUNCTION sowright_log_partition(kind text, log uuid) RETURNS text
      LANGUAGE sql IMMUTABLE STRICT
      AS $$ SELECT 'as_applied_' || kind || '_' || replace(log::text, '-', '') $$;

    CREATE FUNCTION sowright_drop_log_partitions() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      EXECUTE format('DROP TABLE IF EXISTS %I, %I',
        sowright_log_partition('points', OLD.id), sowright_log_partition('cells', OLD.id));
      RETURN OLD;
    END $$;
    CREATE TRIGGER as_applied_logs_drop_partitions AFTER DELETE ON as_applied_logs
      FOR EACH ROW EXECUTE FUNCTION sowright_drop_log_partitions();

    DO $$
    DECLARE log uuid;
    BEGIN
      FOR log IN SELECT DISTINCT log_id FROM as_applied_points_0008 LOOP
        EXECUTE format('CREATE TABLE %I PARTITION OF as_applied_points FOR VALUES IN (%L)',
          sowright_log_partition('points', log), log);
        EXECUTE format('INSERT INTO %I SELECT log_id, seq, t, geom, target, applied, applied_true, wheel_mps,
            gnss_mps, width_m, area_m2, zone, removed_by FROM as_applied_points_0008 WHERE log_id = %L ORDER BY seq',
          sowright_log_partition('points', log), log);
        EXECUTE format('CREATE INDEX ON %I USING brin (geom) WITH (pages_per_range = 4)',
          sowright_log_partition('points', log));
      END LOOP;
      FOR log IN SELECT DISTINCT log_id FROM as_applied_cells_0008 LOOP
        EXECUTE format('CREATE TABLE %I PARTITION OF as_applied_cells FOR VALUES IN (%L)',
          sowright_log_partition('cells', log), log);
        EXECUTE format('INSERT INTO %I SELECT * FROM as_applied_cells_0008 WHERE log_id = %L',
          sowright_log_partition('cells', log), log);
        EXECUTE format('CREATE INDEX ON %I (z, tx, ty)', sowright_log_partition('cells', log));
      END LOOP;
    END $$;

    DROP TABLE as_applied_points_0008, as_applied_cells_0008;
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    DROP TRIGGER IF EXISTS as_applied_logs_drop_partitions ON as_applied_logs;
    DROP FUNCTION IF EXISTS sowright_drop_log_partitions();
    DROP TABLE IF EXISTS as_applied_points, as_applied_cells CASCADE;
    DROP FUNCTION IF EXISTS sowright_log_partition(text, uuid);
    CREATE TABLE as_applied_points (
      log_id uuid NOT NULL REFERENCES as_applied_logs(id) ON DELETE CASCADE,
      seq integer NOT NULL,
      t double precision NOT NULL,
      lon double precision NOT NULL,
      lat double precision NOT NULL,
      geom geometry(Point, 4326) GENERATED ALWAYS AS (ST_SetSRID(ST_MakePoint(lon, lat), 4326)) STORED,
      target real, applied real, applied_true real, wheel_mps real, gnss_mps real, width_m real, area_m2 real,
      zone smallint NOT NULL,
      removed_by smallint NOT NULL DEFAULT 0,
      PRIMARY KEY (log_id, seq)
    );
    CREATE INDEX as_applied_points_geom ON as_applied_points USING gist (geom);
    CREATE TABLE as_applied_cells (
      log_id uuid NOT NULL REFERENCES as_applied_logs(id) ON DELETE CASCADE,
      z smallint NOT NULL, tx integer NOT NULL, ty integer NOT NULL, gx smallint NOT NULL, gy smallint NOT NULL,
      n integer NOT NULL, target real, applied real, applied_true real, speed real
    );
    CREATE INDEX as_applied_cells_tile ON as_applied_cells (log_id, z, tx, ty);
  `);
}
