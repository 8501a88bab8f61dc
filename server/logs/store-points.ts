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

/** A log with at least this many points is COPYed in two parts at once, on two connections. */
export const storeSettings = { splitRows: 200_000 };

type Columns = { name: string; column: BinaryColumn }[];

/**
 * Fills a fresh table with rows [`from`, `to`) by one binary COPY inside the caller's transaction: the table
 * is made here (so FREEZE applies: no later vacuum pass; with wal_level minimal no WAL either), shaped like
 * `as_applied_<kind>` with `checks` (which let the attach steps skip their scan), then indexed.
 */
async function fillTable(
  client: pg.Client,
  kind: LogTable,
  table: string,
  checks: string[],
  columns: Columns,
  from: number,
  to: number,
  opts: { index?: boolean; trace?: (step: string) => void } = {},
) {
  await client.query(`DROP TABLE IF EXISTS ${ident(table)}`);
  await client.query(
    `CREATE TABLE ${ident(table)} (LIKE as_applied_${kind} INCLUDING DEFAULTS, ${checks.join(', ')})`,
  );
  const copy = client.query(
    copyFrom(
      `COPY ${ident(table)} (${columns.map((c) => c.name).join(', ')}) FROM STDIN (FORMAT binary, FREEZE)`,
    ),
  );
  const chunks = binaryCopyChunks(
    to,
    columns.map((c) => c.column),
    512,
    from,
  );
  await pipeline(Readable.from(chunks), copy);
  opts.trace?.(`${table.slice(-6)}: COPY done`);
  if (opts.index !== false) await client.query(`CREATE INDEX ON ${ident(table)} ${PARTITION_INDEX[kind]}`);
}

/** The CHECK that lets a table be attached as the log's partition without a scan; named, as an attach to
 * the points' parent (partitioned by range of seq) needs its parts to hold the parent's CHECK by name. */
const logCheck = (logId: string) => `CONSTRAINT log_only CHECK (log_id = '${logId}'::uuid)`;

/**
 * A log's tile cells into a new table `<partition>_new`, in the caller's transaction; `attachLogTables`
 * attaches it. Answers the table's name.
 */
export async function copyLogTable(
  client: pg.Client,
  kind: LogTable,
  logId: string,
  rows: number,
  columns: Columns,
  opts: { index?: boolean; trace?: (step: string) => void } = {},
): Promise<string> {
  const table = `${partitionName(kind, logId)}_new`;
  await fillTable(client, kind, table, [logCheck(logId)], columns, 0, rows, opts);
  return table;
}

/** The parts of a log's points: ranges of `seq`, the first from MINVALUE and the last to MAXVALUE. */
export function pointParts(rows: number) {
  const cut = rows >= storeSettings.splitRows ? Math.ceil(rows / 2) : rows;
  const parts = [{ from: 0, to: cut }];
  if (cut < rows) parts.push({ from: cut, to: rows });
  return parts.map((p, k) => ({
    ...p,
    k,
    lower: k === 0 ? 'MINVALUE' : String(p.from),
    upper: k === parts.length - 1 ? 'MAXVALUE' : String(p.to),
    checks: [
      k === 0 ? null : `CHECK (seq >= ${p.from})`,
      k === parts.length - 1 ? null : `CHECK (seq < ${p.to})`,
    ].filter((c): c is string => c !== null),
  }));
}

/** The name of a part of a log's new points table (`…_new_0`, `…_new_1`): under PostgreSQL's 63 bytes. */
export const pointPartName = (logId: string, k: number) => `${partitionName('points', logId)}_new_${k}`;

/**
 * A log's points into `<partition>_new`, a table partitioned by range of `seq`, in the caller's transaction.
 * A large log is written in two parts at once: the second on a connection of its own (`open`), committed
 * there unattached, while the first is written on `client`; each part is a fresh table filled by one binary
 * COPY and indexed, then both are attached to the new table (their CHECKs spare the scan). The database has
 * two cores: one COPY kept one of them busy and left the other to the worker's diagnostics, then idle.
 * Until `attachLogTables` runs and the caller commits, none of it is the log's; on failure the caller rolls
 * back and drops the second part (`dropUnattached`).
 */
export async function storePoints(
  client: pg.Client,
  open: () => Promise<pg.Client>,
  logId: string,
  rows: number,
  columns: Columns,
  trace?: (step: string) => void,
) {
  const parent = `${partitionName('points', logId)}_new`;
  const parts = pointParts(rows);
  const fill = (c: pg.Client, part: (typeof parts)[number]) =>
    fillTable(
      c,
      'points',
      pointPartName(logId, part.k),
      [logCheck(logId), ...part.checks],
      columns,
      part.from,
      part.to,
      { trace },
    );
  const apart = parts.slice(1).map(async (part) => {
    const other = await open();
    try {
      await other.query('BEGIN');
      await fill(other, part);
      await other.query('COMMIT');
    } catch (err) {
      await other.query('ROLLBACK').catch(() => {});
      throw err;
    } finally {
      await other.end().catch(() => {});
    }
  });
  try {
    await client.query(`DROP TABLE IF EXISTS ${ident(parent)}`);
    await client.query(
      `CREATE TABLE ${ident(parent)} (LIKE as_applied_points INCLUDING DEFAULTS, ${logCheck(logId)})
         PARTITION BY RANGE (seq)`,
    );
    await fill(client, parts[0]);
  } catch (err) {
    // Never leave the other part running behind a failure: it ends (and is dropped by the caller) first.
    await Promise.allSettled(apart);
    throw err;
  }
  await Promise.all(apart);
  for (const part of parts) {
    await client.query(
      `ALTER TABLE ${ident(parent)} ATTACH PARTITION ${ident(pointPartName(logId, part.k))}
         FOR VALUES FROM (${part.lower}) TO (${part.upper})`,
    );
  }
  return parent;
}

/** Names of the tables a failed import of this log may have committed apart (and must drop). */
export const apartTables = (logId: string) => [
  `${partitionName('cells', logId)}_new`,
  pointPartName(logId, 1),
];

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
    // The parts of a points table take names without `_new` too (the old parts went with the old table).
    const parts = await client.query<{ relname: string }>(
      `SELECT c.relname FROM pg_inherits i JOIN pg_class c ON c.oid = i.inhrelid
        WHERE i.inhparent = $1::regclass ORDER BY c.relname`,
      [ident(name)],
    );
    for (const { relname } of parts.rows) {
      await client.query(
        `ALTER TABLE ${ident(relname)} RENAME TO ${ident(relname.replace(`${name}_new_`, `${name}_`))}`,
      );
    }
    await client.query(
      `ALTER TABLE as_applied_${kind} ATTACH PARTITION ${ident(name)} FOR VALUES IN ('${logId}'::uuid)`,
    );
  }
}
