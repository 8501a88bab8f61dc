import Papa from 'papaparse';
import { FileReadError } from '../import-errors';
import { toNumber } from './point-table';
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

/** Column names from the header row: refuses duplicates and a header without longitude and latitude. */
function readHeader(header: string[]) {
  const headers = header.map((h, i) => h.trim() || `column ${i + 1}`);
  const seen = new Map<string, number>();
  headers.forEach((h, i) => {
    const k = h.toLowerCase();
    if (seen.has(k))
      throw new FileReadError(
        `Line 1: the column name "${h.slice(0, 60)}" appears twice (columns ${seen.get(k)! + 1} and ${i + 1})`,
      );
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
  return { headers, lonCol, latCol };
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
      if (i - lineStart > MAX_CSV_LINE)
        throw new FileReadError(`Line ${line} is longer than ${MAX_CSV_LINE} characters`);
      lineStart = i + 1;
      line++;
    }
  }
  // Row by row (papaparse's step): no array of every row is ever held, and values go straight into typed
  // arrays sized by the line count, so 200 000 rows do not churn the heap.
  const capacity = line;
  let headers: string[] | null = null;
  let lonCol = -1;
  let latCol = -1;
  let attrs: { name: string; i: number }[] = [];
  const x = new Float64Array(capacity);
  const y = new Float64Array(capacity);
  let values: Float64Array[] = [];
  let texts: number[] = [];
  const skipped: number[] = [];
  let skippedCount = 0;
  let kept = 0;
  let rowNo = 0;
  let failure: FileReadError | null = null;
  Papa.parse<string[]>(text, {
    skipEmptyLines: 'greedy',
    step: (results, p) => {
      const quoteError = results.errors.find((e) => e.type === 'Quotes');
      if (quoteError) {
        const at = quoteError.index !== undefined ? lineAt(text, quoteError.index) : rowNo + 1;
        failure = new FileReadError(`Line ${at} has a quoted value that is never closed`);
        return p.abort();
      }
      const row = results.data;
      rowNo++;
      if (!headers) {
        try {
          ({ headers, lonCol, latCol } = readHeader(row));
        } catch (err) {
          failure = err as FileReadError;
          return p.abort();
        }
        attrs = headers.map((name, i) => ({ name, i })).filter(({ i }) => i !== lonCol && i !== latCol);
        values = attrs.map(() => new Float64Array(capacity));
        texts = attrs.map(() => 0);
        return;
      }
      const lon = toNumber(row[lonCol]);
      const lat = toNumber(row[latCol]);
      if (typeof lon !== 'number' || typeof lat !== 'number') {
        skippedCount++;
        if (skipped.length < 5) skipped.push(rowNo);
        return;
      }
      x[kept] = lon;
      y[kept] = lat;
      for (let a = 0; a < attrs.length; a++) {
        const v = toNumber(row[attrs[a].i]);
        if (v === 'text') texts[a]++;
        values[a][kept] = typeof v === 'number' ? v : Number.NaN;
      }
      kept++;
    },
  });
  if (failure) throw failure;
  if (!headers || rowNo < 2) throw new FileReadError('The CSV has no rows below its header');
  const names: string[] = headers;
  const warnings: string[] = [];
  if (skippedCount) {
    warnings.push(
      `${skippedCount} row${skippedCount === 1 ? '' : 's'} without readable coordinates skipped (row ${skipped.join(', ')}${skippedCount > skipped.length ? ', …' : ''}; the header is row 1)`,
    );
  }
  if (kept === 0) throw new FileReadError('No row of the CSV has readable coordinates');
  const points = {
    x: x.slice(0, kept),
    y: y.slice(0, kept),
    columns: attrs.map((c, a) => ({ name: c.name, values: values[a].slice(0, kept), texts: texts[a] })),
  };
  return {
    format: 'csv',
    layers: [
      {
        name: stem(name),
        data: null,
        points,
        crs: { kind: 'wgs84', source: `CSV columns "${names[lonCol]}" and "${names[latCol]}"` },
        geometryType: 'Point',
      },
    ],
    warnings,
  };
}
