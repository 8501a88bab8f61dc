import { legacyCrsCode } from '../../../../shared/geo/detect-coordinates';
import { FileReadError } from '../import-errors';
import { decodeText, lineAt } from './text';
import type { ReadResult } from './types';

/** A GeoJSON file: parsed JSON and what its legacy `crs` member (if any) says. */
export function readGeoJson(bytes: Uint8Array, name: string): ReadResult {
  const text = decodeText(bytes, 'GeoJSON file');
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (err) {
    const pos = /position (\d+)/.exec((err as Error).message);
    const where = pos ? ` near line ${lineAt(text, Number(pos[1]))}` : '';
    throw new FileReadError(`The file is not valid JSON${where}`);
  }
  const code = legacyCrsCode(data);
  const crs =
    code === null
      ? { kind: 'wgs84' as const, source: 'GeoJSON (WGS84 longitude, latitude)' }
      : code === 'EPSG:4326'
        ? { kind: 'wgs84' as const, source: 'the file names WGS84 (EPSG:4326)' }
        : { kind: 'code' as const, code, source: `the file names ${code}` };
  return { format: 'geojson', layers: [{ name: stem(name), data, crs }], warnings: [] };
}

export const stem = (fileName: string) => (fileName.split('/').pop() ?? fileName).replace(/\.[^.]*$/, '') || 'layer';
