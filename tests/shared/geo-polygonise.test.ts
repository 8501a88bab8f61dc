/**
 * Polygonising classed grids and dissolving small fragments. Golden fixtures live in
 * fixtures/geo/polygonise-classes/<case>/{in,out}.json; run
 * `REGEN=1 npm test -- --project shared tests/shared/geo-polygonise.test.ts` to rewrite the out files on
 * purpose (then read the diff). Coordinates compare at 7 decimals, areas at 0.01 m².
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { MultiPolygon } from 'geojson';
import { geodesicAreaM2 } from '../../shared/geo/geodesic-area';
import { type GridFrame, cellCorner } from '../../shared/geo/grid-frame';
import { metresPerDegree } from '../../shared/geo/interpolate-idw';
import {
  type ClassPart,
  dissolveSmall,
  dissolveSmallCells,
  polygoniseClasses,
} from '../../shared/geo/polygonise-classes';
import { ringOrientation } from '../../shared/geo/rewind';
import { findOverlaps } from '../../shared/geo/zone-ops';
import { goldenCases } from './geo-golden';

type Input = { op: string; grid: GridFrame; classOf: number[]; boundary: MultiPolygon; minAreaM2?: number };
const withAreas = (parts: ClassPart[]) => parts.map((p) => ({ ...p, areaM2: geodesicAreaM2(p.geometry) }));

describe('polygonise-classes golden fixtures', () => {
  goldenCases('polygonise-classes', (raw) => {
    const i = raw as unknown as Input;
    const parts = polygoniseClasses(i.grid, Int32Array.from(i.classOf), i.boundary);
    return withAreas(i.op === 'dissolve' ? dissolveSmall(parts, i.minAreaM2!) : parts);
  });
});

const m = metresPerDegree(41.98);
const frame = (cols: number, rows: number, cell = 10): GridFrame => ({
  originLon: -93.62,
  originLat: 41.98,
  lonStep: cell / m.lon,
  latStep: cell / m.lat,
  cols,
  rows,
});
const extent = (f: GridFrame): MultiPolygon => {
  const [w, s] = cellCorner(f, 0, 0);
  const [e, n] = cellCorner(f, f.cols, f.rows);
  return { type: 'MultiPolygon', coordinates: [[[[w, s], [e, s], [e, n], [w, n], [w, s]]]] }; // prettier-ignore
};

describe('polygoniseClasses', () => {
  it('turns a 3 × 3 raster with a centre cell of another class into a ring with a hole and a single square', () => {
    const f = frame(3, 3);
    const before = Int32Array.from([0, 0, 0, 0, 1, 0, 0, 0, 0]);
    const classOf = Int32Array.from(before);
    const parts = polygoniseClasses(f, classOf, extent(f));
    expect(classOf).toEqual(before); // not mutated
    expect(parts.map((p) => p.classIndex).sort()).toEqual([0, 1]);
    const outer = parts.find((p) => p.classIndex === 0)!.geometry;
    const centre = parts.find((p) => p.classIndex === 1)!.geometry;
    expect(outer.coordinates).toHaveLength(1);
    expect(outer.coordinates[0]).toHaveLength(2); // exterior and one hole
    expect(centre.coordinates).toEqual([[expect.any(Array)]]);
    // Derived: the hole and the square are both the centre cell, corners (1, 1)–(2, 2) of the lattice.
    const corners = (ring: number[][]) =>
      ring
        .slice(0, -1)
        .map(([x, y]) => `${x.toFixed(8)},${y.toFixed(8)}`)
        .sort();
    const cell = [
      cellCorner(f, 1, 1),
      cellCorner(f, 2, 1),
      cellCorner(f, 2, 2),
      cellCorner(f, 1, 2),
      cellCorner(f, 1, 1),
    ];
    expect(corners(outer.coordinates[0][1])).toEqual(corners(cell));
    expect(corners(centre.coordinates[0][0])).toEqual(corners(cell));
    expect(corners(outer.coordinates[0][0])).toEqual(
      corners([
        cellCorner(f, 0, 0),
        cellCorner(f, 3, 0),
        cellCorner(f, 3, 3),
        cellCorner(f, 0, 3),
        cellCorner(f, 0, 0),
      ]),
    );
    // RFC 7946 winding.
    expect(ringOrientation(outer.coordinates[0][0])).toBeGreaterThan(0);
    expect(ringOrientation(outer.coordinates[0][1])).toBeLessThan(0);
    expect(ringOrientation(centre.coordinates[0][0])).toBeGreaterThan(0);
    // Areas: 8 cells and 1 cell of 10 m × 10 m (derived; the local projection is exact to about 1e-4 here).
    expect(geodesicAreaM2(outer) / 800).toBeCloseTo(1, 3);
    expect(geodesicAreaM2(centre) / 100).toBeCloseTo(1, 3);
  });

  it('keeps cells of one class that touch only at a corner apart (4-connectivity)', () => {
    const f = frame(2, 2);
    const parts = polygoniseClasses(f, Int32Array.from([0, 1, 1, 0]), extent(f));
    expect(parts).toHaveLength(4);
  });

  it('covers the whole boundary, edge cells included, for a boundary that cuts cells', () => {
    const f = frame(8, 6);
    const [w, s] = cellCorner(f, 0.3, 0.4);
    const [e, n] = cellCorner(f, 7.6, 5.5);
    const [cx, cy] = cellCorner(f, 4, 2.5);
    const boundary: MultiPolygon = { type: 'MultiPolygon', coordinates: [[[[w, s], [e, s], [e, n], [cx, cy], [w, n], [w, s]]]] }; // prettier-ignore
    const classOf = Int32Array.from({ length: 48 }, (_, i) => (i % 8 < 4 ? 0 : 1) + (i > 30 ? -5 : 0)); // some unclassed
    const parts = polygoniseClasses(f, classOf, boundary);
    const total = parts.reduce((sum, p) => sum + geodesicAreaM2(p.geometry), 0);
    // Clipping round-off and slivers under 0.01 m² only: within 0.001 %.
    expect(Math.abs(total / geodesicAreaM2(boundary) - 1)).toBeLessThan(1e-5);
  });
});

describe('dissolveSmall', () => {
  it('merges a fragment into the neighbour with the longest shared edge, even when another is larger', () => {
    const f = frame(5, 5);
    // Class 2 cell at (2, 1): class 0 on three sides, class 1 (15 cells) below. Class 0 has 9 cells.
    const classOf = Int32Array.from([
      1, 1, 1, 1, 1, 0, 0, 2, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1,
    ]);
    const parts = polygoniseClasses(f, classOf, extent(f));
    const merged = dissolveSmall(parts, 150);
    expect(merged.map((p) => p.classIndex).sort()).toEqual([0, 1, 1]);
    const zero = merged.find((p) => p.classIndex === 0)!;
    expect(geodesicAreaM2(zero.geometry) / 1000).toBeCloseTo(1, 3); // derived: 9 + 1 cells of 100 m²
    // The grid form agrees cell by cell.
    const cells = dissolveSmallCells(f, classOf, new Float64Array(25).fill(100), 150)!;
    expect(Array.from(cells)).toEqual([
      1, 1, 1, 1, 1, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1,
    ]);
  });

  it('falls back to the largest neighbour touching at a corner, and keeps parts at or above the minimum', () => {
    const f = frame(3, 3);
    // A class-1 cell at (1, 1) touching class-2 cells only at corners: (0, 0) one cell, (2, 2) three cells.
    const classOf = Int32Array.from([2, 0, 0, 0, 1, 0, 0, 0, 2]);
    const cells = dissolveSmallCells(f, classOf, new Float64Array(9).fill(100), 50)!;
    expect(Array.from(cells)).toEqual([2, 0, 0, 0, 1, 0, 0, 0, 2]); // nothing under 50 m²
    // With one more step the lone cell shares edges with class 0 only.
    const merged = dissolveSmallCells(f, classOf, new Float64Array(9).fill(100), 150)!;
    expect(merged[4]).toBe(0);
    // Class 0 is two regions here (they meet only at corners); every small cell joins one of them.
    const parts = dissolveSmall(polygoniseClasses(f, classOf, extent(f)), 150);
    expect(parts.map((p) => p.classIndex)).toEqual([0, 0]);
    expect(parts.reduce((sum, p) => sum + geodesicAreaM2(p.geometry), 0) / 900).toBeCloseTo(1, 3);
  });

  it('merges a fragment with no shared edge into the largest part touching it at a corner', () => {
    const f = frame(2, 2);
    // Class 1 at (1, 0) touches class 0 at (0, 0) and (1, 1) by edges; build parts by hand instead:
    const parts = polygoniseClasses(f, Int32Array.from([0, 1, 1, 0]), extent(f));
    const onlyCorner = [parts[0], parts[3]]; // (0, 0) and (1, 1): the two class-0 cells meeting at a corner
    const out = dissolveSmall(onlyCorner, 150);
    expect(out).toHaveLength(1);
    expect(geodesicAreaM2(out[0].geometry) / 200).toBeCloseTo(1, 3);
  });
});

describe('property: polygonised classes tile the boundary', () => {
  it('for random class rasters, parts cover the boundary without overlap and keep each class', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -1, max: 2 }), { minLength: 20, maxLength: 20 }), (cells) => {
        const f = frame(5, 4);
        const [w, s] = cellCorner(f, 0.4, 0.2);
        const [e, n] = cellCorner(f, 4.7, 3.9);
        const boundary: MultiPolygon = { type: 'MultiPolygon', coordinates: [[[[w, s], [e, s], [e, n], [w, n], [w, s]]]] }; // prettier-ignore
        const parts = polygoniseClasses(f, Int32Array.from(cells), boundary);
        const total = parts.reduce((sum, p) => sum + geodesicAreaM2(p.geometry), 0);
        if (cells.every((c) => c < 0)) return expect(parts).toEqual([]);
        expect(Math.abs(total / geodesicAreaM2(boundary) - 1)).toBeLessThan(1e-5);
        const classes = new Set(cells.filter((c) => c >= 0));
        expect(new Set(parts.map((p) => p.classIndex))).toEqual(classes);
        const feats = parts.map((p, i) => ({
          type: 'Feature' as const,
          properties: { id: String(i) },
          geometry: p.geometry,
        }));
        expect(findOverlaps(feats)).toEqual([]);
      }),
      { numRuns: 40, seed: 5 },
    );
  });
});
