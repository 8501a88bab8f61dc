import { readAny } from '../routes/imports/parsers/read-upload';
import { FileReadError } from '../routes/imports/import-errors';

/** Column names given to a point's position when a GeoJSON or shapefile log is read as a table. */
export const POINT_LON_COLUMN = 'longitude';
export const POINT_LAT_COLUMN = 'latitude';

const isObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v);

const cell = (v: unknown) => {
  if (v == null) return '';
  const s = typeof v === 'object' ? JSON.stringify(v) : String(v);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
};

/**
 * A GeoJSON or zipped-shapefile point log as CSV text (longitude, latitude, then every property), so one
 * parser and one column mapping serve every format. Coordinates must be WGS84 degrees (a shapefile's .prj
 * is honoured by the reader); anything else is refused with a message saying so.
 */
export async function pointsFileToCsv(bytes: Uint8Array, fileName: string): Promise<Uint8Array> {
  const read = await readAny(bytes, fileName);
  const keys = new Set<string>();
  const rows: { lon: unknown; lat: unknown; props: Record<string, unknown> }[] = [];
  for (const layer of read.layers) {
    if (layer.crs.kind === 'code') {
      throw new FileReadError(
        `The log's coordinates are in ${layer.crs.code}: export it with longitude and latitude in WGS84`,
      );
    }
    const data = layer.data;
    const features: unknown[] =
      isObject(data) && Array.isArray(data.features) ? data.features : isObject(data) ? [data] : [];
    for (const f of features) {
      if (!isObject(f) || !isObject(f.geometry) || f.geometry.type !== 'Point') continue;
      const [lon, lat] = Array.isArray(f.geometry.coordinates) ? f.geometry.coordinates : [];
      const props = isObject(f.properties) ? f.properties : {};
      for (const k of Object.keys(props)) keys.add(k);
      rows.push({ lon, lat, props });
    }
  }
  if (rows.length === 0)
    throw new FileReadError('The file holds no points: an as-applied log is one point a second');
  const columns = [...keys].filter((k) => k !== POINT_LON_COLUMN && k !== POINT_LAT_COLUMN);
  const lines = [[POINT_LON_COLUMN, POINT_LAT_COLUMN, ...columns].map(cell).join(',')];
  for (const r of rows) lines.push([r.lon, r.lat, ...columns.map((k) => r.props[k])].map(cell).join(','));
  return new TextEncoder().encode(lines.join('\n') + '\n');
}
