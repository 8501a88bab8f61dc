import type pg from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { pipeline } from 'node:stream/promises';
import { Readable } from 'node:stream';
import { binaryCopyChunks, type BinaryColumn } from './copy-binary';

/** What a log keeps in PostGIS, each in a partition of its own (migration 0009). */
export type LogTable = 'points' | 'cells';

/** The partition's name, as SQL's sowright_log_partition(kind, log) spells it. */
export const partitionName = (kind: LogTable, logId: string) => {
  if (!/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(logId))
    throw new Error(`not a log id: ${logId}`);
  return `as_applied_${kind}_${logId.replace(/-/g, '').toLowerCase()}`;
};

const ident = (name: string) => {
  if (!/^[a-z0-9_]+$/.test(name)) throw new Error(`unexpected table name ${name}`);
  return `"${name}"`;
};

export const PARTITION_INDEX: Record<LogTable, string> = {
  // Points are stored in time order, so neighbours on disk are neighbours in the field: a block-range index
  // (a bounding box per 4 pages, about 260 points) finds a tile's points, builds in a fraction of a second and
  // stays small, where a GiST index on a million points takes seconds to build.
  points: 'USING brin (geom) WITH (pages_per_range = 4)',
  cells: '(z, tx, ty)',
};

/**
 * Writes one log's rows into a fresh table shaped like the partitioned `as_applied_<kind>`, inside the
 * caller's transaction: created here, filled by one binary COPY (FREEZE: the table is new in this
 * transaction, so no later vacuum pass; with wal_level minimal it writes no WAL either), then indexed. The
 * CHECK on log_id lets `attachLogTables` attach it without scanning it. Answers the new table's name.
 */
export async function copyLogTable(
  client: pg.Client,
  kind: LogTable,
  logId: string,
  rows: number,
  columns: { name: string; column: BinaryColumn }[],
  opts: { index?: boolean; trace?: (step: string) => void } = {},
): Promise<string> {
  const table = `${partitionName(kind, logId)}_new`;
  await client.query(`DROP TABLE IF EXISTS ${ident(table)}`);
  await client.query(
    `CREATE TABLE ${ident(table)} (LIKE as_applied_${kind} INCLUDING DEFAULTS, CHECK (log_id = '${logId}'::uuid))`,
  );
  const copy = client.query(
    copyFrom(
      `COPY ${ident(table)} (${columns.map((c) => c.name).join(', ')}) FROM STDIN (FORMAT binary, FREEZE)`,
    ),
  );
  await pipeline(
    Readable.from(
      binaryCopyChunks(
        rows,
        columns.map((c) => c.column),
      ),
    ),
    copy,
  );
  opts.trace?.(`${kind} COPY done`);
  if (opts.index !== false) await client.query(`CREATE INDEX ON ${ident(table)} ${PARTITION_INDEX[kind]}`);
  return table;
}

/**
 * The last step before COMMIT: the log's earlier partitions (a re-run) are detached and dropped, the new
 * tables take their names and are attached. Detaching locks the parent against readers until the COMMIT,
 * so it comes last, when the COPY and the indexes are done.
 */
export async function attachLogTables(client: pg.Client, logId: string, kinds: LogTable[]) {
  for (const kind of kinds) {
    const name = partitionName(kind, logId);
    const { rows } = await client.query<{ attached: boolean }>(
      `SELECT EXISTS (SELECT 1 FROM pg_inherits i JOIN pg_class c ON c.oid = i.inhrelid
                       WHERE c.relname = $1 AND c.relnamespace = 'public'::regnamespace) AS attached`,
      [name],
    );
    if (rows[0].attached)
      await client.query(`ALTER TABLE as_applied_${kind} DETACH PARTITION ${ident(name)}`);
    await client.query(`DROP TABLE IF EXISTS ${ident(name)}`);
    await client.query(`ALTER TABLE ${ident(`${name}_new`)} RENAME TO ${ident(name)}`);
    await client.query(
      `ALTER TABLE as_applied_${kind} ATTACH PARTITION ${ident(name)} FOR VALUES IN ('${logId}'::uuid)`,
    );
  }
}
