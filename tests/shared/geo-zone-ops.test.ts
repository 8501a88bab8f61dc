/**
 * Zone operations. Golden fixtures live in fixtures/geo/zone-ops/<case>/{in,out}.json; run
 * `REGEN=1 npm test -- --project shared tests/shared/geo-zone-ops.test.ts` to rewrite the out files on purpose
 * (then read the diff). Coordinates compare at 7 decimals, areas at 0.01 m².
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { LineString, MultiPolygon } from 'geojson';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { GeoInputError } from '../../shared/geo/geo-input-error';
import { ringFromOffsets } from '../../shared/geo/offset-position';
import { ringOrientation } from '../../shared/geo/rewind';
import {
  type ZoneLike,
  clipToBoundary,
  fillGaps,
  findGaps,
  findOverlaps,
  mergeZones,
  resolveOverlap,
  splitZone,
} from '../../shared/geo/zone-ops';
import { goldenCases } from './geo-golden';

type Input = Record<string, unknown>;
type Zones = ZoneLike[];
const area = (g: MultiPolygon) => geodesicAreaM2(g);

const OPS: Record<string, (i: Input) => unknown> = {
  clipToBoundary: (i) => clipToBoundary(i.zones as Zones, i.boundary as MultiPolygon),
  findOverlaps: (i) => findOverlaps(i.zones as Zones),
  resolveOverlap: (i) => resolveOverlap(i.zones as Zones, i.keepId as string, i.loseId as string),
  findGaps: (i) => {
    const g = findGaps(i.zones as Zones, i.boundary as MultiPolygon);
    return { geometry: g, areaM2: g ? area(g) : 0 };
  },
  fillGaps: (i) =>
    fillGaps(i.zones as Zones, i.boundary as MultiPolygon, i.defaults as { id: string; name: string }),
  splitZone: (i) => {
    const [a, b] = splitZone(i.zone as ZoneLike, i.line as LineString);
    return { halves: [a, b], leftM2: area(a), rightM2: area(b), zoneM2: area((i.zone as ZoneLike).geometry) };
  },
  mergeZones: (i) => {
    const m = mergeZones(i.a as ZoneLike, i.b as ZoneLike);
    return { geometry: m, areaM2: area(m) };
  },
};

describe('zone-ops golden fixtures', () => {
  goldenCases('zone-ops', (input) => OPS[input.op as string](input));
});

/** Every ring of a result in RFC 7946 winding: exterior counter-clockwise, holes clockwise. */
function expectRfc7946(g: MultiPolygon) {
  for (const rings of g.coordinates) {
    rings.forEach((ring, i) =>
      i === 0
        ? expect(ringOrientation(ring)).toBeGreaterThan(0)
        : expect(ringOrientation(ring)).toBeLessThan(0),
    );
  }
}

const O: [number, number] = [-93.62, 41.98];
const rect = (x0: number, y0: number, x1: number, y1: number) => ringFromOffsets(O, [[x0, y0], [x1, y0], [x1, y1], [x0, y1]]); // prettier-ignore
const mp = (...polys: number[][][][]): MultiPolygon => ({ type: 'MultiPolygon', coordinates: polys });
const zone = (
  id: string,
  geometry: MultiPolygon,
  isDefault = false,
): ZoneLike<{ id: string; isDefault: boolean }> => ({
  type: 'Feature',
  properties: { id, isDefault },
  geometry,
});
const lineOf = (pts: [number, number][]): LineString => ({
  type: 'LineString',
  coordinates: ringFromOffsets(O, pts).slice(0, -1),
});
const boundary = mp([ringFromOffsets(O, [[0, 0], [400, 0], [420, 300], [0, 320]])]); // prettier-ignore

describe('clipToBoundary', () => {
  it('keeps holes and parts, sets areas, winds RFC 7946 and drops zones outside', () => {
    const holed = zone('h', mp([rect(-50, 100, 200, 350), rect(50, 150, 120, 250)]));
    const outside = zone('o', mp([rect(600, 0, 700, 100)]));
    const out = clipToBoundary([holed, outside], boundary);
    expect(out.map((z) => z.properties.id)).toEqual(['h']);
    expect(out[0].geometry.coordinates[0]).toHaveLength(2); // exterior and the hole
    expectRfc7946(out[0].geometry);
    // Derived: the clipped zone is the part of the 250 × 250 m square inside the boundary, minus the 70 × 100 m hole.
    expect(out[0].properties.areaM2).toBeCloseTo(area(out[0].geometry), 6);
    expect(out[0].properties.areaM2).toBeLessThan(200 * 220 - 70 * 100 + 1);
    expect(out[0].properties.areaM2).toBeGreaterThan(200 * 215 - 70 * 100);
  });
});

