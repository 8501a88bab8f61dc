import { expect } from 'vitest';
import request from 'supertest';
import type { MultiPolygon, Polygon, Position } from 'geojson';
import { zoneMapSchema, type ZoneMap } from '../../shared/schemas/zone-map.schema';
import type { Caller } from '../helpers/app';
import type { World } from '../helpers/factory';

/**
 * The world's field boundary is tests/helpers/factory.ts squareBoundary(): lon −93.6 … −93.595, lat 42.0 …
 * 42.005. Shapes here are made inside it, in degrees.
 */
export const W = -93.6;
export const S = 42.0;
export const SIDE = 0.005;

/** A rectangle [lon, lat] from its west, south, east and north edges, counter-clockwise. */
export function rect(w: number, s: number, e: number, n: number): Position[] {
  return [
    [w, s],
    [e, s],
    [e, n],
    [w, n],
    [w, s],
  ];
}

/** A square of the field by fractions of its side: (0, 0, 1, 1) is the whole boundary. */
export const cell = (x0: number, y0: number, x1: number, y1: number) =>
  rect(W + x0 * SIDE, S + y0 * SIDE, W + x1 * SIDE, S + y1 * SIDE);

export const polygon = (...rings: Position[][]): Polygon => ({ type: 'Polygon', coordinates: rings });
export const multi = (...polys: Position[][][]): MultiPolygon => ({
  type: 'MultiPolygon',
  coordinates: polys,
});

/** A vertical line at fraction x of the side, from below the field to above it. */
export const verticalLine = (x: number) => ({
  type: 'LineString' as const,
  coordinates: [
    [W + x * SIDE, S - 0.001],
    [W + x * SIDE, S + SIDE + 0.001],
  ],
});

/** The answer is a whole ZoneMap of the shared schema (and the status is as expected). */
export function expectMap(res: request.Response, status = 200): ZoneMap {
  expect(res.status, JSON.stringify(res.body).slice(0, 500)).toBe(status);
  return zoneMapSchema.parse(res.body);
}

export const zoneNamed = (map: ZoneMap, name: string) => {
  const z = map.zones.features.find((f) => f.properties.name === name);
  if (!z)
    throw new Error(`no zone "${name}" in ${map.zones.features.map((f) => f.properties.name).join(', ')}`);
  return z;
};

export const totalZoneArea = (map: ZoneMap) =>
  map.zones.features.reduce((s, f) => s + f.properties.areaM2, 0);

/** Relative difference |a − b| / b. */
export const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

/** Creates a zone map on grower A's field and season (one default zone). */
export async function createMap(caller: Caller, w: World, name = 'Zones'): Promise<ZoneMap> {
  return expectMap(
    await caller.post('/api/zone-maps', { fieldId: w.a.field.id, seasonId: w.a.season.id, name }),
    201,
  );
}

/** Adds a zone; answers the map. */
export async function addZone(
  caller: Caller,
  map: ZoneMap,
  name: string,
  geometry: Polygon | MultiPolygon,
  extra: { classValue?: number | null; productivityIndex?: number | null } = {},
): Promise<ZoneMap> {
  return expectMap(
    await caller.post(`/api/zone-maps/${map.id}/zones`, {
      version: map.version,
      name,
      geometry,
      classValue: extra.classValue ?? null,
      productivityIndex: extra.productivityIndex ?? null,
    }),
  );
}

/** A state-changing DELETE as the caller (the test helper Caller has no delete). */
export const del = (caller: Caller, url: string) =>
  request(caller.app).delete(url).set('Cookie', caller.cookie).set('X-Sowright-Request', '1');

/** Resolves every overlap in favour of the later zone of each pair, then fills the gaps. */
export async function tidy(caller: Caller, start: ZoneMap): Promise<ZoneMap> {
  let map = start;
  for (let guard = 0; map.analysis.overlaps.length && guard < 20; guard++) {
    const o = map.analysis.overlaps[0];
    map = expectMap(
      await caller.post(`/api/zone-maps/${map.id}/resolve-overlap`, {
        version: map.version,
        keepZoneId: o.bId,
        loseZoneId: o.aId,
      }),
    );
  }
  return expectMap(await caller.post(`/api/zone-maps/${map.id}/fill-gaps`, { version: map.version }));
}

/** GET as the caller, the body kept as raw bytes whatever its media type (for exported files). */
export const getBytes = (caller: Caller, url: string) =>
  caller
    .get(url)
    .buffer(true)
    .parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
