import { ZipFile } from 'yazl';
import type { MultiPolygonGeom } from '../../shared/geo/to-multipolygon';
import { rewindShapefile } from '../../shared/geo/rewind';

/**
 * A polygon shapefile writer of our own (ESRI Shapefile Technical Description, July 1998: shape type 5,
 * Polygon; dBASE III .dbf). See DEVELOPERS.md "Decisions" for why we do not use @mapbox/shp-write.
 *
 * - Every record is a Polygon (type 5) holding all rings of all parts of a MultiPolygon; a missing geometry
 *   is a Null Shape (type 0), never an error.
 * - Rings are written as shapefiles require whatever winding they arrive in: outer rings clockwise, holes
 *   counter-clockwise (FORMATS.md), the first and last point equal.
 * - The .dbf holds text as UTF-8 (cut only on a character boundary, never silently past a field's width:
 *   the width grows to fit, up to dBASE's 254 bytes) and the .cpg says so; field names are unique ASCII of
 *   at most 10 characters.
 */

/** WGS84 as FORMATS.md gives it, byte for byte. */
export const WGS84_PRJ =
  'GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]]';

export type DbfField =
  | { key: string; type: 'C' }
  /** Numbers written with `decimals` places in a field `width` characters wide. */
  | { key: string; type: 'N'; width: number; decimals: number };

export type ShapefileRecord = {
  geometry: MultiPolygonGeom | null;
  properties: Record<string, string | number | null>;
};

export type ShapefileParts = { shp: Buffer; shx: Buffer; dbf: Buffer; prj: string; cpg: string };

const SHAPE_NULL = 0;
const SHAPE_POLYGON = 5;
const MAX_TEXT_BYTES = 254;

/**
 * dBASE field names for the given keys: ASCII letters, digits and underscore, at most 10 characters, unique
 * without regard to case (readers differ on case), in the order given.
 */
export function dbfFieldNames(keys: string[]): string[] {
  const used = new Set<string>();
  return keys.map((key) => {
    const ascii = key
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .replace(/[^A-Za-z0-9_]+/g, '_')
      .replace(/^_+|_+$/g, '');
    const base = (/^[A-Za-z]/.test(ascii) ? ascii : `F_${ascii}`).slice(0, 10);
    let name = base;
    for (let n = 1; used.has(name.toUpperCase()); n++) {
      const suffix = `_${n}`;
      name = base.slice(0, 10 - suffix.length) + suffix;
    }
    used.add(name.toUpperCase());
    return name;
  });
}

/** A copy of the ring with its first point repeated at the end, if it was not. */
function closed(ring: number[][]): number[][] {
  const first = ring[0];
  const last = ring[ring.length - 1];
  return first && last && (first[0] !== last[0] || first[1] !== last[1]) ? [...ring, first] : ring;
}

/** The rings of a MultiPolygon as a shapefile Polygon wants them: each part's outer ring then its holes. */
export function shapefileRings(geom: MultiPolygonGeom): number[][][] {
  return rewindShapefile(geom)
    .coordinates.flat()
    .map(closed)
    .filter((r) => r.length >= 4);
}

function shpRecordContent(geom: MultiPolygonGeom | null): Buffer {
  const rings = geom ? shapefileRings(geom) : [];
  if (rings.length === 0) {
    const b = Buffer.alloc(4);
    b.writeInt32LE(SHAPE_NULL, 0);
    return b;
  }
  const nPoints = rings.reduce((n, r) => n + r.length, 0);
  const b = Buffer.alloc(44 + 4 * rings.length + 16 * nPoints);
  b.writeInt32LE(SHAPE_POLYGON, 0);
  const box = bboxOf(rings.flat());
  box.forEach((v, i) => b.writeDoubleLE(v, 4 + 8 * i));
  b.writeInt32LE(rings.length, 36);
  b.writeInt32LE(nPoints, 40);
  let offset = 44 + 4 * rings.length;
  let start = 0;
  rings.forEach((ring, i) => {
    b.writeInt32LE(start, 44 + 4 * i);
    start += ring.length;
    for (const [x, y] of ring) {
      b.writeDoubleLE(x, offset);
      b.writeDoubleLE(y, offset + 8);
      offset += 16;
    }
  });
  return b;
}

function bboxOf(points: number[][]): [number, number, number, number] {
  if (points.length === 0) return [0, 0, 0, 0];
  let [xmin, ymin, xmax, ymax] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const [x, y] of points) {
    xmin = Math.min(xmin, x);
    ymin = Math.min(ymin, y);
    xmax = Math.max(xmax, x);
    ymax = Math.max(ymax, y);
  }
  return [xmin, ymin, xmax, ymax];
}

/** The 100-byte main file header shared by .shp and .shx. */
function fileHeader(fileBytes: number, shapeType: number, box: number[]): Buffer {
  const h = Buffer.alloc(100);
  h.writeInt32BE(9994, 0);
  h.writeInt32BE(fileBytes / 2, 24);
  h.writeInt32LE(1000, 28);
  h.writeInt32LE(shapeType, 32);
  box.forEach((v, i) => h.writeDoubleLE(v, 36 + 8 * i));
  return h;
}

