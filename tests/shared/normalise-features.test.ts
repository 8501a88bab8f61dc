import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { normaliseFeatures } from '../../shared/geo/normalise-features';
import { GeoInputError } from '../../shared/geo/geo-input-error';
import { ringOrientation } from '../../shared/geo/rewind';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { goldenCases } from './geo-golden';

describe('normaliseFeatures golden fixtures (fixtures/geo/normalise)', () => {
  goldenCases('normalise', (input) => normaliseFeatures(input));
});

/** A closed triangle ring in plain numbers. */
const TRIANGLE = [
  [0, 0],
  [1, 0],
  [1, 1],
  [0, 0],
];

describe('normaliseFeatures', () => {
  it('winds every exterior counter-clockwise and every hole clockwise (RFC 7946 §3.1.6), whatever came in', () => {
    const cw = [
      [-93.6, 42],
      [-93.6, 42.004],
      [-93.596, 42.004],
      [-93.596, 42],
      [-93.6, 42],
    ];
    const ccwHole = [
      [-93.599, 42.001],
      [-93.598, 42.001],
      [-93.598, 42.002],
      [-93.599, 42.002],
      [-93.599, 42.001],
    ];
    const { features } = normaliseFeatures({ type: 'Polygon', coordinates: [cw, ccwHole] });
    const [outer, hole] = features[0].geometry.coordinates[0];
    expect(ringOrientation(outer)).toBeGreaterThan(0);
    expect(ringOrientation(hole)).toBeLessThan(0);
    // Winding never changes the ellipsoidal area (holes subtracted either way).
    expect(geodesicAreaM2(features[0].geometry)).toBeCloseTo(
      geodesicAreaM2({ type: 'Polygon', coordinates: [cw, ccwHole] }),
      6,
    );
  });

  it('names feature, part, ring and coordinate of a bad coordinate', () => {
    const bad = {
      type: 'FeatureCollection',
      features: [
        {
          type: 'Feature',
          properties: {},
          geometry: {
            type: 'Polygon',
            coordinates: [
              TRIANGLE,
              [
                [0.2, 0.2],
                [0.3, 'x'],
                [0.3, 0.3],
                [0.2, 0.2],
              ],
            ],
          },
        },
      ],
    };
    expect(() => normaliseFeatures(bad)).toThrow(GeoInputError);
    try {
      normaliseFeatures(bad);
    } catch (e) {
      expect((e as GeoInputError).place).toEqual({ feature: 0, ring: 1, coordinate: 1 });
      expect((e as GeoInputError).message).toMatch(/feature 1, hole 1, coordinate 2/);
    }
  });

  it('refuses what is not GeoJSON', () => {
    for (const input of [
      null,
      3,
      'Polygon',
      [],
      {},
      { type: 'Topology' },
      { type: 'FeatureCollection' },
      { type: 'FeatureCollection', features: [1] },
    ]) {
      expect(() => normaliseFeatures(input)).toThrow(GeoInputError);
    }
  });

  it('refuses GeometryCollections nested too deeply', () => {
    let g: object = {
      type: 'Polygon',
      coordinates: [TRIANGLE],
    };
    for (let i = 0; i < 20; i++) g = { type: 'GeometryCollection', geometries: [g] };
    expect(() => normaliseFeatures(g)).toThrow(GeoInputError);
  });

  it('property: any input returns features or throws GeoInputError, nothing else', () => {
    const coord = fc.oneof(
      fc.double(),
      fc.constant(null),
      fc.string({ maxLength: 3 }),
      fc.integer({ min: -200, max: 200 }),
      fc.boolean(),
    );
    const position = fc.array(coord, { maxLength: 4 });
    const geometry = fc.letrec((tie) => ({
      geom: fc.oneof(
        { depthSize: 'small', withCrossShrink: true },
        fc.record({
          type: fc.constantFrom('Polygon', 'MultiPolygon', 'Point', 'LineString', 'MultiPoint', 'Weird'),
          coordinates: fc.oneof(
            fc.array(fc.array(fc.array(position, { maxLength: 6 }), { maxLength: 3 }), { maxLength: 3 }),
            fc.anything(),
          ),
        }),
        fc.record({
          type: fc.constant('GeometryCollection'),
          geometries: fc.array(tie('geom'), { maxLength: 3 }),
        }),
        fc.anything(),
      ),
    })).geom;
    const input = fc.oneof(
      geometry,
      fc.record({ type: fc.constant('Feature'), properties: fc.anything(), geometry }),
      fc.record({
        type: fc.constant('FeatureCollection'),
        features: fc.array(
          fc.oneof(
            fc.record({ type: fc.constant('Feature'), properties: fc.anything(), geometry }),
            fc.anything(),
          ),
          { maxLength: 4 },
        ),
      }),
      fc.anything(),
    );
    fc.assert(
      fc.property(input, (value) => {
        const frozen = JSON.stringify(value);
        try {
          const out = normaliseFeatures(value);
          for (const f of out.features) {
            expect(f.geometry.type).toBe('MultiPolygon');
            for (const ring of f.geometry.coordinates.flat()) {
              expect(ring.length).toBeGreaterThanOrEqual(4);
              for (const p of ring) expect(p.length === 2 && p.every(Number.isFinite)).toBe(true);
            }
          }
        } catch (e) {
          expect(e).toBeInstanceOf(GeoInputError);
        }
        expect(JSON.stringify(value)).toBe(frozen);
      }),
      { numRuns: 600 },
    );
  });
});
