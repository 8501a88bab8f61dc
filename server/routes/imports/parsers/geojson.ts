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
  } catch {
    throw new FileReadError(
      `The file is not valid JSON: the error is at line ${lineAt(text, jsonErrorOffset(text))}`,
    );
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

export const stem = (fileName: string) =>
  (fileName.split('/').pop() ?? fileName).replace(/\.[^.]*$/, '') || 'layer';

/**
 * The offset of the first character at which `text` stops being JSON (RFC 8259), for the message: Node's
 * JSON.parse does not say where. A plain scanner, run only after JSON.parse has failed.
 */
export function jsonErrorOffset(text: string): number {
  let i = 0;
  const ws = () => {
    while (i < text.length && ' \t\n\r'.includes(text[i])) i++;
  };
  const fail = (): never => {
    throw i;
  };
  const value = (depth: number): void => {
    ws();
    if (depth > 1000) fail();
    const c = text[i];
    if (c === '{' || c === '[') {
      const close = c === '{' ? '}' : ']';
      i++;
      ws();
      if (text[i] === close) return void i++;
      for (;;) {
        if (c === '{') {
          ws();
          if (text[i] !== '"') fail();
          string();
          ws();
          if (text[i] !== ':') fail();
          i++;
        }
        value(depth + 1);
        ws();
        if (text[i] === ',') i++;
        else if (text[i] === close) return void i++;
        else fail();
      }
    }
    if (c === '"') return string();
    const m = /^(-?(0|[1-9]\d*)(\.\d+)?([eE][-+]?\d+)?|true|false|null)/.exec(text.slice(i, i + 400));
    if (!m) fail();
    i += m![0].length;
  };
  const string = () => {
    i++;
    while (i < text.length && text[i] !== '"') {
      if (text[i] === '\\') i++;
      else if (text.charCodeAt(i) < 0x20) fail();
      i++;
    }
    if (i >= text.length) fail();
    i++;
  };
  try {
    value(0);
    ws();
    return i;
  } catch (at) {
    return typeof at === 'number' ? at : i;
  }
}