function writeShpShx(records: ShapefileRecord[]): { shp: Buffer; shx: Buffer } {
  const contents = records.map((r) => shpRecordContent(r.geometry));
  const all = records.flatMap((r) => (r.geometry ? shapefileRings(r.geometry).flat() : []));
  const box = bboxOf(all);
  const shpBytes = 100 + contents.reduce((n, c) => n + 8 + c.length, 0);
  const shxBytes = 100 + 8 * contents.length;
  const shp = Buffer.alloc(shpBytes);
  const shx = Buffer.alloc(shxBytes);
  fileHeader(shpBytes, SHAPE_POLYGON, box).copy(shp, 0);
  fileHeader(shxBytes, SHAPE_POLYGON, box).copy(shx, 0);
  let offset = 100;
  contents.forEach((c, i) => {
    shx.writeInt32BE(offset / 2, 100 + 8 * i);
    shx.writeInt32BE(c.length / 2, 104 + 8 * i);
    shp.writeInt32BE(i + 1, offset);
    shp.writeInt32BE(c.length / 2, offset + 4);
    c.copy(shp, offset + 8);
    offset += 8 + c.length;
  });
  return { shp, shx };
}

/** UTF-8 bytes of `text`, cut to at most `max` bytes without splitting a character. */
function utf8Cut(text: string, max: number): Buffer {
  const bytes = Buffer.from(text, 'utf8');
  if (bytes.length <= max) return bytes;
  let end = max;
  while (end > 0 && (bytes[end] & 0xc0) === 0x80) end--;
  return bytes.subarray(0, end);
}

function numberText(value: number, field: Extract<DbfField, { type: 'N' }>): string {
  const text = value.toFixed(field.decimals);
  if (text.length > field.width) {
    throw new RangeError(
      `${field.key} = ${value} does not fit a numeric field ${field.width} characters wide`,
    );
  }
  return text.padStart(field.width, ' ');
}

function writeDbf(records: ShapefileRecord[], fields: DbfField[], names: string[], today: Date): Buffer {
  const widths = fields.map((f) => {
    if (f.type === 'N') return f.width;
    const longest = records.reduce((n, r) => {
      const v = r.properties[f.key];
      return Math.max(n, v == null ? 0 : Buffer.byteLength(String(v), 'utf8'));
    }, 1);
    return Math.min(longest, MAX_TEXT_BYTES);
  });
  const headerBytes = 32 + 32 * fields.length + 1;
  const recordBytes = 1 + widths.reduce((a, b) => a + b, 0);
  const b = Buffer.alloc(headerBytes + recordBytes * records.length + 1, 0x20);
  b.fill(0, 0, headerBytes);
  b.writeUInt8(0x03, 0);
  b.writeUInt8(today.getUTCFullYear() - 1900, 1);
  b.writeUInt8(today.getUTCMonth() + 1, 2);
  b.writeUInt8(today.getUTCDate(), 3);
  b.writeUInt32LE(records.length, 4);
  b.writeUInt16LE(headerBytes, 8);
  b.writeUInt16LE(recordBytes, 10);
  fields.forEach((f, i) => {
    const at = 32 + 32 * i;
    b.write(names[i], at, 10, 'ascii');
    b.write(f.type, at + 11, 1, 'ascii');
    b.writeUInt8(widths[i], at + 16);
    b.writeUInt8(f.type === 'N' ? f.decimals : 0, at + 17);
  });
  b.writeUInt8(0x0d, headerBytes - 1);
  records.forEach((r, ri) => {
    let at = headerBytes + ri * recordBytes + 1; // the deletion flag stays a space
    fields.forEach((f, fi) => {
      const v = r.properties[f.key];
      if (v != null && f.type === 'C') utf8Cut(String(v), widths[fi]).copy(b, at);
      if (v != null && f.type === 'N' && Number.isFinite(Number(v)))
        b.write(numberText(Number(v), f), at, 'ascii');
      at += widths[fi];
    });
  });
  b.writeUInt8(0x1a, b.length - 1);
  return b;
}

/** The parts of a polygon shapefile in WGS84 for these records and attribute fields. */
export function writePolygonShapefile(
  records: ShapefileRecord[],
  fields: DbfField[],
  { today = new Date() }: { today?: Date } = {},
): ShapefileParts {
  const names = dbfFieldNames(fields.map((f) => f.key));
  return {
    ...writeShpShx(records),
    dbf: writeDbf(records, fields, names, today),
    prj: WGS84_PRJ,
    cpg: 'UTF-8',
  };
}

/** The five parts zipped under one base name (`<base>.shp`, `.shx`, `.dbf`, `.prj`, `.cpg`). */
export function zipShapefile(baseName: string, parts: ShapefileParts, mtime = new Date()): Promise<Buffer> {
  const zip = new ZipFile();
  const entries: [string, Buffer][] = [
    ['shp', parts.shp],
    ['shx', parts.shx],
    ['dbf', parts.dbf],
    ['prj', Buffer.from(parts.prj, 'ascii')],
    ['cpg', Buffer.from(parts.cpg, 'ascii')],
  ];
  for (const [ext, buf] of entries) zip.addBuffer(buf, `${baseName}.${ext}`, { mtime });
  zip.end();
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    zip.outputStream.on('data', (c: Buffer) => chunks.push(c));
    zip.outputStream.on('error', reject);
    zip.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
  });
}

/**
 * A file name safe on every operating system: ASCII letters, digits, dash and underscore only (accents
 * dropped, anything else a dash), the parts joined by underscores, at most `max` characters.
 */
export function safeFileName(parts: string[], max = 120): string {
  const clean = parts
    .map((p) =>
      p
        .normalize('NFKD')
        .replace(/[\u0300-\u036f]/g, '')
        .replace(/ß/g, 'ss')
        .replace(/[^A-Za-z0-9]+/g, '-')
        .replace(/^-+|-+$/g, '')
        .toLowerCase(),
    )
    .filter(Boolean);
  return (clean.join('_') || 'export').slice(0, max).replace(/[-_]+$/, '');
}
