/**
 * The raster zone join must answer exactly as a plain ray cast (PNPOLY, even–odd over every ring) for every
 * point, and as Turf's booleanPointInPolygon for points not on an edge.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import booleanPointInPolygon from '@turf/boolean-point-in-polygon';
import type { MultiPolygon, Position } from 'geojson';
import { IN_FIELD_NO_ZONE, OUT_OF_FIELD, zoneIndexOf } from '../../shared/audit/zone-join';
import { GeoInputError } from '../../shared/geo/geo-input-error';

/** Even–odd ray cast over every ring (W. R. Franklin's PNPOLY), written here independently of the module. */
function naiveInside(x: number, y: number, mp: MultiPolygon): boolean {
  let inside = false;
  for (const rings of mp.coordinates) {
    for (const ring of rings) {
      for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
        const [xi, yi] = ring[i];
        const [xj, yj] = ring[j];
        if (yi > y !== yj > y && x < xj + ((y - yj) * (xi - xj)) / (yi - yj)) inside = !inside;
      }
    }
  }
  return inside;
}

function naiveZone(x: number, y: number, zones: MultiPolygon[], boundary: MultiPolygon): number {
  if (!naiveInside(x, y, boundary)) return OUT_OF_FIELD;
  const z = zones.findIndex((mp) => naiveInside(x, y, mp));
  return z >= 0 ? z : IN_FIELD_NO_ZONE;
}

function turfZone(x: number, y: number, zones: MultiPolygon[], boundary: MultiPolygon): number {
  if (!booleanPointInPolygon([x, y], boundary)) return OUT_OF_FIELD;
  const z = zones.findIndex((mp) => booleanPointInPolygon([x, y], mp));
  return z >= 0 ? z : IN_FIELD_NO_ZONE;
}

// A field about 800 m across in Iowa-like latitudes (invented place).
const LON0 = -93.62;
const LAT0 = 41.98;
const SPAN = 0.01; // degrees

/** A star-shaped ring about (cx, cy): radii at increasing angles, so it never crosses itself. */
function starRing(cx: number, cy: number, radii: number[], scale = 1): Position[] {
  const ring = radii.map((r, i) => {
    const a = (2 * Math.PI * i) / radii.length;
    return [cx + scale * r * Math.cos(a), cy + scale * r * Math.sin(a) * 0.75];
  });
  return [...ring, ring[0]];
}

const starArb = (maxR: number) =>
  fc.record({
    cx: fc.double({ min: LON0, max: LON0 + SPAN, noNaN: true }),
    cy: fc.double({ min: LAT0, max: LAT0 + SPAN, noNaN: true }),
    radii: fc.array(fc.double({ min: maxR / 5, max: maxR, noNaN: true }), { minLength: 3, maxLength: 14 }),
    hole: fc.option(fc.double({ min: 0.1, max: 0.6, noNaN: true }), { nil: null }),
  });

/** A MultiPolygon of 1–2 star parts, each perhaps with a hole (the star scaled about its centre lies inside it). */
const multiArb = (maxR: number) =>
  fc.array(starArb(maxR), { minLength: 1, maxLength: 2 }).map((parts): MultiPolygon => {
    const kept = parts.filter((p, i) =>
      // Parts far enough apart not to overlap (their enclosing circles are disjoint).
      parts.slice(0, i).every((q) => Math.hypot(p.cx - q.cx, p.cy - q.cy) > 2.1 * maxR),
    );
    return {
      type: 'MultiPolygon',
      coordinates: kept.map((p) => {
        const outer = starRing(p.cx, p.cy, p.radii);
        return p.hole === null ? [outer] : [outer, starRing(p.cx, p.cy, p.radii, p.hole).reverse()];
      }),
    };
  });

/** Points: uniform over a box a little larger than the field, and points a hair off the rings' vertices. */
function pointsFor(seed: number, count: number, polys: MultiPolygon[]) {
  let s = seed >>> 0 || 1;
  const rnd = () => {
    s ^= s << 13;
    s ^= s >>> 17;
    s ^= s << 5;
    return (s >>> 0) / 2 ** 32;
  };
  const lon: number[] = [];
  const lat: number[] = [];
  for (let i = 0; i < count; i++) {
    lon.push(LON0 - 0.006 + rnd() * (SPAN + 0.012));
    lat.push(LAT0 - 0.006 + rnd() * (SPAN + 0.012));
  }
  for (const mp of polys) {
    for (const rings of mp.coordinates) {
      for (const ring of rings) {
        for (const [x, y] of ring) {
          // About 0.1 mm to 1 m from a vertex: inside the cells that straddle an edge.
          const d = 1e-9 * 10 ** (rnd() * 4);
          lon.push(x + (rnd() - 0.5) * d);
          lat.push(y + (rnd() - 0.5) * d);
        }
      }
    }
  }
  return { lon: Float64Array.from(lon), lat: Float64Array.from(lat) };
}

