/**
 * PostgreSQL's binary COPY format (https://www.postgresql.org/docs/15/sql-copy.html, "Binary Format"),
 * written from typed arrays: a chunk of rows at a time, through one DataView, with no string per value.
 * The server then reads each value with its type's binary receive function (no text parsing); a PostGIS
 * point is sent as EWKB, which geometry_recv reads.
 */

/**
 * How one column is written: one uuid for every row, the row's number, a point from two coordinate arrays,
 * or a number from an array (NaN is NULL; a missing array is NULL in every row).
 */
export type BinaryColumn =
  | { type: 'uuid'; value: string }
  | { type: 'rowNumber' }
  | { type: 'int2' | 'int4' | 'float4' | 'float8'; values: ArrayLike<number> | null | undefined }
  | { type: 'point4326'; lon: ArrayLike<number>; lat: ArrayLike<number> };

const SIGNATURE = Buffer.from('PGCOPY\n\xff\r\n\0', 'latin1');
const HEADER_BYTES = SIGNATURE.length + 8;
/** EWKB point with an SRID: byte order, type (wkbPoint | SRID flag), SRID, x, y. */
const EWKB_POINT_BYTES = 1 + 4 + 4 + 16;
const EWKB_POINT_SRID = 0x20000001;

const WIDTH = {
  uuid: 16,
  rowNumber: 4,
  int2: 2,
  int4: 4,
  float4: 4,
  float8: 8,
  point4326: EWKB_POINT_BYTES,
} as const;

const uuidBytes = (uuid: string) => {
  const hex = uuid.replace(/-/g, '');
  if (!/^[0-9a-f]{32}$/i.test(hex)) throw new Error(`not a uuid: ${uuid}`);
  return Buffer.from(hex, 'hex');
};

/** Writes rows [from, to) at o; answers the offset after them. */
type RowWriter = (dv: DataView, buf: Buffer, o: number, from: number, to: number) => number;

const SETTER = { int2: 'setInt16', int4: 'setInt32', float4: 'setFloat32', float8: 'setFloat64' } as const;

/**
 * The row loop, written for this list of columns (code generated once per COPY): each column reads its own
 * array at its own site, so every load stays monomorphic — one generic loop over mixed Float64Array,
 * Float32Array, Int16Array and Uint8Array columns ran five times slower.
 */
function rowWriter(columns: BinaryColumn[]): RowWriter {
  const args: unknown[] = [];
  const arg = (v: unknown) => {
    args.push(v);
    return `a${args.length - 1}`;
  };
  const parts = columns.map((c) => {
    if (c.type === 'uuid') return `dv.setInt32(o, 16); buf.set(${arg(uuidBytes(c.value))}, o + 4); o += 20;`;
    if (c.type === 'rowNumber') return 'dv.setInt32(o, 4); dv.setInt32(o + 4, i); o += 8;';
    if (c.type === 'point4326')
      return (
        `dv.setInt32(o, ${EWKB_POINT_BYTES}); dv.setUint8(o + 4, 1); dv.setUint32(o + 5, ${EWKB_POINT_SRID}, true);` +
        ` dv.setUint32(o + 9, 4326, true); dv.setFloat64(o + 13, ${arg(c.lon)}[i], true);` +
        ` dv.setFloat64(o + 21, ${arg(c.lat)}[i], true); o += ${4 + EWKB_POINT_BYTES};`
      );
    if (!c.values) return 'dv.setInt32(o, -1); o += 4;';
    const w = WIDTH[c.type];
    return (
      `{ const v = ${arg(c.values)}[i]; if (v !== v) { dv.setInt32(o, -1); o += 4; }` +
      ` else { dv.setInt32(o, ${w}); dv.${SETTER[c.type]}(o + 4, v); o += ${4 + w}; } }`
    );
  });
  const names = args.map((_, k) => `a${k}`);
  const body = `return function writeRows(dv, buf, o, from, to) {
    for (let i = from; i < to; i++) { dv.setInt16(o, ${columns.length}); o += 2; ${parts.join('\n')} }
    return o;
  };`;
  // Generated from our own column list only (no outside text reaches the code).
  return new Function(...names, body)(...args) as RowWriter;
}

/**
 * Yields the binary COPY stream of rows [`start`, `rows`) in chunks of `chunkRows` (the header before the
 * first, the trailer after the last), ready for pg-copy-streams' `COPY … FROM STDIN (FORMAT binary)`; a row's
 * number (`rowNumber`) is its index in the arrays. Chunks are kept small (under 128 KB), so their memory
 * comes back from the allocator's heap instead of fresh pages.
 */
export function* binaryCopyChunks(
  rows: number,
  columns: BinaryColumn[],
  chunkRows = 512,
  start = 0,
): Generator<Buffer> {
  const rowBytes = 2 + columns.reduce((s, c) => s + 4 + WIDTH[c.type], 0);
  const writeRows = rowWriter(columns);
  for (let from = start; from === start || from < rows; from += chunkRows) {
    const to = Math.max(from, Math.min(rows, from + chunkRows));
    const first = from === start;
    const last = to >= rows;
    const buf = Buffer.allocUnsafe((first ? HEADER_BYTES : 0) + (to - from) * rowBytes + (last ? 2 : 0));
    const dv = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
    let o = 0;
    if (first) {
      SIGNATURE.copy(buf, 0);
      dv.setInt32(SIGNATURE.length, 0); // flags: no OIDs
      dv.setInt32(SIGNATURE.length + 4, 0); // no header extension
      o = HEADER_BYTES;
    }
    o = writeRows(dv, buf, o, from, to);
    if (last) {
      dv.setInt16(o, -1);
      o += 2;
    }
    yield buf.subarray(0, o);
    if (last) return;
  }
}