describe('findOverlaps and resolveOverlap', () => {
  const a = zone('a', mp([rect(0, 150, 400, 320)]));
  const b = zone('b', mp([rect(0, 100, 400, 200)]));
  const edge = zone('e', mp([rect(0, 0, 400, 100)])); // shares only an edge with b

  it('lists the pair that shares area, with the shared area in m², and not a pair that only touches', () => {
    const o = findOverlaps([a, b, edge]);
    expect(o.map((x) => [x.aId, x.bId])).toEqual([['a', 'b']]);
    expect(o[0].areaM2).toBeGreaterThan(400 * 50 * 0.999); // derived: a 400 × 50 m strip
    expect(o[0].areaM2).toBeLessThan(400 * 50 * 1.001);
  });

  it('gives the overlap to the kept zone and none remains', () => {
    const before = structuredClone([a, b]);
    const out = resolveOverlap([a, b], 'a', 'b');
    expect([a, b]).toEqual(before);
    expect(findOverlaps(out)).toEqual([]);
    expect(area(out[0].geometry) + area(out[1].geometry)).toBeCloseTo(area(mergeZones(a, b)), 2);
  });

  it('removes a zone that loses all of itself, and refuses unknown or equal ids', () => {
    const inner = zone('i', mp([rect(100, 200, 150, 250)]));
    expect(resolveOverlap([a, inner], 'a', 'i').map((z) => z.properties.id)).toEqual(['a']);
    expect(() => resolveOverlap([a, b], 'a', 'zz')).toThrow(GeoInputError);
    expect(() => resolveOverlap([a, b], 'a', 'a')).toThrow(GeoInputError);
  });
});

describe('findGaps and fillGaps', () => {
  it('finds no gap when the zones cover the boundary', () => {
    expect(findGaps([zone('all', boundary)], boundary)).toBeNull();
  });

  it('the whole boundary is a gap when there are no zones, and fills it with a default zone', () => {
    const out = fillGaps([], boundary, { id: 'd', name: 'Rest' });
    expect(out).toHaveLength(1);
    expect(out[0].properties).toMatchObject({ id: 'd', name: 'Rest', isDefault: true, classValue: null });
    expect((out[0].properties as { areaM2: number }).areaM2).toBeCloseTo(area(boundary), 2);
  });
});

describe('splitZone', () => {
  const holed = mp([rect(0, 0, 300, 200), rect(100, 50, 200, 150)]);

  it('halves add up to the zone within 1e-6 relative, keep the hole halves and wind RFC 7946', () => {
    const [l, r] = splitZone(
      holed,
      lineOf([
        [150, -30],
        [150, 230],
      ]),
    );
    expect(Math.abs(area(l) + area(r) - area(holed)) / area(holed)).toBeLessThan(1e-6);
    expect(area(l)).toBeCloseTo(area(r), -1); // derived: the line runs through the middle of a symmetric zone
    expectRfc7946(l);
    expectRfc7946(r);
  });

  it('returns the left side of the line first', () => {
    const [l] = splitZone(
      mp([rect(0, 0, 300, 200)]),
      lineOf([
        [100, -30],
        [100, 230],
      ]),
    );
    // Derived: walking north along x = 100 m, the left (west) side is 100 × 200 m.
    expect(area(l)).toBeGreaterThan(100 * 200 * 0.999);
    expect(area(l)).toBeLessThan(100 * 200 * 1.001);
    const [l2] = splitZone(
      mp([rect(0, 0, 300, 200)]),
      lineOf([
        [100, 230],
        [100, -30],
      ]),
    );
    expect(area(l2)).toBeGreaterThan(200 * 200 * 0.999);
  });

  it('splits a U-shaped zone crossed three times into three pieces', () => {
    const u = mp([ringFromOffsets(O, [[0, 0], [300, 0], [300, 200], [200, 200], [200, 50], [100, 50], [100, 200], [0, 200]])]); // prettier-ignore
    const [l, r] = splitZone(
      u,
      lineOf([
        [-20, 100],
        [320, 100],
      ]),
    );
    expect(l.coordinates.length + r.coordinates.length).toBe(3);
    expect(Math.abs(area(l) + area(r) - area(u)) / area(u)).toBeLessThan(1e-6);
  });

  it('refuses a line that misses, ends inside, crosses itself or has one position', () => {
    const sq = mp([rect(0, 0, 300, 200)]);
    expect(() =>
      splitZone(
        sq,
        lineOf([
          [-20, 250],
          [320, 260],
        ]),
      ),
    ).toThrow(GeoInputError);
    expect(() =>
      splitZone(
        sq,
        lineOf([
          [-20, 100],
          [150, 100],
        ]),
      ),
    ).toThrow(GeoInputError);
    expect(() =>
      splitZone(
        sq,
        lineOf([
          [-20, 50],
          [320, 150],
          [320, 40],
          [-20, 140],
        ]),
      ),
    ).toThrow(GeoInputError);
    expect(() =>
      splitZone(sq, {
        type: 'LineString',
        coordinates: [
          [-93.6, 42],
          [-93.6, 42],
        ],
      }),
    ).toThrow(GeoInputError);
    try {
      splitZone(
        sq,
        lineOf([
          [-20, 100],
          [150, 100],
        ]),
      );
    } catch (e) {
      expect((e as GeoInputError).place).toEqual({ coordinate: 1 }); // the end inside the zone
    }
  });
});

