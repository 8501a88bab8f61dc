import { describe, expect, it } from 'vitest';

// Each pipeline run clips polygons with Turf (a second or so on a busy machine): allow the time.
const SLOW = { timeout: 60_000 };
import type { MultiPolygon } from 'geojson';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { GeoInputError } from '../../shared/geo/geo-input-error';
import { offsetPosition, ringFromOffsets } from '../../shared/geo/offset-position';
import { ringOrientation } from '../../shared/geo/rewind';
import type { ValuePoint } from '../../shared/geo/interpolate-idw';
import { findOverlaps } from '../../shared/geo/zone-ops';
import { zonesFromPoints } from '../../shared/geo/zones-from-points';

const O: [number, number] = [-93.62, 41.98];
// About 11 ha: an irregular field of our own with a wet hollow (a hole) in it.
const boundary: MultiPolygon = {
  type: 'MultiPolygon',
  coordinates: [
    [
      ringFromOffsets(O, [[0, 0], [410, -15], [440, 150], [395, 290], [40, 280], [-20, 140]]),
      ringFromOffsets(O, [[150, 100], [150, 160], [230, 160], [230, 100]]).reverse(),
    ],
  ],
}; // prettier-ignore

/** A sample every `step` metres over the field's box: value from `f(east, north)`. Deterministic. */
function samples(step: number, f: (e: number, n: number) => number): ValuePoint[] {
  const out: ValuePoint[] = [];
  for (let e = -30; e <= 450; e += step) {
    for (let n = -30; n <= 300; n += step) {
      const [lon, lat] = offsetPosition(O, e, n);
      out.push({ lon, lat, value: f(e, n) });
    }
  }
  return out;
}

const twoHalves = samples(8, (e) => (e < 200 ? 10 : 20));
const noisy = samples(6, (e, n) => 5 + e / 100 + Math.sin(e * 7.3 + n * 3.1) * 1.5);
const sum = (zs: { areaM2: number }[]) => zs.reduce((s, z) => s + z.areaM2, 0);

describe('zonesFromPoints', () => {
  it('zone areas add up to the boundary area within 0.1 % (cells clipped to the boundary)', SLOW, () => {
    for (const method of ['quantile', 'jenks', 'kmeans'] as const) {
      const r = zonesFromPoints(noisy, boundary, {
        classes: 4,
        method,
        cellSizeM: method === 'jenks' ? 5 : 8,
        minAreaM2: 300,
      });
      expect(Math.abs(sum(r.zones) / geodesicAreaM2(boundary) - 1)).toBeLessThan(0.001);
      for (const z of r.zones) expect(z.areaM2).toBeCloseTo(geodesicAreaM2(z.geometry), 6);
      // Zones do not overlap one another.
      const features = r.zones.map((z) => ({
        type: 'Feature' as const,
        properties: { id: String(z.classIndex) },
        geometry: z.geometry,
      }));
      expect(findOverlaps(features)).toEqual([]);
    }
  });

  it('splits a field of two values into a low west zone and a high east zone', SLOW, () => {
    const r = zonesFromPoints(twoHalves, boundary, {
      classes: 2,
      method: 'jenks',
      cellSizeM: 5,
      minAreaM2: 100,
    });
    expect(r.zones.map((z) => z.classIndex)).toEqual([0, 1]);
    const [low, high] = r.zones;
    expect(low.meanValue).toBeGreaterThanOrEqual(10);
    expect(low.meanValue).toBeLessThan(11);
    expect(high.meanValue).toBeGreaterThan(19);
    expect(high.meanValue).toBeLessThanOrEqual(20);
    expect(r.breaks).toHaveLength(1);
    // Derived: the dividing line is east = 200 m; the west part of the field is a little under half of it.
    const share = low.areaM2 / sum(r.zones);
    expect(share).toBeGreaterThan(0.4);
    expect(share).toBeLessThan(0.55);
    for (const z of r.zones) {
      for (const rings of z.geometry.coordinates) {
        expect(ringOrientation(rings[0])).toBeGreaterThan(0);
        rings.slice(1).forEach((h) => expect(ringOrientation(h)).toBeLessThan(0));
      }
    }
  });

  it('dissolves fragments: a larger minimum gives fewer polygons, and a huge one a single zone', SLOW, () => {
    const parts = (min: number) =>
      zonesFromPoints(noisy, boundary, {
        classes: 5,
        method: 'quantile',
        cellSizeM: 5,
        minAreaM2: min,
      }).zones.reduce((s, z) => s + z.geometry.coordinates.length, 0);
    const fine = parts(0);
    const coarse = parts(2000);
    expect(coarse).toBeLessThan(fine);
    const one = zonesFromPoints(noisy, boundary, {
      classes: 5,
      method: 'quantile',
      cellSizeM: 5,
      minAreaM2: 1e9,
    });
    expect(one.zones).toHaveLength(1);
    expect(Math.abs(one.zones[0].areaM2 / geodesicAreaM2(boundary) - 1)).toBeLessThan(0.001);
  });

  it(
    'describes the classing: breaks inside the value range and a histogram of every valued cell',
    SLOW,
    () => {
      const r = zonesFromPoints(noisy, boundary, {
        classes: 4,
        method: 'quantile',
        cellSizeM: 10,
        minAreaM2: 0,
        histogramBins: 12,
      });
      expect(r.breaks).toHaveLength(3);
      expect(r.histogram.counts).toHaveLength(12);
      r.breaks.forEach((b) => {
        expect(b).toBeGreaterThan(r.histogram.min);
        expect(b).toBeLessThan(r.histogram.max);
      });
      // Quantile classes hold about a quarter of the cells each: their areas are close (derived, within edge effects).
      const total = sum(r.zones);
      for (const z of r.zones) expect(z.areaM2 / total).toBeGreaterThan(0.15);
      const cells = r.histogram.counts.reduce((s, c) => s + c, 0);
      expect(Math.abs((cells * 100) / geodesicAreaM2(boundary) - 1)).toBeLessThan(0.03);
    },
  );

  it('refuses a cell size larger than the field with GeoInputError', () => {
    const tiny: MultiPolygon = { type: 'MultiPolygon', coordinates: [[ringFromOffsets(O, [[0, 0], [3, 0], [3, 3], [0, 3]])]] }; // prettier-ignore
    expect(() =>
      zonesFromPoints(twoHalves.slice(0, 50), tiny, {
        classes: 2,
        method: 'quantile',
        cellSizeM: 50,
        minAreaM2: 0,
      }),
    ).toThrow(GeoInputError);
  });

  it('does not mutate its inputs', SLOW, () => {
    const pts = twoHalves.slice(0, 4000);
    const before = structuredClone({ pts, boundary });
    zonesFromPoints(pts, boundary, { classes: 3, method: 'kmeans', cellSizeM: 10, minAreaM2: 500 });
    expect({ pts, boundary }).toEqual(before);
  });
});
