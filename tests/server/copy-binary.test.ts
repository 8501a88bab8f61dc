import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import pg from 'pg';
import { from as copyFrom } from 'pg-copy-streams';
import { pipeline } from 'node:stream/promises';
import { Readable } from 'node:stream';
import { randomUUID } from 'node:crypto';
import { binaryCopyChunks, type BinaryColumn } from '../../server/logs/copy-binary';

// PostgreSQL itself reads what we write: every type, NULLs, negative numbers, chunk boundaries.
let client: pg.Client;
beforeAll(async () => {
  client = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await client.connect();
});
afterAll(() => client.end());

async function roundTrip(rows: number, columns: BinaryColumn[], chunkRows: number, start = 0) {
  await client.query('BEGIN');
  await client.query(`CREATE TEMP TABLE copy_check (
      id uuid, k int4, a float8, g geometry(Point, 4326), b real, c smallint, d integer) ON COMMIT DROP`);
  await pipeline(
    Readable.from(binaryCopyChunks(rows, columns, chunkRows, start)),
    client.query(copyFrom('COPY copy_check FROM STDIN (FORMAT binary)')),
  );
  const { rows: out } = await client.query(
    `SELECT id::text, k, a, ST_X(g) AS x, ST_Y(g) AS y, ST_SRID(g) AS srid, b, c, d FROM copy_check ORDER BY k`,
  );
  await client.query('COMMIT');
  return out;
}

describe('binary COPY', () => {
  it('writes every type PostgreSQL reads back exactly, NaN as NULL, across chunk boundaries', async () => {
    const n = 7;
    const id = randomUUID();
    const a = Float64Array.from({ length: n }, (_, i) => (i === 3 ? NaN : -1234.56789 * (i + 1) + 1e-9));
    const lon = Float64Array.from({ length: n }, (_, i) => -96.123456789 + i * 1e-6);
    const lat = Float64Array.from({ length: n }, (_, i) => 45.987654321 - i * 1e-6);
    const b = Float32Array.from({ length: n }, (_, i) => (i === 5 ? NaN : 12345.678 - i));
    const c = Int16Array.from({ length: n }, (_, i) => (i % 2 ? -i : 32767 - i));
    const d = Int32Array.from({ length: n }, (_, i) => -2_000_000_000 + i);
    const rows = await roundTrip(
      n,
      [
        { type: 'uuid', value: id },
        { type: 'rowNumber' },
        { type: 'float8', values: a },
        { type: 'point4326', lon, lat },
        { type: 'float4', values: b },
        { type: 'int2', values: c },
        { type: 'int4', values: d },
      ],
      3, // three chunks: 3 + 3 + 1 rows
    );
    expect(rows).toHaveLength(n);
    rows.forEach((r, i) => {
      expect(r.id).toBe(id);
      expect(r.k).toBe(i);
      if (Number.isNaN(a[i])) expect(r.a).toBeNull();
      else expect(r.a).toBe(a[i]); // float8 is sent bit for bit
      expect(r.x).toBe(lon[i]);
      expect(r.y).toBe(lat[i]);
      expect(r.srid).toBe(4326);
      if (Number.isNaN(b[i])) expect(r.b).toBeNull();
      else expect(r.b).toBeCloseTo(b[i], 2); // real comes back as text with 6 significant digits
      expect(r.c).toBe(c[i]);
      expect(r.d).toBe(d[i]);
    });
  });

  it('writes a range of rows [start, rows), each numbered by its index, and an empty range', async () => {
    const n = 10;
    const lon = Float64Array.from({ length: n }, (_, i) => i);
    const lat = Float64Array.from({ length: n }, (_, i) => -i);
    const a = Float64Array.from({ length: n }, (_, i) => i * 1.5);
    const columns: BinaryColumn[] = [
      { type: 'uuid', value: randomUUID() },
      { type: 'rowNumber' },
      { type: 'float8', values: a },
      { type: 'point4326', lon, lat },
      { type: 'float4', values: null },
      { type: 'int2', values: null },
      { type: 'int4', values: null },
    ];
    const tail = await roundTrip(n, columns, 3, 4); // rows 4..9 in chunks of 3 + 3
    expect(tail.map((r) => [r.k, r.a, r.x, r.y])).toEqual(
      [4, 5, 6, 7, 8, 9].map((i) => [i, i * 1.5, i, i === 0 ? 0 : -i]),
    );
    expect(await roundTrip(n, columns, 3, n)).toEqual([]);
  });

  it('writes NULL for a column without values, and a valid stream for no rows', async () => {
    const columns = (id: string): BinaryColumn[] => [
      { type: 'uuid', value: id },
      { type: 'rowNumber' },
      { type: 'float8', values: null },
      { type: 'point4326', lon: [10.5, 11.5], lat: [-20.25, -21.25] },
      { type: 'float4', values: undefined },
      { type: 'int2', values: null },
      { type: 'int4', values: null },
    ];
    const two = await roundTrip(2, columns(randomUUID()), 16);
    expect(two.map((r) => [r.k, r.a, r.x, r.y, r.b, r.c, r.d])).toEqual([
      [0, null, 10.5, -20.25, null, null, null],
      [1, null, 11.5, -21.25, null, null, null],
    ]);
    expect(await roundTrip(0, columns(randomUUID()), 16)).toEqual([]);
  });
});
