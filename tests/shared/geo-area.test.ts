import { describe, expect, it } from 'vitest';
import geodesic from 'geographiclib-geodesic';
import { area as turfArea } from '@turf/turf';
import type { MultiPolygon, Polygon, Position } from 'geojson';
import { ELLIPSOID_AREA_M2, geodesicAreaM2, ringMeasure } from '../../shared/geo/geodesic-area';
import { ringOrientation, rewindRfc7946, rewindShapefile } from '../../shared/geo/rewind';
import { GeoInputError } from '../../shared/geo/geo-input-error';

const { Geodesic } = geodesic;

/** [lat, lon] pairs to a closed [lon, lat] ring. */
const ringFromLatLon = (pts: [number, number][]): Position[] =>
  [...pts, pts[0]].map(([lat, lon]) => [lon, lat]);
const poly = (...rings: Position[][]): Polygon => ({ type: 'Polygon', coordinates: rings });
const square = (x0: number, y0: number, dx: number, dy: number): Position[] => [
  [x0, y0],
  [x0 + dx, y0],
  [x0 + dx, y0 + dy],
  [x0, y0 + dy],
  [x0, y0],
];

describe('GeographicLib on WGS84 (reference answers)', () => {
  it('reproduces the Karney (2013) inverse problem', () => {
    // DOMAIN.md §2, Karney (2013) J. Geodesy 87: (−30°, 0°) → (29.9°, 179.8°)
    const r = Geodesic.WGS84.Inverse(-30, 0, 29.9, 179.8);
    expect(r.s12).toBeCloseTo(19_989_832.82761, 4);
    expect(r.azi1).toBeCloseTo(161.89052473633, 10);
    expect(r.azi2).toBeCloseTo(18.09073724574, 10);
  });

  it('reproduces Wellington → Salamanca', () => {
    // DOMAIN.md §2, GeographicLib documentation: 19 959 679.267 m (printed to 3 decimals)
    const r = Geodesic.WGS84.Inverse(-41.32, 174.81, 40.96, -5.5);
    expect(Math.abs(r.s12! - 19_959_679.267)).toBeLessThanOrEqual(0.0005);
  });

  it('measures the Antarctica polygon of the planimeter example', () => {
    // Vertices [lat, lon]: GeographicLib JavaScript documentation, "Measuring areas" (18 vertices).
    // DOMAIN.md §2: perimeter 16 831 067.893 m, area 13 662 703 680 020.1 m² (printed to their decimals).
    const antarctica: [number, number][] = [
      [-63.1, -58], [-72.9, -74], [-71.9, -102], [-74.9, -102], [-74.3, -131], [-77.5, -163],
      [-77.4, 163], [-71.7, 172], [-65.9, 140], [-65.7, 113], [-66.6, 88], [-66.9, 59],
      [-69.8, 25], [-70.0, -4], [-71.0, -14], [-77.3, -33], [-77.9, -46], [-74.7, -61],
    ]; // prettier-ignore
    const ring = ringFromLatLon(antarctica);
    const m = ringMeasure(ring);
    expect(Math.abs(m.perimeterM - 16_831_067.893)).toBeLessThanOrEqual(0.0005);
    expect(Math.abs(m.areaM2 - 13_662_703_680_020.1)).toBeLessThanOrEqual(0.05);
    expect(Math.abs(geodesicAreaM2(poly(ring)) - 13_662_703_680_020.1)).toBeLessThanOrEqual(0.05);
  });

  it('measures the diamond of the test suite in either winding', () => {
    // DOMAIN.md §2, GeographicLib test suite (Planimeter0): (0,−1) (−1,0) (0,1) (1,0) [lat, lon] → 24 619 419 146 m²
    const ring = ringFromLatLon([[0, -1], [-1, 0], [0, 1], [1, 0]]); // prettier-ignore
    expect(Math.abs(geodesicAreaM2(poly(ring)) - 24_619_419_146)).toBeLessThanOrEqual(1);
    expect(Math.abs(geodesicAreaM2(poly([...ring].reverse())) - 24_619_419_146)).toBeLessThanOrEqual(1);
    expect(ringMeasure(ring).areaM2).toBeGreaterThan(0);
    expect(ringMeasure([...ring].reverse()).areaM2).toBeLessThan(0);
  });

  it('knows the area of the whole ellipsoid', () => {
    // DOMAIN.md §2, GeographicLib test suite (Planimeter15): 510 065 621 724 088.5093 m²
    // A double near 5.1e14 m² is spaced 0.0625 m² apart, so the printed .5093 is written as .5; allow two steps.
    expect(Math.abs(ELLIPSOID_AREA_M2 - 510_065_621_724_088.5)).toBeLessThanOrEqual(0.125);
    // Same suite: the triangle (2,1) (1,2) (3,3) [lat, lon] is 18 454 562 325.45119 m², and the polygon area
    // class measures its complement reversed as ellipsoid − triangle.
    const p = Geodesic.WGS84.Polygon(false);
    [[2, 1], [1, 2], [3, 3]].forEach(([lat, lon]) => p.AddPoint(lat, lon)); // prettier-ignore
    const complement = p.Compute(true, false).area!;
    const tri = geodesicAreaM2(poly(ringFromLatLon([[2, 1], [1, 2], [3, 3]]))); // prettier-ignore
    expect(Math.abs(tri - 18_454_562_325.45119)).toBeLessThanOrEqual(0.5);
    expect(Math.abs(tri + complement - ELLIPSOID_AREA_M2)).toBeLessThanOrEqual(0.5);
  });
});

