import { describe, expect, it } from 'vitest';
import { featureCollection, intersect, polygon, union } from '@turf/turf';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { coverageOf, type CoverageOptions } from '../../shared/audit/coverage';
import { emptyColumns, type LogColumns } from '../../shared/audit/log-columns';
import { syntheticLog } from '../../shared/audit/synthetic-log';
import { geodesicAreaM2, ringMeasure } from '../../shared/geo/geodesic-area';
import { metresPerDegree } from '../../shared/geo/interpolate-idw';
import { offsetPosition, ringFromOffsets } from '../../shared/geo/offset-position';
import { coverageSchema } from '../../shared/schemas/as-applied.schema';

const ORIGIN: [number, number] = [-93.6, 42];
const rect = (eastM: number, northM: number): MultiPolygon => ({
  type: 'MultiPolygon',
  coordinates: [
    [
      ringFromOffsets(ORIGIN, [
        [0, 0],
        [eastM, 0],
        [eastM, northM],
        [0, northM],
      ]),
    ],
  ],
});
const TARGET = 8; // seeds/m², invented

/**
 * Hand-built passes over a 100 m × 60 m field: east–west passes of a 10 m swath, points every 2 m from x = 2 to
 * x = 98 m (each pass paints 1 … 99 m: half a step beyond its end points), one second apart, 20 s between
 * passes. Centre lines (m north of the south edge) 5, 15, 23, 33, 47, 57: swaths [0,10] [10,20] [18,28]
 * [28,38] [42,52] [52,62] — one 2 m overlap (18–20) and one 4 m gap (38–42); the last pass runs 2 m past the
 * north edge.
 */
function handLog(): LogColumns {
  const centres = [5, 15, 23, 33, 47, 57];
  const xs = Array.from({ length: 49 }, (_, k) => 2 + 2 * k);
  const n = centres.length * xs.length;
  const c = emptyColumns(n);
  let i = 0;
  let t = 1_800_000_000;
  centres.forEach((y, p) => {
    for (const x of p % 2 ? [...xs].reverse() : xs) {
      [c.lon[i], c.lat[i]] = offsetPosition(ORIGIN, x, y);
      c.t[i] = t++;
      c.target[i] = TARGET;
      c.applied[i] = TARGET;
      i++;
    }
    t += 20;
  });
  return c;
}
const HAND: CoverageOptions = {
  cellSizeM: 1,
  swathFallbackM: 10,
  rowSpacingM: 0.5,
  rowCount: 20,
  rowsPerSection: 10, // two 5 m sections (invented planter)
  displaySectionLimit: 16,
};

