import { describe, expect, it } from 'vitest';
import geodesic from 'geographiclib-geodesic';
import { offsetPosition, ringFromOffsets } from '../../shared/geo/offset-position';

const { Geodesic } = geodesic;

describe('offsetPosition', () => {
  it('lands the stated distance away on the WGS84 ellipsoid', () => {
    const origin: [number, number] = [-93.6, 42];
    const [lon, lat] = offsetPosition(origin, 804.672, 0); // half a mile east (NIST: 1 mi = 1609.344 m)
    const inv = Geodesic.WGS84.Inverse(origin[1], origin[0], lat, lon);
    expect(inv.s12).toBeCloseTo(804.672, 6);
    expect(lat).toBeLessThan(42); // a geodesic heading east bends south of the parallel in the north
  });

  it('reproduces Karney (2013) inverse check value through Direct', () => {
    // Karney (2013), J. Geodesy 87: (-30, 0) → (29.9, 179.8), s12 = 19 989 832.82761 m, α1 = 161.89052473633°
    const r = Geodesic.WGS84.Direct(-30, 0, 161.89052473633, 19_989_832.82761);
    expect(r.lat2).toBeCloseTo(29.9, 8);
    expect(r.lon2).toBeCloseTo(179.8, 8);
  });

  it('closes rings and rounds to 7 decimals', () => {
    const ring = ringFromOffsets(
      [-93.6, 42],
      [
        [0, 0],
        [100, 0],
        [100, 100],
      ],
    );
    expect(ring).toHaveLength(4);
    expect(ring[3]).toEqual(ring[0]);
    for (const [x, y] of ring) {
      expect(Math.round(x * 1e7) / 1e7).toBe(x);
      expect(Math.round(y * 1e7) / 1e7).toBe(y);
    }
  });
});
