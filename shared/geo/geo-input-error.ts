/**
 * Where in the input a problem lies. Every index is 0-based as it appears in the input:
 * `feature` in a collection, `part` of a MultiPolygon, `ring` within a polygon (0 = exterior),
 * `coordinate` within a ring. Any member may be missing when it does not apply.
 */
export type GeoInputPlace = { feature?: number; part?: number; ring?: number; coordinate?: number };

/** Describes a place in words a person can follow, e.g. "feature 3, ring 1, coordinate 17" (1-based). */
export function describePlace(place: GeoInputPlace): string {
  const bits: string[] = [];
  if (place.feature !== undefined) bits.push(`feature ${place.feature + 1}`);
  if (place.part !== undefined) bits.push(`part ${place.part + 1}`);
  if (place.ring !== undefined) bits.push(place.ring === 0 ? 'outer ring' : `hole ${place.ring}`);
  if (place.coordinate !== undefined) bits.push(`coordinate ${place.coordinate + 1}`);
  return bits.join(', ');
}

/**
 * Bad geometry input: the message says what is wrong and, when known, where (see {@link GeoInputPlace}).
 * `code` is stable for callers (the server maps it to a 4xx answer); the wording is for people.
 */
export class GeoInputError extends Error {
  readonly code = 'geo_input' as const;
  readonly place: GeoInputPlace | null;

  constructor(what: string, place?: GeoInputPlace) {
    const where = place ? describePlace(place) : '';
    super(where ? `${what} (at ${where})` : what);
    this.name = 'GeoInputError';
    this.place = place ?? null;
  }
}