// DOMAIN.md §2: ½-mile squares (160 ac nominal), [lon, lat], counter-clockwise; ellipsoidal m² and Turf 7 offset.
const SQUARES = [
  { lat0: 0, dx: 0.0072285, dy: 0.0072772, m2: 647_497.074, turf: 0.449 },
  { lat0: 30, dx: 0.0083401, dy: 0.0072589, m2: 647_496.368, turf: 0.113 },
  { lat0: 45, dx: 0.0102062, dy: 0.0072407, m2: 647_500.456, turf: -0.222 },
  { lat0: 52, dx: 0.0117175, dy: 0.0072319, m2: 647_497.574, turf: -0.384 },
  { lat0: 60, dx: 0.0144222, dy: 0.0072225, m2: 647_499.247, turf: -0.557 },
];

// WGS84 (NGA TR8350.2): a and 1/f; e² = f(2 − f) (derived). Turf 7 earth radius 6 371 008.8 m (DOMAIN.md §2).
const A = 6_378_137;
const F = 1 / 298.257223563;
const E2 = F * (2 - F);
const TURF_R = 6_371_008.8;
/** DOMAIN.md §2: Turf's spherical area over the ellipsoidal one at latitude φ ≈ R²(1 − e² sin²φ)²/(a²(1 − e²)). */
const turfRatio = (latDeg: number) => {
  const s = Math.sin((latDeg * Math.PI) / 180);
  return (TURF_R ** 2 * (1 - E2 * s * s) ** 2) / (A ** 2 * (1 - E2));
};