describe('zoneIndexOf', () => {
  it('equals a plain ray cast and Turf on random layouts with holes, multipolygons and overlaps', () => {
    fc.assert(
      fc.property(
        multiArb(0.006),
        fc.array(multiArb(0.003), { minLength: 0, maxLength: 6 }),
        fc.integer({ min: 1, max: 2 ** 31 - 1 }),
        (boundary, zones, seed) => {
          const { lon, lat } = pointsFor(seed, 400, [boundary, ...zones]);
          const got = zoneIndexOf(lon, lat, zones, boundary);
          for (let i = 0; i < lon.length; i++) {
            const want = naiveZone(lon[i], lat[i], zones, boundary);
            if (got[i] !== want) {
              throw new Error(`point ${i} (${lon[i]}, ${lat[i]}): got ${got[i]}, ray cast says ${want}`);
            }
            const t = turfZone(lon[i], lat[i], zones, boundary);
            if (got[i] !== t)
              throw new Error(`point ${i} (${lon[i]}, ${lat[i]}): got ${got[i]}, Turf says ${t}`);
          }
        },
      ),
      { numRuns: 150, seed: 20240611 },
    );
  });

  it('is exact beside horizontal and vertical edges (axis-aligned zones, points 1 µm off the edge)', () => {
    const rect = (w: number, s: number, e: number, n: number): Position[][] => [
      [
        [w, s],
        [e, s],
        [e, n],
        [w, n],
        [w, s],
      ],
    ];
    const boundary: MultiPolygon = { type: 'MultiPolygon', coordinates: [rect(0, 0, 0.01, 0.01)] };
    const zones: MultiPolygon[] = [
      { type: 'MultiPolygon', coordinates: [rect(0.002, 0.002, 0.004, 0.004)] },
      { type: 'MultiPolygon', coordinates: [rect(0.003, 0.003, 0.006, 0.006)] }, // overlaps zone 0
    ];
    const d = 1e-11; // about 1 µm in degrees
    const xs: number[] = [];
    const ys: number[] = [];
    for (const v of [0, 0.002, 0.003, 0.004, 0.006, 0.01]) {
      for (const off of [-d, d]) {
        for (let k = 0; k <= 20; k++) {
          xs.push(v + off, k * 0.0005);
          ys.push(k * 0.0005 + 1e-7, v + off);
        }
      }
    }
    const lon = Float64Array.from(xs);
    const lat = Float64Array.from(ys);
    const got = zoneIndexOf(lon, lat, zones, boundary);
    for (let i = 0; i < lon.length; i++) expect(got[i]).toBe(naiveZone(lon[i], lat[i], zones, boundary));
    // Hand-checked points: first zone wins where zones overlap; outside and in no zone.
    const at = (x: number, y: number) =>
      zoneIndexOf(Float64Array.of(x), Float64Array.of(y), zones, boundary)[0];
    expect(at(0.0035, 0.0035)).toBe(0);
    expect(at(0.005, 0.005)).toBe(1);
    expect(at(0.008, 0.008)).toBe(IN_FIELD_NO_ZONE);
    expect(at(0.011, 0.005)).toBe(OUT_OF_FIELD);
    expect(at(Number.NaN, 0.005)).toBe(OUT_OF_FIELD);
  });

  it('stays exact on a field too large for the finest grid (coarser cells)', () => {
    // About 25 km × 19 km: more than ZONE_JOIN_MAX_CELLS cells of 2 m, so the cells grow (derived).
    const big = (cx: number, cy: number, r: number, k: number): MultiPolygon => ({
      type: 'MultiPolygon',
      coordinates: [
        [
          starRing(
            cx,
            cy,
            Array.from({ length: 12 }, (_, i) => r * (0.6 + (0.4 * ((i * k) % 5)) / 4)),
          ),
        ],
      ],
    });
    const boundary = big(LON0, LAT0, 0.15, 3);
    const zones = [big(LON0 + 0.03, LAT0, 0.05, 2), big(LON0 - 0.04, LAT0 + 0.02, 0.04, 4)];
    const lon = new Float64Array(5000);
    const lat = new Float64Array(5000);
    for (let i = 0; i < lon.length; i++) {
      lon[i] = LON0 - 0.16 + (((i * 7919) % 5000) / 5000) * 0.32;
      lat[i] = LAT0 - 0.12 + (((i * 104729) % 4999) / 4999) * 0.24;
    }
    const got = zoneIndexOf(lon, lat, zones, boundary);
    const counts = new Map<number, number>();
    for (let i = 0; i < lon.length; i++) {
      expect(got[i]).toBe(naiveZone(lon[i], lat[i], zones, boundary));
      counts.set(got[i], (counts.get(got[i]) ?? 0) + 1);
    }
    expect([...counts.keys()].sort((a, b) => a - b)).toEqual([-2, -1, 0, 1]); // every kind of answer was exercised
  });

  it('says what is wrong with bad input', () => {
    const boundary: MultiPolygon = { type: 'MultiPolygon', coordinates: [] };
    expect(() => zoneIndexOf(new Float64Array(2), new Float64Array(3), [], boundary)).toThrow(
      /2 longitudes but 3 latitudes/,
    );
    const bad = {
      type: 'MultiPolygon',
      coordinates: [
        [
          [
            [0, 0],
            [1, Number.NaN],
            [1, 1],
            [0, 0],
          ],
        ],
      ],
    };
    expect(() =>
      zoneIndexOf(new Float64Array(1), new Float64Array(1), [bad as MultiPolygon], boundary),
    ).toThrow(GeoInputError);
    // An empty boundary holds nothing.
    expect([...zoneIndexOf(Float64Array.of(0), Float64Array.of(0), [], boundary)]).toEqual([OUT_OF_FIELD]);
  });
});