describe('coverageOf on hand-built passes', () => {
  // Areas by hand (derived): passes 98 m long (x 1 … 99).
  // double = 2 m × 98 m = 196 m²; covered = (38 + 18) m × 98 m = 5 488 m² of the 6 000 m² field;
  // skipped = 6 000 − 5 488 = 512 m² = the 4 m gap (4 × 98 = 392) + the 1 m strips at the west and east ends
  // (2 × 1 × 60 = 120).
  // Tolerance 2 m² (two 1 m cells): every rectangle edge lies on a cell edge, so only the millimetres between
  // the geodesic offsets and the grid's flat scale could move a cell centre across one.
  const TOL = 2;
  const c = handLog();
  const keep = new Uint8Array(c.n).fill(1);
  const cov = coverageOf(c, keep, rect(100, 60), HAND);

  it('finds the overlap, the gap and the uncovered ends', () => {
    expect(coverageSchema.parse(cov)).toEqual(cov);
    expect(cov.cellSizeM).toBe(1);
    expect(Math.abs(cov.fieldM2 - 6000)).toBeLessThanOrEqual(TOL);
    expect(Math.abs(cov.doubleM2 - 196)).toBeLessThanOrEqual(TOL);
    expect(Math.abs(cov.skippedM2 - 512)).toBeLessThanOrEqual(TOL);
    expect(Math.abs(cov.plantedM2 - 5488)).toBeLessThanOrEqual(TOL);
    // Seed put down twice: 196 m² × 8 seeds/m² (derived).
    expect(Math.abs(cov.quantityInOverlap - 196 * TARGET)).toBeLessThanOrEqual(TOL * TARGET);
  });

  it('writes the raster: row 0 south, 0 skipped, 1 once, 2 double, 255 outside', () => {
    const { raster } = cov;
    const counts = Uint8Array.from(atob(raster.countsBase64), (ch) => ch.charCodeAt(0));
    expect(counts.length).toBe(raster.columns * raster.rows);
    const at = (eastM: number, northM: number) =>
      counts[Math.floor(northM) * raster.columns + Math.floor(eastM)];
    expect(at(50, 5)).toBe(1);
    expect(at(50, 19)).toBe(2); // in the 18–20 m overlap
    expect(at(50, 40)).toBe(0); // in the 38–42 m gap
    expect(at(0.5, 30)).toBe(0); // the uncovered west end
    expect(new Set(counts)).toEqual(new Set([0, 1, 2, ...(counts.includes(255) ? [255] : [])]));
    expect(raster.minLon).toBeCloseTo(ORIGIN[0], 9);
    expect(raster.minLat).toBeCloseTo(ORIGIN[1], 9);
  });

  it('a pass never doubles itself: one pass back over its own track counts once', () => {
    const one = handLog();
    const first = 49;
    const back = emptyColumns(first * 2);
    for (let k = 0; k < first; k++) {
      for (const j of [k, 2 * first - 1 - k]) {
        back.lon[j] = one.lon[k];
        back.lat[j] = one.lat[k];
        back.target[j] = TARGET;
      }
    }
    // One continuous pass (1 s steps) east and straight back west along the same line.
    for (let j = 0; j < 2 * first; j++) back.t[j] = 1_800_000_000 + j;
    back.lon[first] += 1e-9; // the turn-around point a hair apart from its twin
    const r = coverageOf(back, new Uint8Array(back.n).fill(1), rect(100, 60), HAND);
    expect(r.doubleM2).toBe(0);
    // The same points as two passes (a 30 s gap at the turn) double the whole swath: 10 m × 98 m (derived).
    for (let j = first; j < 2 * first; j++) back.t[j] += 30;
    const two = coverageOf(back, new Uint8Array(back.n).fill(1), rect(100, 60), HAND);
    expect(Math.abs(two.doubleM2 - 980)).toBeLessThanOrEqual(TOL);
  });

  it('section advice: 2 rows (1 m) per section would have switched off the whole 2 m overlap', () => {
    // ceil(20 rows / 16 sections) = 2 rows per section (DOMAIN.md §4, derived): 10 sections of 1 m; the two
    // sections over the 18–20 m strip find it planted already and stay off.
    expect(cov.sectionAdvice).not.toBeNull();
    const a = cov.sectionAdvice!;
    expect(a.rowsPerSection).toBe(2);
    expect(a.sections).toBe(10);
    expect(a.withinDisplayLimit).toBe(true);
    expect(Math.abs(a.overlapCutM2 - 196)).toBeLessThanOrEqual(TOL);
    // Already at 2 rows per section: the model tries row-by-row control, 20 sections, more than 16.
    const fine = coverageOf(c, keep, rect(100, 60), { ...HAND, rowsPerSection: 2 }).sectionAdvice!;
    expect(fine).toMatchObject({ rowsPerSection: 1, sections: 20, withinDisplayLimit: false });
    // Neither sectionsOn nor rows per section: no advice.
    expect(coverageOf(c, keep, rect(100, 60), { ...HAND, rowsPerSection: null }).sectionAdvice).toBeNull();
  });

  it('tells more passes apart than its 16-bit pass tags hold (65 536 passes)', () => {
    // Two-point passes (x 5 → 15 m, 1 s apart, 10 s between passes) along two strips: the first and the last
    // pass along y = 5 m, the 65 534 between along y = 15 m. The last pass is the 65 536th, past what 16 bits
    // number, and must still count as a pass of its own over the first one's strip. By coverageOf's
    // definition (derived): both strips double, and quantityInOverlap = (65 534 − 1) × the north strip's
    // area × target + the south strip's area × target.
    const passes = 65_536;
    const c = emptyColumns(2 * passes);
    for (let p = 0; p < passes; p++) {
      const y = p === 0 || p === passes - 1 ? 5 : 15;
      [c.lon[2 * p], c.lat[2 * p]] = offsetPosition(ORIGIN, 5, y);
      [c.lon[2 * p + 1], c.lat[2 * p + 1]] = offsetPosition(ORIGIN, 15, y);
      c.t[2 * p] = 1_800_000_000 + 10 * p;
      c.t[2 * p + 1] = 1_800_000_001 + 10 * p;
    }
    c.target.fill(TARGET);
    const opts = { ...HAND, swathFallbackM: 4 };
    const field = rect(20, 20);
    const only = (p: number) => {
      const one = emptyColumns(2);
      for (const k of [0, 1]) {
        one.lon[k] = c.lon[2 * p + k];
        one.lat[k] = c.lat[2 * p + k];
        one.t[k] = c.t[2 * p + k];
      }
      one.target.fill(TARGET);
      return coverageOf(one, new Uint8Array(2).fill(1), field, opts).plantedM2;
    };
    const [south, north] = [only(0), only(1)];
    expect(south).toBeGreaterThan(0);
    const all = coverageOf(c, new Uint8Array(c.n).fill(1), field, opts);
    expect(all.plantedM2).toBe(south + north);
    expect(all.doubleM2).toBe(south + north);
    expect(all.quantityInOverlap).toBeCloseTo((passes - 3) * north * TARGET + south * TARGET, 6);
  });

  it('leaves out what is not kept, and refuses bad input clearly', () => {
    const part = new Uint8Array(c.n).fill(1);
    part.fill(0, 2 * 49, 3 * 49); // the third pass (18–28 m) not kept: no overlap, 8 m more skipped
    const r = coverageOf(c, part, rect(100, 60), HAND);
    expect(r.doubleM2).toBe(0);
    // 512 + (28 − 20) m × 98 m = 1 296 m² (derived).
    expect(Math.abs(r.skippedM2 - 1296)).toBeLessThanOrEqual(TOL);
    expect(() => coverageOf(c, new Uint8Array(3), rect(100, 60), HAND)).toThrow(
      /keep \(3\) must have one entry per point/,
    );
    expect(() => coverageOf(c, keep, rect(100, 60), { ...HAND, cellSizeM: 0 })).toThrow(
      /cell size must be positive, got 0 m/,
    );
  });

  it('enlarges the cells to keep the raster to about 4 M cells', () => {
    const r = coverageOf(c, keep, rect(100, 60), { ...HAND, cellSizeM: 0.01 });
    // 100 m × 60 m at 1 cm would be 60 M cells: √(60 M / 4 M) ≈ 3.9 → cells of about 3.9 cm.
    expect(r.cellSizeM).toBeGreaterThan(0.038);
    expect(r.raster.columns * r.raster.rows).toBeLessThanOrEqual(4_000_000);
    expect(Math.abs(r.doubleM2 - 196)).toBeLessThanOrEqual(TOL);
  });
});

