import { describe, expect, it } from 'vitest';
import {
  assertDegreesInRange,
  assertNoAntimeridianCrossing,
  detectCoordinateSpace,
  legacyCrsCode,
  utmCandidates,
  utmZoneOf,
} from '../../shared/geo/detect-coordinates';
import { GeoInputError } from '../../shared/geo/geo-input-error';

const poly = (coords: number[][]) => ({ type: 'Polygon' as const, coordinates: [coords] });

describe('detectCoordinateSpace', () => {
  it('degrees within ±180 / ±90 are geographic; anything beyond is projected, with its bbox (FORMATS.md)', () => {
    expect(
      detectCoordinateSpace([
        {
          geometry: poly([
            [-93.6, 42],
            [-93.5, 42],
            [-93.5, 42.1],
            [-93.6, 42],
          ]),
        },
      ]),
    ).toEqual({ kind: 'geographic' });
    const utm = [
      [448000, 4650000],
      [449000, 4650000],
      [449000, 4651000],
      [448000, 4650000],
    ];
    expect(detectCoordinateSpace([{ geometry: poly(utm) }])).toEqual({
      kind: 'projected',
      bbox: [448000, 4650000, 449000, 4651000],
    });
    expect(detectCoordinateSpace([{ geometry: null }])).toEqual({ kind: 'geographic' });
  });
});

describe('assertDegreesInRange', () => {
  it('names the first coordinate beyond the globe when the numbers are still degree-sized', () => {
    const f = {
      index: 2,
      geometry: poly([
        [-93.6, 42],
        [-93.5, 42],
        [-93.5, 91.5],
        [-93.6, 42],
      ]),
    };
    expect(() => assertDegreesInRange([f])).toThrow(/Latitude 91\.5.*feature 3, outer ring, coordinate 3/);
    expect(() =>
      assertDegreesInRange([
        {
          index: 0,
          geometry: poly([
            [180.5, 0],
            [181, 0],
            [181, 1],
            [180.5, 0],
          ]),
        },
      ]),
    ).toThrow(GeoInputError);
  });

  it('lets plainly projected numbers through (they are asked about, not refused)', () => {
    expect(() =>
      assertDegreesInRange([
        {
          index: 0,
          geometry: poly([
            [448000, 4650000],
            [449000, 4650000],
            [449000, 4651000],
            [448000, 4650000],
          ]),
        },
      ]),
    ).not.toThrow();
  });
});

describe('assertNoAntimeridianCrossing', () => {
  it('refuses a shape spanning more than 180° of longitude, naming it', () => {
    const crossing = {
      index: 0,
      geometry: poly([
        [179.9, -16.5],
        [-179.9, -16.5],
        [-179.9, -16.4],
        [179.9, -16.5],
      ]),
    };
    expect(() => assertNoAntimeridianCrossing([crossing])).toThrow(/feature 1/);
    expect(() =>
      assertNoAntimeridianCrossing([
        {
          index: 0,
          geometry: poly([
            [179.8, -16.5],
            [179.9, -16.5],
            [179.9, -16.4],
            [179.8, -16.5],
          ]),
        },
      ]),
    ).not.toThrow();
  });
});

describe('utmCandidates', () => {
  it('gives the zone of the location and its two neighbours, in its hemisphere (EPSG 326zz north, 327zz south)', () => {
    // 93.6° W lies in zone 15 (6° zones from 180° W: floor((−93.6 + 180) / 6) + 1 = 15, derived).
    expect(utmZoneOf(-93.6)).toBe(15);
    expect(utmCandidates(-93.6, 42).map((c) => c.code)).toEqual(['EPSG:32615', 'EPSG:32614', 'EPSG:32616']);
    expect(utmCandidates(-60.5, -33.2).map((c) => c.code)).toEqual([
      'EPSG:32720',
      'EPSG:32719',
      'EPSG:32721',
    ]);
    expect(utmCandidates(-60.5, -33.2)[0].label).toMatch(/20S/);
  });

  it('wraps around at the antimeridian (zone 60 sits beside zone 1)', () => {
    expect(utmCandidates(-179.5, 10).map((c) => c.code)).toEqual(['EPSG:32601', 'EPSG:32660', 'EPSG:32602']);
    expect(utmZoneOf(180)).toBe(60);
  });
});

describe('legacyCrsCode', () => {
  it('reads the names GeoJSON 2008 files carry', () => {
    const named = (name: string) => ({
      type: 'FeatureCollection',
      features: [],
      crs: { type: 'name', properties: { name } },
    });
    expect(legacyCrsCode({ type: 'FeatureCollection', features: [] })).toBeNull();
    expect(legacyCrsCode(named('urn:ogc:def:crs:OGC:1.3:CRS84'))).toBe('EPSG:4326');
    expect(legacyCrsCode(named('urn:ogc:def:crs:EPSG::32615'))).toBe('EPSG:32615');
    expect(legacyCrsCode(named('urn:ogc:def:crs:EPSG:6.6:4326'))).toBe('EPSG:4326');
    expect(legacyCrsCode(named('EPSG:3857'))).toBe('EPSG:3857');
    expect(() => legacyCrsCode(named('my own system'))).toThrow(GeoInputError);
    expect(() => legacyCrsCode({ crs: { type: 'link' } })).toThrow(GeoInputError);
  });
});
