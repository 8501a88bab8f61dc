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

/**
 * Yields the binary COPY stream of `rows` rows in chunks of `chunkRows` (the header before the first, the
 * trailer after the last), ready for pg-copy-streams' `COPY … FROM STDIN (FORMAT binary)`.
 */
export function* binaryCopyChunks(
  rows: number,
  columns: BinaryColumn[],
  chunkRows = 16_384,
): Generator<Buffer> {
  const rowBytes = 2 + columns.reduce((s, c) => s + 4 + WIDTH[c.type], 0);
  const uuids = columns.map((c) => (c.type === 'uuid' ? uuidBytes(c.value) : null));
  for (let from = 0; from === 0 || from < rows; from += chunkRows) {
    const to = Math.min(rows, from + chunkRows);
    const first = from === 0;
    const last = to === rows;
    const buf = Buffer.allocUnsafe((first ? HEADER_BYTES : 0) + (to - from) * rowBytes + (last ? 2 : 0));
    const dv = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
    let o = 0;
    if (first) {
      SIGNATURE.copy(buf, 0);
      dv.setInt32(SIGNATURE.length, 0); // flags: no OIDs
      dv.setInt32(SIGNATURE.length + 4, 0); // no header extension
      o = HEADER_BYTES;
    }
    for (let i = from; i < to; i++) {
      dv.setInt16(o, columns.length);
      o += 2;
      for (let k = 0; k < columns.length; k++) {
        const c = columns[k];
        if (c.type === 'uuid') {
          dv.setInt32(o, 16);
          buf.set(uuids[k]!, o + 4);
          o += 20;
        } else if (c.type === 'point4326') {
          dv.setInt32(o, EWKB_POINT_BYTES);
          dv.setUint8(o + 4, 1); // little endian
          dv.setUint32(o + 5, EWKB_POINT_SRID, true);
          dv.setUint32(o + 9, 4326, true);
          dv.setFloat64(o + 13, c.lon[i], true);
          dv.setFloat64(o + 21, c.lat[i], true);
          o += 4 + EWKB_POINT_BYTES;
        } else if (c.type === 'rowNumber') {
          dv.setInt32(o, 4);
          dv.setInt32(o + 4, i);
          o += 8;
        } else {
          const v = c.values ? c.values[i] : NaN;
          if (Number.isNaN(v)) {
            dv.setInt32(o, -1);
            o += 4;
            continue;
          }
          const w = WIDTH[c.type];
          dv.setInt32(o, w);
          if (c.type === 'float8') dv.setFloat64(o + 4, v);
          else if (c.type === 'float4') dv.setFloat32(o + 4, v);
          else if (c.type === 'int4') dv.setInt32(o + 4, v);
          else dv.setInt16(o + 4, v);
          o += 4 + w;
        }
      }
    }
    if (last) {
      dv.setInt16(o, -1);
      o += 2;
    }
    yield buf.subarray(0, o);
    if (last) return;
  }
}
