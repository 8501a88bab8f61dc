import proj4 from 'proj4';
import * as shpjs from 'shpjs';
import { FileReadError } from '../import-errors';
import type { ReadLayer } from './types';

// shpjs 6 exports its lower-level readers by name (lib/index.js); @types/shpjs 3 does not describe them.
const { parseShp, parseDbf } = shpjs as unknown as {
  parseShp(shp: Buffer, prj?: string): unknown[];
  parseDbf(dbf: Buffer, cpg?: string): Record<string, unknown>[];
};

const SHAPE_TYPES: Record<number, string> = {
  0: 'Null',
  1: 'Point',
  3: 'LineString',
  5: 'Polygon',
  8: 'MultiPoint',
  11: 'Point',
  13: 'LineString',
  15: 'Polygon',
  18: 'MultiPoint',
  21: 'Point',
  23: 'LineString',
  25: 'Polygon',
  28: 'MultiPoint',
};

/** ESRI Shapefile Technical Description (1998): file code 9994 (big-endian) at byte 0, version 1000 (little-endian) at byte 28. */
function assertMagic(buf: Buffer, file: string) {
  if (buf.length < 100 || buf.readInt32BE(0) !== 9994 || buf.readInt32LE(28) !== 1000) {
    throw new FileReadError(
      `"${file}" is not a shapefile part (its header does not start with file code 9994, version 1000)`,
    );
  }
}

const extOf = (name: string) => (/\.([^./]+)$/.exec(name)?.[1] ?? '').toLowerCase();
const baseOf = (name: string) => name.replace(/\.[^./]+$/, '');
const shortName = (name: string) => name.split('/').pop() ?? name;

/** Whether a zip entry is a shapefile part we read (resource forks of macOS archivers skipped). */
export const isShapefilePart = (name: string) =>
  /\.(shp|shx|dbf|prj|cpg)$/i.test(name) &&
  !name.startsWith('__MACOSX/') &&
  !shortName(name).startsWith('._');

/**
 * The layers of a zipped shapefile, from its already inflated parts (see server/lib/zip-inspect.ts). Each .shp
 * is a layer; its .prj is honoured (a .prj that cannot be read is reported and the coordinates taken as they
 * are), .cpg gives the .dbf's code page. The record counts of .shp, .shx and .dbf must agree.
 */
export function readShapefileLayers(files: Map<string, Buffer>, warnings: string[]): ReadLayer[] {
  const byBase = new Map<string, Map<string, Buffer>>();
  for (const [name, buf] of files) {
    const base = baseOf(name);
    const parts = byBase.get(base.toLowerCase()) ?? new Map<string, Buffer>();
    parts.set(extOf(name), buf);
    parts.set('name', Buffer.from(base));
    byBase.set(base.toLowerCase(), parts);
  }
  const layers: ReadLayer[] = [];
  for (const parts of byBase.values()) {
    const shp = parts.get('shp');
    if (!shp) continue;
    layers.push(readLayer(shortName(parts.get('name')!.toString()), parts, shp, warnings));
  }
  return layers;
}

function readLayer(name: string, parts: Map<string, Buffer>, shp: Buffer, warnings: string[]): ReadLayer {
  assertMagic(shp, `${name}.shp`);
  const shx = parts.get('shx');
  if (shx) assertMagic(shx, `${name}.shx`);
  const shapeType = shp.readInt32LE(32);
  const geometryType = SHAPE_TYPES[shapeType];
  if (!geometryType)
    throw new FileReadError(`Layer "${name}": unknown shape type ${shapeType} in the .shp header`);

  const prjText = parts.get('prj')?.toString('utf8').trim() || undefined;
  let prj = prjText;
  if (prjText) {
    try {
      proj4(prjText);
    } catch {
      warnings.push(
        `Layer "${name}": its .prj cannot be read as a coordinate system, so its coordinates are taken as they are`,
      );
      prj = undefined;
    }
  }
  let rows: unknown[];
  try {
    rows = parseShp(shp, prj);
  } catch (err) {
    throw new FileReadError(
      `Layer "${name}": the .shp cannot be read (${String((err as Error).message).slice(0, 120)})`,
    );
  }
  if (shx) {
    const indexed = (shx.length - 100) / 8;
    if (indexed !== rows.length) {
      throw new FileReadError(
        `Layer "${name}": the .shx lists ${indexed} shapes but the .shp holds ${rows.length}; the .shp is cut short or damaged`,
      );
    }
  }
  let records: Record<string, unknown>[] = [];
  const dbf = parts.get('dbf');
  if (dbf) {
    const declared = dbf.length >= 8 ? dbf.readUInt32LE(4) : -1;
    if (declared !== rows.length) {
      throw new FileReadError(
        `Layer "${name}": the .dbf holds ${declared} records but the .shp holds ${rows.length} shapes; they must match one to one`,
      );
    }
    try {
      records = parseDbf(dbf, parts.get('cpg')?.toString('utf8').trim() || undefined);
    } catch (err) {
      throw new FileReadError(
        `Layer "${name}": the .dbf cannot be read (${String((err as Error).message).slice(0, 120)})`,
      );
    }
    if (records.length !== rows.length) {
      throw new FileReadError(
        `Layer "${name}": the .dbf holds ${records.length} readable records but the .shp holds ${rows.length} shapes`,
      );
    }
  } else {
    warnings.push(`Layer "${name}" has no .dbf, so its shapes carry no attributes`);
  }
  const data = {
    type: 'FeatureCollection',
    features: rows.map((geometry, i) => ({ type: 'Feature', geometry, properties: records[i] ?? {} })),
  };
  const crs: ReadLayer['crs'] = prj
    ? { kind: 'reprojected', source: `the layer's .prj` }
    : { kind: 'wgs84', source: prjText ? 'the .prj could not be read' : 'the shapefile has no .prj' };
  return { name, data, crs, geometryType };
}