describe('coverageOf against exact polygons (@turf/turf)', () => {
  it('agrees with the union and intersections of the swath rectangles of a synthetic log (overlapM 1.5)', () => {
    const field = rect(200, 120);
    const swathM = 9.144; // 12 rows × 30 in (NIST SP 811: 1 in = 0.0254 m)
    const c = syntheticLog({
      boundary: field,
      zones: [],
      defaultTargetSi: TARGET,
      swathM,
      speedMps: 2.2352,
      hz: 1,
      startTime: 1_800_000_000,
      seed: 5,
      faults: { overlapM: 1.5 },
    });
    expect(c.sectionsOn).not.toBeNull();
    const keep = Uint8Array.from(c.workOn!);
    const cellSizeM = 0.25;
    const cov = coverageOf(c, keep, field, { ...HAND, cellSizeM, swathFallbackM: swathM });

    // Each pass as one exact rectangle: the pass runs along a parallel, from its first point to its last,
    // each lengthened by half its step, swathM wide (the model coverageOf documents).
    const perDeg = metresPerDegree(ORIGIN[1] + 60 / 111_000);
    const passes: Feature<Polygon>[] = [];
    for (let i = 0; i < c.n;) {
      if (!keep[i]) {
        i++;
        continue;
      }
      let j = i;
      while (j + 1 < c.n && keep[j + 1] && c.t[j + 1] - c.t[j] <= 5) j++;
      const lonA = c.lon[i] - (c.lon[i + 1] - c.lon[i]) / 2;
      const lonB = c.lon[j] + (c.lon[j] - c.lon[j - 1]) / 2;
      const [w, e] = [Math.min(lonA, lonB), Math.max(lonA, lonB)];
      const half = swathM / 2 / perDeg.lat;
      const [s, n] = [c.lat[i] - half, c.lat[i] + half];
      passes.push(
        polygon([
          [
            [w, s],
            [e, s],
            [e, n],
            [w, n],
            [w, s],
          ],
        ]),
      );
      i = j + 1;
    }
    expect(passes.length).toBeGreaterThan(10);
    const fieldF = { type: 'Feature', properties: {}, geometry: field } as Feature<MultiPolygon>;
    const covered = intersect(featureCollection([union(featureCollection(passes))!, fieldF]))!;
    // Overlap 1.5 m < half the swath: no cell is under three passes, so the double area is the union of the
    // neighbours' intersections.
    const pairs = passes
      .slice(1)
      .map((p, k) => intersect(featureCollection([passes[k], p])))
      .filter((f) => f !== null);
    const doubled = intersect(featureCollection([union(featureCollection(pairs))!, fieldF]))!;
    const fieldM2 = geodesicAreaM2(field);
    const coveredM2 = geodesicAreaM2(covered.geometry);
    const doubleM2 = geodesicAreaM2(doubled.geometry);
    const perimeter = (g: Polygon | MultiPolygon) =>
      (g.type === 'Polygon' ? [g.coordinates] : g.coordinates)
        .flat()
        .reduce((sum, ring) => sum + ringMeasure(ring).perimeterM, 0);
    // A raster of cell centres misplaces a straight edge by at most half a cell across it, so in general the
    // tolerance is half a cell × the length of the region's edges, plus 0.01 % for the grid's flat scale against
    // the ellipsoid (derived). The overlap strips are tighter: they run along the grid's rows (passes follow
    // parallels) and are 1.5 m = 6 cells of 0.25 m wide, and a half-open band 6 cells wide holds exactly 6 rows
    // of centres wherever it lies; only each strip's two ends (1.5 m across) may gain or lose half a cell.
    const tolDouble = pairs.length * 2 * (cellSizeM / 2) * 1.5 + 1e-4 * doubleM2;
    const tolSkip = (cellSizeM / 2) * (perimeter(field) + perimeter(covered.geometry)) + 1e-4 * fieldM2;
    expect(Math.abs(cov.doubleM2 - doubleM2)).toBeLessThanOrEqual(tolDouble);
    expect(Math.abs(cov.skippedM2 - (fieldM2 - coveredM2))).toBeLessThanOrEqual(tolSkip);
    expect(Math.abs(cov.quantityInOverlap - doubleM2 * TARGET)).toBeLessThanOrEqual(tolDouble * TARGET);
    // The overlap is what the fault put there: about 1.5 m × 200 m between each pair of neighbours (derived).
    expect(doubleM2 / (pairs.length * 200)).toBeGreaterThan(1.4);
    expect(doubleM2 / (pairs.length * 200)).toBeLessThan(1.5 + 1e-6);
    console.info(
      `coverage vs turf: double ${cov.doubleM2.toFixed(1)} vs ${doubleM2.toFixed(1)} m² (tol ${tolDouble.toFixed(1)}),` +
        ` skipped ${cov.skippedM2.toFixed(1)} vs ${(fieldM2 - coveredM2).toFixed(1)} m² (tol ${tolSkip.toFixed(1)})`,
    );
  });
});
