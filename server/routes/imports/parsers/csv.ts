import Papa from 'papaparse';
import { FileReadError } from '../import-errors';
import { PointTable, toNumber } from './point-table';
import { decodeText, lineAt } from './text';
import { stem } from './geojson';
import type { ReadResult } from './types';

/** Longer lines are refused (FORMATS.md: "papaparse … with a line-length cap"). */
export const MAX_CSV_LINE = 10_000;

const LON_NAMES = ['longitude', 'lon', 'long', 'lng', 'x', 'pointx', 'xcoord'];
const LAT_NAMES = ['latitude', 'lat', 'y', 'pointy', 'ycoord'];
const key = (h: string) => h.toLowerCase().replace(/[^a-z0-9]/g, '');

/** The index of the first header (in order of preference of `names`) that names a coordinate, or -1. */
function findColumn(headers: string[], names: string[]): number {
  for (const n of names) {
    const i = headers.findIndex((h) => key(h) === n);
    if (i >= 0) return i;
  }
  return -1;
}

/**
 * A CSV of points with longitude and latitude columns (names like lon/long/longitude/x and lat/latitude/y)
 * and any other columns as attributes. Refuses over-long lines, unterminated quotes and duplicate column
 * names, naming the line. Rows without readable coordinates are skipped with a warning naming them.
 */
export function readCsv(bytes: Uint8Array, name: string): ReadResult {
  const text = decodeText(bytes, 'CSV file');
  let lineStart = 0;
  let line = 1;
  for (let i = 0; i <= text.length; i++) {
    if (i === text.length || text.charCodeAt(i) === 10) {
      if (i - lineStart > MAX_CSV_LINE) throw new FileReadError(`Line ${line} is longer than ${MAX_CSV_LINE} characters`);
      lineStart = i + 1;
      line++;
    }
  }
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: 'greedy' });
  const quoteError = parsed.errors.find((e) => e.type === 'Quotes');
  if (quoteError) {
    const at = quoteError.index !== undefined ? lineAt(text, quoteError.index) : (quoteError.row ?? 0) + 1;
    throw new FileReadError(`Line ${at} has a quoted value that is never closed`);
  }
  const [header, ...rows] = parsed.data;
  if (!header || rows.length === 0) throw new FileReadError('The CSV has no rows below its header');
  const headers = header.map((h, i) => h.trim() || `column ${i + 1}`);
  const seen = new Map<string, number>();
  headers.forEach((h, i) => {
    const k = h.toLowerCase();
    if (seen.has(k)) throw new FileReadError(`Line 1: the column name "${h.slice(0, 60)}" appears twice (columns ${seen.get(k)! + 1} and ${i + 1})`);
    seen.set(k, i);
  });
  const lonCol = findColumn(headers, LON_NAMES);
  const latCol = findColumn(headers, LAT_NAMES);
  if (lonCol < 0 || latCol < 0) {
    throw new FileReadError(
      `The CSV needs a longitude and a latitude column (named like lon, longitude or x, and lat, latitude or y); its columns are ${headers
        .slice(0, 12)
        .map((h) => `"${h.slice(0, 30)}"`)
        .join(', ')}`,
    );
  }
  const table = new PointTable();
  const skipped: number[] = [];
  let skippedCount = 0;
  rows.forEach((row, r) => {
    const x = toNumber(row[lonCol]);
    const y = toNumber(row[latCol]);
    if (typeof x !== 'number' || typeof y !== 'number') {
      skippedCount++;
      if (skipped.length < 5) skipped.push(r + 2);
      return;
    }
    const props: Record<string, unknown> = {};
    headers.forEach((h, i) => {
      if (i !== lonCol && i !== latCol) props[h] = row[i];
    });
    table.add(x, y, props);
  });
  const warnings: string[] = [];
  if (skippedCount) {
    warnings.push(`${skippedCount} row${skippedCount === 1 ? '' : 's'} without readable coordinates skipped (row ${skipped.join(', ')}${skippedCount > skipped.length ? ', …' : ''}; the header is row 1)`);
  }
  if (table.length === 0) throw new FileReadError('No row of the CSV has readable coordinates');
  return {
    format: 'csv',
    layers: [{ name: stem(name), data: null, points: table.toColumns(), crs: { kind: 'wgs84', source: `CSV columns "${headers[lonCol]}" and "${headers[latCol]}"` }, geometryType: 'Point' }],
    warnings,
  };
}
