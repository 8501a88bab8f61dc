import { DOMParser } from '@xmldom/xmldom';
import { kml } from '@tmcw/togeojson';
import { FileReadError } from '../import-errors';
import { decodeText } from './text';
import { stem } from './geojson';
import type { ReadResult } from './types';

/** KML larger than this is refused before parsing (RELIABILITY.md: "size capped before parsing"). */
export const MAX_KML_BYTES = 25 * 1024 * 1024;

/**
 * A KML document (OGC 07-147r2). Any DOCTYPE (and so any entity declaration, billion laughs included) is
 * refused before parsing; malformed XML is reported with its line. KML is always WGS84 longitude, latitude.
 */
export function readKml(bytes: Uint8Array, name: string, format: 'kml' | 'kmz' = 'kml'): ReadResult {
  if (bytes.length > MAX_KML_BYTES)
    throw new FileReadError(`The KML is larger than ${MAX_KML_BYTES / 1024 / 1024} MB`);
  const text = decodeText(bytes, 'KML file');
  if (/<!DOCTYPE/i.test(text) || /<!ENTITY/i.test(text)) {
    throw new FileReadError(
      'The KML declares a DOCTYPE or entities, which Sowright refuses for safety; export it again without one',
    );
  }
  let doc: ReturnType<DOMParser['parseFromString']>;
  try {
    doc = new DOMParser({
      onError: (level, message) => {
        if (level !== 'warning') throw new Error(message);
      },
    }).parseFromString(text, 'text/xml');
  } catch (err) {
    const e = err as Error & { locator?: { lineNumber?: number } };
    const line = e.locator?.lineNumber;
    const cause = String((e as { cause?: Error }).cause?.message ?? e.message)
      .split('\n')[0]
      .slice(0, 160);
    throw new FileReadError(`The KML is not well-formed XML${line ? ` at line ${line}` : ''}: ${cause}`);
  }
  if (doc.documentElement?.localName !== 'kml')
    throw new FileReadError('The file is XML but not KML (its root element is not <kml>)');
  let data: unknown;
  try {
    data = kml(doc as unknown as Document);
  } catch (err) {
    throw new FileReadError(`The KML could not be read: ${String((err as Error).message).slice(0, 160)}`);
  }
  return {
    format,
    layers: [{ name: stem(name), data, crs: { kind: 'wgs84', source: 'KML (always WGS84)' } }],
    warnings: [],
  };
}
