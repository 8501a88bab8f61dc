import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import * as turf from '@turf/turf';
import type { MultiPolygon, Position } from 'geojson';
import { GeoInputError } from '../../shared/geo/geo-input-error';
import { type GridFrame, cellCentre } from '../../shared/geo/grid-frame';
import { offsetPosition } from '../../shared/geo/offset-position';
import {
  IN_FIELD_NO_ZONE,
  MAX_RATE_GRID_CELLS,
  OUT_OF_FIELD,
  cellCoverage,
  gridCellFeatures,
  rateGrid,
  rateGridFrame,
} from '../../shared/geo/rate-grid';

/** A rectangle [lon, lat] from its west, south, east and north edges, counter-clockwise. */
const rect = (w: number, s: number, e: number, n: number): Position[] => [
  [w, s],
  [e, s],
  [e, n],
  [w, n],
  [w, s],
];
const multi = (...polys: Position[][][]): MultiPolygon => ({ type: 'MultiPolygon', coordinates: polys });

/** Twice the signed planar area of a ring (shoelace; derived). */
function shoelace(ring: Position[]): number {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++) s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return s;
}

/**
 * Share of a cell inside a polygon by an independent method: Turf's polygon clipping (polyclip-ts) of the cell
 * rectangle, areas in the lon/lat plane by the shoelace formula.
 */
function clippedShare(frame: GridFrame, col: number, row: number, rings: Position[][]): number {
  const [w, s] = [frame.originLon + col * frame.lonStep, frame.originLat + row * frame.latStep];
  const cell = turf.polygon([rect(w, s, w + frame.lonStep, s + frame.latStep)]);
  const clip = turf.intersect(turf.featureCollection([cell, turf.polygon(rings)]));
  if (!clip) return 0;
  const polys = clip.geometry.type === 'Polygon' ? [clip.geometry.coordinates] : clip.geometry.coordinates;
  const planar = polys.reduce(
    (sum, poly) =>
      sum + poly.reduce((a, ring, i) => a + ((i === 0 ? 1 : -1) * Math.abs(shoelace(ring))) / 2, 0),
    0,
  );
  return planar / (frame.lonStep * frame.latStep);
}

const unitFrame = (cols: number, rows: number): GridFrame => ({
  originLon: 0,
  originLat: 0,
  lonStep: 1,
  latStep: 1,
  cols,
  rows,
});

describe('cellCoverage', () => {
  it('gives a half for every cell the diagonal of a right triangle cuts, one below it, nothing above', () => {
    const share = cellCoverage(unitFrame(5, 5), {
      type: 'Polygon',
      coordinates: [
        [
          [0, 0],
          [4, 0],
          [0, 4],
          [0, 0],
        ],
      ],
    });
    for (let row = 0; row < 5; row++) {
      for (let col = 0; col < 5; col++) {
        // Derived: the line x + y = 4 runs through cell corners, halving the cells with col + row = 3.
        const want = col + row < 3 ? 1 : col + row === 3 ? 0.5 : 0;
        expect(share[row * 5 + col], `cell ${col},${row}`).toBeCloseTo(want, 12);
      }
    }
  });

  it('agrees with Turf clipping for an odd shape with a hole, wound either way, reaching past the grid', () => {
    const frame: GridFrame = { originLon: 10, originLat: 50, lonStep: 0.5, latStep: 0.25, cols: 6, rows: 8 };
    const outer: Position[] = [
      [9.7, 49.9],
      [12.4, 50.3],
      [12.1, 52.2],
      [10.9, 51.1],
      [10.2, 52.05],
      [9.7, 49.9],
    ];
    const hole: Position[] = [
      [10.6, 50.4],
      [11.3, 50.6],
      [11.0, 51.0],
      [10.6, 50.4],
    ];
    const rings = [outer, hole];
    // Clockwise exterior and counter-clockwise hole: the reverse of RFC 7946.
    const shape = { type: 'Polygon' as const, coordinates: [[...outer].reverse(), [...hole].reverse()] };
    expect(Math.sign(shoelace(shape.coordinates[0]))).toBe(-1);
    const share = cellCoverage(frame, shape);
    for (let row = 0; row < frame.rows; row++) {
      for (let col = 0; col < frame.cols; col++) {
        // Both exact for straight edges: only round-off differs.
        expect(Math.abs(share[row * frame.cols + col] - clippedShare(frame, col, row, rings))).toBeLessThan(
          1e-9,
        );
      }
    }
  });

  it('adds up to the planar area of any triangle inside the grid (shoelace)', () => {
    const pt = fc.tuple(
      fc.double({ min: 0, max: 7, noNaN: true }),
      fc.double({ min: 0, max: 5, noNaN: true }),
    );
    fc.assert(
      fc.property(pt, pt, pt, (a, b, c) => {
        const ring = [a, b, c, a];
        const share = cellCoverage(unitFrame(7, 5), { type: 'Polygon', coordinates: [ring] });
        const total = share.reduce((s, v) => s + v, 0);
        expect(total).toBeCloseTo(Math.abs(shoelace(ring)) / 2, 9);
      }),
      { numRuns: 200 },
    );
  });
});