describe('mergeZones', () => {
  it('merges touching zones into one polygon with the summed area', () => {
    const a = zone('a', mp([rect(0, 0, 200, 300)]));
    const b = zone('b', mp([rect(200, 0, 400, 300)]));
    const m = mergeZones(a, b);
    expect(m.coordinates).toHaveLength(1);
    expect(area(m)).toBeCloseTo(area(a.geometry) + area(b.geometry), 2);
  });
});

describe('property: clip, resolve and fill make zones add up to the boundary', () => {
  it('for random rectangles, zone areas sum to the boundary area within 0.01 %', () => {
    const rectArb = fc
      .tuple(
        fc.integer({ min: -50, max: 430 }),
        fc.integer({ min: -50, max: 330 }),
        fc.integer({ min: 10, max: 250 }),
        fc.integer({ min: 10, max: 250 }),
      )
      .map(([x, y, w, h]) => rect(x, y, x + w, y + h));
    fc.assert(
      fc.property(fc.array(rectArb, { minLength: 1, maxLength: 5 }), (rects) => {
        let zones: ZoneLike[] = clipToBoundary(
          rects.map((r, i) => zone(`z${i}`, mp([r]))),
          boundary,
        );
        for (let guard = 0; guard < 50; guard++) {
          const o = findOverlaps(zones);
          if (!o.length) break;
          zones = resolveOverlap(zones, o[0].aId, o[0].bId);
        }
        expect(findOverlaps(zones)).toEqual([]);
        zones = fillGaps(zones, boundary, { id: 'default', name: 'Rest of field' });
        const total = zones.reduce((s, z) => s + area(z.geometry), 0);
        expect(Math.abs(total - area(boundary)) / area(boundary)).toBeLessThan(1e-4);
      }),
      { numRuns: 60, seed: 20261202 },
    );
  });
});

describe('property: a split always adds up', () => {
  it('for random lines across a zone with a hole, the halves are non-empty and sum to the zone within 1e-6', () => {
    const holed = mp([rect(0, 0, 300, 200), rect(100, 50, 200, 150)]);
    const whole = area(holed);
    fc.assert(
      // Lines from west of the zone to east of it, bending at a point inside it, so they cross it.
      fc.property(
        fc.integer({ min: 5, max: 195 }),
        fc.integer({ min: 5, max: 195 }),
        fc.integer({ min: 5, max: 195 }),
        fc.integer({ min: 20, max: 280 }),
        (y0, y1, ym, xm) => {
          const line = lineOf([[-30, y0], [xm, ym], [330, y1]]); // prettier-ignore
          const [l, r] = splitZone(holed, line);
          expect(area(l)).toBeGreaterThan(0);
          expect(area(r)).toBeGreaterThan(0);
          expect(Math.abs(area(l) + area(r) - whole) / whole).toBeLessThan(1e-6);
          expect(findOverlaps([zone('l', l), zone('r', r)])).toEqual([]);
        },
      ),
      { numRuns: 40, seed: 11 },
    );
  });
});
