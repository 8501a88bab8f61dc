import { describe, expect, it } from 'vitest';
import type { Polygon } from 'geojson';
import { GeoInputError } from '../../shared/geo/geo-input-error';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import {
  type ValuePoint,
  cellCentre,
  cellCorner,
  idwGrid,
  metresPerDegree,
  planarCentroid,
} from '../../shared/geo/interpolate-idw';
import { ringFromOffsets } from '../../shared/geo/offset-position';

const O: [number, number] = [-93.62, 41.98];
// A 200 × 120 m field with a notch: its shape is our own.
const boundary: Polygon = { type: 'Polygon', coordinates: [ringFromOffsets(O, [[0, 0], [200, 0], [200, 120], [120, 120], [100, 60], [80, 120], [0, 120]])] }; // prettier-ignore
const somePoints: ValuePoint[] = [
  { lon: O[0], lat: O[1], value: 1 },
  { lon: O[0] + 0.002, lat: O[1] + 0.001, value: 3 },
];

describe('metresPerDegree (WGS84)', () => {
  it('gives 2πa/360 m per degree of longitude at the equator (derived) and a(1 − e²)π/180 of latitude', () => {
    const m = metresPerDegree(0);
    expect(m.lon).toBeCloseTo((2 * Math.PI * 6_378_137) / 360, 6); // derived: 111 319.4908 m
    const f = 1 / 298.257223563;
    expect(m.lat).toBeCloseTo((6_378_137 * (1 - f * (2 - f)) * Math.PI) / 180, 6); // derived: 110 574.27 m
    expect(metresPerDegree(60).lon / m.lon).toBeCloseTo(0.5, 2); // about cos 60° (derived, ellipsoid shifts it a little)
  });
});