/*
 * An invented field: a 400 m × 300 m rectangle in lon/lat near (−93.6, 42.0). Zone A is its west part up to
 * 213 m east, zone B the rest south of 200 m; the north-east corner is in no zone (default rate).
 */
const O: [number, number] = [-93.6, 42.0];
const E = offsetPosition(O, 400, 0)[0];
const N = offsetPosition(O, 0, 300)[1];
const X213 = offsetPosition(O, 213, 0)[0];
const Y200 = offsetPosition(O, 0, 200)[1];
const boundary = multi([rect(O[0], O[1], E, N)]);
const zoneA = multi([rect(O[0], O[1], X213, N)]);
const zoneB = multi([rect(X213, O[1], E, Y200)]);
const RATE_A = 8.4;
const RATE_B = 7.1;
const DEFAULT = 6;
const OUTSIDE = 0;
const input = (cellSizeM: number) => ({
  boundary,
  zones: [
    { name: 'A', rateSi: RATE_A, geometry: zoneA },
    { name: 'B', rateSi: RATE_B, geometry: zoneB },
  ],
  defaultRateSi: DEFAULT,
  outOfFieldRateSi: OUTSIDE,
  cellSizeM,
});

describe('rateGrid on a field of two rectangle zones', () => {
  // 7 m cells: the zone lines (213 m, 200 m) and the field's east and north sides cut cells off the middle.
  const g = rateGrid(input(7));
  // The cell crossed by both zone lines: floor(213 / 7), floor(200 / 7) (derived).
  const CORNER_COL = 30;
  const CORNER_ROW = 28;

  it('lays square cells from the south-west corner over the field', () => {
    expect(g.minLon).toBe(O[0]);
    expect(g.minLat).toBe(O[1]);
    // Derived: ceil(400 / 7) = 58 columns, ceil(300 / 7) = 43 rows.
    expect(g.columns).toBe(58);
    expect(g.rows).toBe(43);
    expect(g.rates.length).toBe(58 * 43);
    expect(g.zoneIndex.length).toBe(58 * 43);
    // Square: 7 m both ways at the centre latitude, measured on the ellipsoid (GeographicLib).
    const mid = O[1] + (g.rows * g.cellLatDeg) / 2;
    const east = offsetPosition([O[0], mid], 7, 0)[0] - O[0];
    const north = offsetPosition([O[0], mid], 0, 7)[1] - mid;
    expect(g.cellLonDeg / east).toBeCloseTo(1, 4);
    expect(g.cellLatDeg / north).toBeCloseTo(1, 4);
  });

  it('counts a cell in the field when most of it is inside the boundary', () => {
    const inside = g.zoneIndex.filter((z) => z !== OUT_OF_FIELD).length;
    // Derived: the last column holds 400 − 57 × 7 = 1 m of field (out), the last row 300 − 42 × 7 = 6 m (in).
    expect(inside).toBe(57 * 43);
    expect(gridCellFeatures(g, ['A', 'B']).length).toBe(inside);
  });

  it('gives each cell the rate of the zone holding its centre, the default rate in no zone, the out-of-field rate outside', () => {
    const frame = rateGridFrame(g);
    const seen = new Set<number>();
    for (let row = 0; row < g.rows; row++) {
      for (let col = 0; col < g.columns; col++) {
        const [lon, lat] = cellCentre(frame, col, row);
        const want = lon > E || lat > N ? OUTSIDE : lon < X213 ? RATE_A : lat < Y200 ? RATE_B : DEFAULT;
        const i = row * g.columns + col;
        if (col === CORNER_COL && row === CORNER_ROW) continue;
        expect(g.rates[i], `cell ${col},${row}`).toBe(want);
        seen.add(g.zoneIndex[i]);
      }
    }
    expect([...seen].sort()).toEqual([OUT_OF_FIELD, IN_FIELD_NO_ZONE, 0, 1].sort());
  });

  it('gives the cell where both zone lines meet to the largest of its three parts', () => {
    // Derived: the cell holds 213 − 30 × 7 = 3 m of A across its whole height (3/7 = 43 %), and east of it
    // 4/7 × 4/7 = 33 % of B (south of 200 m, 200 − 28 × 7 = 4 m) and 4/7 × 3/7 = 24 % of no zone.
    const i = CORNER_ROW * g.columns + CORNER_COL;
    expect(g.zoneIndex[i]).toBe(0);
    expect(g.rates[i]).toBe(RATE_A);
  });

  it('names each cell feature after its zone, counter-clockwise, cells only inside the field', () => {
    const features = gridCellFeatures(g, ['A', 'B'], 'Rest');
    const byZone = new Map<string, number>();
    for (const f of features) {
      byZone.set(f.properties.zone, (byZone.get(f.properties.zone) ?? 0) + 1);
      expect(shoelace(f.geometry.coordinates[0])).toBeGreaterThan(0);
      expect(f.properties.rateSi).toBe(
        { A: RATE_A, B: RATE_B, Rest: DEFAULT }[f.properties.zone as 'A' | 'B' | 'Rest'],
      );
    }
    // Derived: 213 / 7 = 30.4 → 30 columns of A; 200 / 7 = 28.6 → 29 rows of B over 57 − 30 = 27 columns.
    // The corner cell where both lines meet goes to A (next test).
    expect(Object.fromEntries(byZone)).toEqual({ A: 30 * 43 + 1, B: 27 * 29 - 1, Rest: 27 * (43 - 29) });
  });

  it('gives a cell to the zone covering most of it even when its centre lies in another', () => {
    // One 50 m cell: zone P (36 %) holds its centre through a notch, zone Q covers the other 64 %.
    const [e, n] = offsetPosition(O, 50, 50);
    const at = (x: number, y: number) => [O[0] + x * (e - O[0]), O[1] + y * (n - O[1])];
    const p = [
      at(0, 0),
      at(0.3, 0),
      at(0.3, 0.4),
      at(0.6, 0.4),
      at(0.6, 0.6),
      at(0.3, 0.6),
      at(0.3, 1),
      at(0, 1),
      at(0, 0),
    ];
    const q = [
      at(0.3, 0),
      at(1, 0),
      at(1, 1),
      at(0.3, 1),
      at(0.3, 0.6),
      at(0.6, 0.6),
      at(0.6, 0.4),
      at(0.3, 0.4),
      at(0.3, 0),
    ];
    expect(turf.booleanPointInPolygon(at(0.5, 0.5), turf.polygon([p]))).toBe(true);
    const one = rateGrid({
      boundary: multi([rect(O[0], O[1], e, n)]),
      zones: [
        { name: 'P', rateSi: 1, geometry: multi([p]) },
        { name: 'Q', rateSi: 2, geometry: multi([q]) },
      ],
      defaultRateSi: 0,
      outOfFieldRateSi: 0,
      cellSizeM: 60,
    });
    expect(one.columns * one.rows).toBe(1);
    expect(one.zoneIndex[0]).toBe(1);
    expect(one.rates[0]).toBe(2);
  });

  it(`refuses more than ${MAX_RATE_GRID_CELLS} cells, telling the user to choose larger cells`, () => {
    const big = multi([rect(O[0], O[1], offsetPosition(O, 3000, 0)[0], offsetPosition(O, 0, 3000)[1])]);
    // 3 km / 2 m = 1500 per side: 2 250 000 cells (derived).
    const attempt = () => rateGrid({ ...input(2), boundary: big, zones: [] });
    expect(attempt).toThrow(GeoInputError);
    expect(attempt).toThrow(/2,250,000 cells.*choose larger cells \(3 m or more\)/);
    expect(() => rateGrid({ ...input(2.2), boundary: big, zones: [] })).not.toThrow();
    expect(() => rateGrid(input(0))).toThrow(/positive number of metres/);
  });
});