describe('geodesicAreaM2 on field-sized squares', () => {
  for (const sq of SQUARES) {
    it(`gives the ellipsoidal area at ${sq.lat0}° within 0.01 m² (DOMAIN.md §2)`, () => {
      const g = poly(square(10, sq.lat0, sq.dx, sq.dy));
      expect(Math.abs(geodesicAreaM2(g) - sq.m2)).toBeLessThanOrEqual(0.01);
    });

    it(`agrees with Turf at ${sq.lat0}° by the latitude formula ± 0.002 %`, () => {
      const g = poly(square(10, sq.lat0, sq.dx, sq.dy));
      const ratio = turfArea(g) / geodesicAreaM2(g);
      const mid = sq.lat0 + sq.dy / 2;
      expect(Math.abs(ratio - turfRatio(mid))).toBeLessThanOrEqual(0.00002);
      // DOMAIN.md §2 table prints the offset to 0.001 %
      expect(Math.abs((ratio - 1) * 100 - sq.turf)).toBeLessThanOrEqual(0.0005 + 1e-9);
    });
  }

  it('never differs from Turf by more than 0.6 % between 60° S and 60° N (DOMAIN.md §2)', () => {
    for (let lat = -60; lat <= 60; lat += 5) {
      const dy = 0.0072;
      const base = lat >= 0 ? lat : lat - dy; // keep the square within ±60°
      const g = poly(square(-93, base, 0.01, dy));
      const ratio = turfArea(g) / geodesicAreaM2(g);
      expect(Math.abs(ratio - 1)).toBeLessThan(0.006);
      expect(Math.abs(ratio - turfRatio(base + dy / 2))).toBeLessThanOrEqual(0.00002);
    }
  });

  it('subtracts holes, accepts either winding and sums MultiPolygon parts', () => {
    const sq = SQUARES[3];
    const outer = square(10, sq.lat0, sq.dx, sq.dy);
    const hole = square(10 + sq.dx / 4, sq.lat0 + sq.dy / 4, sq.dx / 2, sq.dy / 2);
    const holeArea = geodesicAreaM2(poly(hole));
    const withHole = geodesicAreaM2(poly(outer, hole));
    expect(withHole).toBeCloseTo(geodesicAreaM2(poly(outer)) - holeArea, 6);
    expect(holeArea / sq.m2).toBeGreaterThan(0.24); // about a quarter (derived)
    expect(holeArea / sq.m2).toBeLessThan(0.26);
    // Clockwise exterior, counter-clockwise hole (shapefile winding): same answer.
    expect(geodesicAreaM2(poly([...outer].reverse(), [...hole].reverse()))).toBeCloseTo(withHole, 6);
    // An unclosed ring is closed implicitly.
    expect(geodesicAreaM2(poly(outer.slice(0, 4)))).toBeCloseTo(sq.m2, 2);
    const multi: MultiPolygon = {
      type: 'MultiPolygon',
      coordinates: [[outer, hole], [square(11, sq.lat0, sq.dx, sq.dy)]],
    };
    expect(geodesicAreaM2(multi)).toBeCloseTo(
      withHole + geodesicAreaM2(poly(square(11, sq.lat0, sq.dx, sq.dy))),
      6,
    );
  });

  it('does not mutate its input', () => {
    const g = poly([...square(10, 52, 0.01, 0.01)].reverse());
    const before = structuredClone(g);
    geodesicAreaM2(g);
    expect(g).toEqual(before);
  });
});

describe('rewind', () => {
  const outerCw = [...square(10, 52, 0.01, 0.01)].reverse();
  const holeCcw = square(10.002, 52.002, 0.002, 0.002);
  const g: Polygon = poly(outerCw, holeCcw);

  it('winds exterior counter-clockwise and holes clockwise for RFC 7946', () => {
    const before = structuredClone(g);
    const r = rewindRfc7946(g);
    expect(ringOrientation(r.coordinates[0])).toBeGreaterThan(0);
    expect(ringOrientation(r.coordinates[1])).toBeLessThan(0);
    expect(g).toEqual(before); // input untouched
    expect(r.coordinates[0]).not.toBe(g.coordinates[0]);
    expect(geodesicAreaM2(r)).toBeCloseTo(geodesicAreaM2(g), 6);
  });

  it('winds exterior clockwise and holes counter-clockwise for shapefiles, and keeps MultiPolygon shape', () => {
    const m: MultiPolygon = {
      type: 'MultiPolygon',
      coordinates: [rewindRfc7946(g).coordinates, [square(11, 52, 0.01, 0.01)]],
    };
    const before = structuredClone(m);
    const r = rewindShapefile(m);
    expect(r.type).toBe('MultiPolygon');
    expect(ringOrientation(r.coordinates[0][0])).toBeLessThan(0);
    expect(ringOrientation(r.coordinates[0][1])).toBeGreaterThan(0);
    expect(ringOrientation(r.coordinates[1][0])).toBeLessThan(0);
    expect(m).toEqual(before);
    // Rewinding twice returns the original RFC 7946 form.
    expect(rewindRfc7946(r)).toEqual(before);
  });
});

describe('GeoInputError', () => {
  it('names the place of the problem', () => {
    const e = new GeoInputError('Latitude is not a number', { feature: 2, ring: 1, coordinate: 16 });
    expect(e).toBeInstanceOf(Error);
    expect(e.code).toBe('geo_input');
    expect(e.place).toEqual({ feature: 2, ring: 1, coordinate: 16 });
    expect(e.message).toContain('feature 3');
    expect(e.message).toContain('hole 1');
    expect(e.message).toContain('coordinate 17');
  });
});