describe('idwGrid', () => {
  it('lays square cells over the boundary box and values only the cells whose centre is inside', () => {
    const g = idwGrid(somePoints, boundary, { cellSizeM: 10 });
    // Derived: 200 m / 10 m and 120 m / 10 m, plus one when a geodesic heading east bends the box by millimetres.
    expect([20, 21]).toContain(g.cols);
    expect([12, 13]).toContain(g.rows);
    const xs = boundary.coordinates[0].map((p) => p[0]);
    const ys = boundary.coordinates[0].map((p) => p[1]);
    expect(g.cols * g.lonStep).toBeGreaterThanOrEqual(Math.max(...xs) - Math.min(...xs));
    expect((g.cols - 1) * g.lonStep).toBeLessThan(Math.max(...xs) - Math.min(...xs));
    expect(g.rows * g.latStep).toBeGreaterThanOrEqual(Math.max(...ys) - Math.min(...ys));
    expect((g.rows - 1) * g.latStep).toBeLessThan(Math.max(...ys) - Math.min(...ys));
    // The cells are 10 m square on the ground (within the local projection's error).
    const m = metresPerDegree(g.centreLat);
    expect(g.lonStep * m.lon).toBeCloseTo(10, 9);
    expect(g.latStep * m.lat).toBeCloseTo(10, 9);
    const inside = Array.from(g.values).filter(Number.isFinite).length;
    // The notch takes about 40 × 60 / 2 = 1200 m² off 24 000 m² (derived): about 228 of 240 cells.
    expect(inside).toBeGreaterThan(220);
    expect(inside).toBeLessThan(236);
    // Centre-in-cell counting misses or adds a share of the edge cells only: within 1 % here.
    expect(Math.abs((inside * 100) / geodesicAreaM2(boundary) - 1)).toBeLessThan(0.01);
    // A cell in the notch (centre at 100 m east, 115 m north) is outside.
    expect(g.values[11 * g.cols + 10]).toBeNaN();
    expect(cellCorner(g, 0, 0)).toEqual([g.originLon, g.originLat]);
  });

  it('equals the sample at a cell centre that holds a sample', () => {
    const frame = idwGrid(somePoints, boundary, { cellSizeM: 10 });
    const points: ValuePoint[] = [
      [3, 4, 17.5],
      [12, 2, 4.25],
      [18, 9, 11],
    ].map(([c, r, value]) => {
      const [lon, lat] = cellCentre(frame, c, r);
      return { lon, lat, value };
    });
    const g = idwGrid(points, boundary, { cellSizeM: 10, power: 2, maxNeighbours: 3 });
    expect(g.values[4 * g.cols + 3]).toBe(17.5);
    expect(g.values[2 * g.cols + 12]).toBe(4.25);
    expect(g.values[9 * g.cols + 18]).toBe(11);
  });

  it('weights by inverse distance to the power (derived: distances 1 and 2 cells)', () => {
    const frame = idwGrid(somePoints, boundary, { cellSizeM: 10 });
    const at = (c: number, r: number, value: number): ValuePoint => {
      const [lon, lat] = cellCentre(frame, c, r);
      return { lon, lat, value };
    };
    const pts = [at(0, 3, 10), at(3, 3, 40)];
    // Cell (1, 3) is 1 cell from the first and 2 from the second.
    const p1 = idwGrid(pts, boundary, { cellSizeM: 10, power: 1, maxNeighbours: 2 });
    expect(p1.values[3 * p1.cols + 1]).toBeCloseTo((2 * 10 + 40) / 3, 6); // w = 1, 1/2
    const p2 = idwGrid(pts, boundary, { cellSizeM: 10, power: 2, maxNeighbours: 2 });
    expect(p2.values[3 * p2.cols + 1]).toBeCloseTo((4 * 10 + 40) / 5, 6); // w = 1, 1/4
    // With one neighbour, each cell takes its nearest sample.
    const p3 = idwGrid(pts, boundary, { cellSizeM: 10, maxNeighbours: 1 });
    expect(p3.values[3 * p3.cols + 1]).toBe(10);
    expect(p3.values[3 * p3.cols + 2]).toBe(40);
  });

  it('uses the nearest neighbours found through its buckets, as a brute-force search does', () => {
    let seed = 7;
    const rnd = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
    const pts: ValuePoint[] = Array.from({ length: 3000 }, () => ({
      lon: O[0] - 0.0003 + rnd() * 0.003,
      lat: O[1] - 0.0003 + rnd() * 0.0017,
      value: rnd() * 100,
    }));
    const g = idwGrid(pts, boundary, { cellSizeM: 10, power: 2, maxNeighbours: 6 });
    const m = metresPerDegree(g.centreLat);
    for (const [c, r] of [
      [0, 0],
      [5, 7],
      [19, 11],
      [13, 3],
    ]) {
      // prettier-ignore
      const [lon, lat] = cellCentre(g, c, r);
      const near = pts
        .map((p) => ({ d2: ((p.lon - lon) * m.lon) ** 2 + ((p.lat - lat) * m.lat) ** 2, v: p.value }))
        .sort((a, b) => a.d2 - b.d2)
        .slice(0, 6);
      const expected = near.reduce((s, n) => s + n.v / n.d2, 0) / near.reduce((s, n) => s + 1 / n.d2, 0);
      expect(g.values[r * g.cols + c]).toBeCloseTo(expected, 8);
    }
  });

  it('does not mutate its inputs and ignores points without a numeric value or far away', () => {
    const pts: ValuePoint[] = [
      ...somePoints,
      { lon: O[0], lat: O[1], value: NaN },
      { lon: O[0] + 1, lat: O[1], value: 1e9 },
    ];
    const before = structuredClone({ pts, boundary });
    const g = idwGrid(pts, boundary, { cellSizeM: 10 });
    expect({ pts, boundary }).toEqual(before);
    const finite = Array.from(g.values).filter(Number.isFinite);
    expect(Math.max(...finite)).toBeLessThanOrEqual(3);
    expect(Math.min(...finite)).toBeGreaterThanOrEqual(1);
  });

  it('refuses bad options and no usable points with GeoInputError', () => {
    expect(() => idwGrid(somePoints, boundary, { cellSizeM: 0 })).toThrow(GeoInputError);
    expect(() => idwGrid(somePoints, boundary, { cellSizeM: 10, power: -1 })).toThrow(GeoInputError);
    expect(() => idwGrid(somePoints, boundary, { cellSizeM: 10, maxNeighbours: 0 })).toThrow(GeoInputError);
    expect(() => idwGrid(somePoints, boundary, { cellSizeM: 0.01 })).toThrow(GeoInputError); // too many cells
    expect(() => idwGrid([{ lon: 10, lat: 10, value: 1 }], boundary, { cellSizeM: 10 })).toThrow(
      GeoInputError,
    );
  });

  it('projects about the planar centroid of the boundary, holes subtracted', () => {
    const sq = (x0: number, y0: number, s: number) => [[x0, y0], [x0 + s, y0], [x0 + s, y0 + s], [x0, y0 + s], [x0, y0]]; // prettier-ignore
    expect(planarCentroid({ type: 'Polygon', coordinates: [sq(0, 0, 4)] })).toEqual([2, 2]);
    // Derived: a 4 × 4 square minus the 2 × 2 square at its north-east corner: (8 − 3·4/16·…) → (1.667, 1.667).
    const [x, y] = planarCentroid({ type: 'Polygon', coordinates: [sq(0, 0, 4), sq(2, 2, 2).reverse()] });
    expect(x).toBeCloseTo((16 * 2 - 4 * 3) / 12, 12);
    expect(y).toBeCloseTo((16 * 2 - 4 * 3) / 12, 12);
  });
});
