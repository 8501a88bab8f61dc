import { describe, expect, it } from 'vitest';
import type { MultiPolygon } from 'geojson';
import { emptyColumns, type LogColumns } from '../../shared/audit/log-columns';
import { kachmanSmith, rowDiagnostics } from '../../shared/audit/row-diagnostics';
import { seededRandom, syntheticLog } from '../../shared/audit/synthetic-log';
import { rowDiagnosticSchema } from '../../shared/schemas/as-applied.schema';
import { ringFromOffsets } from '../../shared/geo/offset-position';

// DOMAIN.md §7 worked example (our own data).
const SPACINGS = [6.1, 5.8, 2.0, 6.3, 12.2, 5.9, 6.0, 0.5, 6.4, 9.5];

/** A log of n points whose rows carry the given per-point values (one array per row). */
function withRows(kind: 'population' | 'spacing', rows: number[][]): LogColumns {
  const n = rows[0].length;
  const c = emptyColumns(
    n,
    {},
    rows.map((_, k) => ({ row: k + 1, kind })),
  );
  rows.forEach((values, k) => c.rows[k].values.set(values));
  return c;
}

describe('kachmanSmith', () => {
  it('reproduces DOMAIN.md §7: D 20 %, M 20 %, A 60 %, C 3.861 % (sample SD)', () => {
    const k = kachmanSmith(SPACINGS, 6.0);
    expect(k.multiples).toBeCloseTo(20, 10); // DOMAIN.md §7: D 20 %
    expect(k.misses).toBeCloseTo(20, 10); // DOMAIN.md §7: M 20 %
    expect(k.quality).toBeCloseTo(60, 10); // DOMAIN.md §7: A 60 %
    expect(k.precision).toBeCloseTo(3.861, 3); // DOMAIN.md §7: C 3.861 % (printed to 3 decimals)
    // The population SD would give 3.525 % (derived by hand: Σd² = 0.268333 over 6 singles): not what §7 prints.
    expect(Math.abs(k.precision - 3.525)).toBeGreaterThan(0.3);
  });

  it('puts the limits where §7 does: exactly 0.5 xRef is a multiple, exactly 1.5 xRef a single', () => {
    const k = kachmanSmith([3, 9, 9, 6], 6);
    expect(k.multiples).toBe(25); // 3 ≤ 0.5 × 6 (DOMAIN.md §7: "≤ 0.5 x_ref")
    expect(k.misses).toBe(0); // 9 is not > 1.5 × 6
    // Singles 9, 9, 6: mean 8, sample SD √((1 + 1 + 4) / 2) = √3 (derived) → C = 100 √3 / 6.
    expect(k.precision).toBeCloseTo((100 * Math.sqrt(3)) / 6, 10);
  });

  it('skips values that are not spacings; refuses no spacings or a bad xRef', () => {
    expect(kachmanSmith([...SPACINGS, Number.NaN, -1], 6)).toEqual(kachmanSmith(SPACINGS, 6));
    expect(() => kachmanSmith([Number.NaN], 6)).toThrow(/no seed spacings/);
    expect(() => kachmanSmith(SPACINGS, 0)).toThrow(/xRef must be a positive number, got 0/);
    expect(kachmanSmith([6, 1], 6).precision).toBeNaN(); // one single: no spread to measure
  });
});

describe('rowDiagnostics', () => {
  it('flags only the low row of a synthetic planter (lowRow 7 at 0.9 of 24)', () => {
    const origin: [number, number] = [-93.6, 42];
    const field: MultiPolygon = {
      type: 'MultiPolygon',
      coordinates: [
        [
          ringFromOffsets(origin, [
            [0, 0],
            [300, 0],
            [300, 200],
            [0, 200],
          ]),
        ],
      ],
    };
    const c = syntheticLog({
      boundary: field,
      zones: [],
      defaultTargetSi: 8.4,
      swathM: 18.288, // 24 rows × 30 in (NIST SP 811: 1 in = 0.0254 m)
      speedMps: 2.2352,
      hz: 1,
      startTime: 1_800_000_000,
      seed: 11,
      faults: { lowRow: { row: 7, factor: 0.9, rowCount: 24 }, noiseCv: 0.03 },
    });
    const keep = Uint8Array.from(c.workOn!);
    const [d] = rowDiagnostics(c, keep);
    expect(rowDiagnosticSchema.parse(d)).toEqual(d);
    expect(d.kind).toBe('population');
    expect(d.rows.map((r) => r.row)).toEqual(Array.from({ length: 24 }, (_, k) => k + 1));
    expect(d.rows.filter((r) => r.flagged).map((r) => r.row)).toEqual([7]);
    const others = d.rows.filter((r) => r.row !== 7).map((r) => r.mean);
    const othersMean = others.reduce((a, b) => a + b, 0) / others.length;
    // The generator scales row 7 by exactly 0.9 point by point, so its mean is 0.9 × the others' up to
    // floating-point round-off: tolerance 1e-9 relative.
    expect(d.rows[6].mean / othersMean).toBeCloseTo(0.9, 9);
    expect(d.rows[6].robustZ).toBeLessThan(-3.5);
    // 23 rows agree exactly: the MAD is 0 and the floor (1 % of the median) is used instead.
    expect(d.mad).toBeCloseTo(0.01 * d.median, 12);
  });

  it('robust z by hand: rows 100 104 96 102 98 100 130 → median 100, MAD 2, only 130 flagged', () => {
    const means = [100, 104, 96, 102, 98, 100, 130];
    const c = withRows(
      'population',
      means.map((m) => [m - 1, m + 1, 9999]),
    );
    const keep = Uint8Array.from([1, 1, 0]); // the third point (9999 everywhere) is not kept
    const [d] = rowDiagnostics(c, keep);
    expect(d.median).toBe(100);
    // |mean − 100| = 0 4 4 2 2 0 30, sorted 0 0 2 2 4 4 30: MAD 2 (derived by hand), above the 1 % floor.
    expect(d.mad).toBe(2);
    expect(d.rows.map((r) => r.mean)).toEqual(means);
    expect(d.rows[6].robustZ).toBeCloseTo(30 / (1.4826 * 2), 10); // 10.117 (derived)
    expect(d.rows[1].robustZ).toBeCloseTo(4 / (1.4826 * 2), 10); // 1.349 (derived)
    expect(d.rows.map((r) => r.flagged)).toEqual([false, false, false, false, false, false, true]);
    // A threshold above 10.117 flags nothing.
    expect(rowDiagnostics(c, keep, { threshold: 11 })[0].rows.some((r) => r.flagged)).toBe(false);
  });

  it('spacing: row means plus Kachman & Smith over every kept spacing, xRef given or the median', () => {
    const c = withRows('spacing', [SPACINGS.slice(0, 5), SPACINGS.slice(5)]);
    const keep = new Uint8Array(5).fill(1);
    const [given] = rowDiagnostics(c, keep, { xRefM: 6.0 });
    expect(given.kind).toBe('spacing');
    expect(given.uniformity!.xRef).toBe(6);
    expect(given.uniformity!.multiples).toBeCloseTo(20, 10); // DOMAIN.md §7
    expect(given.uniformity!.misses).toBeCloseTo(20, 10); // DOMAIN.md §7
    expect(given.uniformity!.precision).toBeCloseTo(3.861, 3); // DOMAIN.md §7
    const [byMedian] = rowDiagnostics(c, keep);
    // Sorted spacings 0.5 2.0 5.8 5.9 6.0 6.1 6.3 6.4 9.5 12.2: median (6.0 + 6.1) / 2 (derived).
    expect(byMedian.uniformity!.xRef).toBeCloseTo(6.05, 12);
  });

  it('spacing: xRef is the median of every kept spacing, as a full sort gives it, for many spacings', () => {
    // Seeded spacings around 0.15 m in whole millimetres (so many are equal), some missing, negative or on
    // points not kept; an odd and an even number of them. The median by definition: sort, take the middle.
    const random = seededRandom(3);
    for (const n of [20_001, 20_002]) {
      const rows = [0, 1, 2].map(() =>
        Array.from({ length: n }, (_, i) =>
          i % 97 === 0
            ? Number.NaN
            : i % 89 === 0
              ? -1
              : Math.round(150 + 60 * (random() - 0.5) ** 3 * 8) / 1000,
        ),
      );
      const c = withRows('spacing', rows);
      const keep = Uint8Array.from({ length: n }, (_, i) => (i % 5 === 0 ? 0 : 1));
      const kept = rows.flatMap((r) => r.filter((v, i) => keep[i] && Number.isFinite(v) && v >= 0));
      const sorted = [...kept].sort((a, b) => a - b);
      const m = sorted.length >> 1;
      const expected = sorted.length % 2 ? sorted[m] : (sorted[m - 1] + sorted[m]) / 2;
      const [d] = rowDiagnostics(c, keep);
      expect(d.uniformity!.xRef).toBe(expected);
      // And the indices are those of the spacings gathered in row order.
      const { xRef, ...indices } = d.uniformity!;
      expect(indices).toEqual(kachmanSmith(kept, xRef));
    }
  });

  it('one entry per kind present, none for a log without rows; clear errors for bad input', () => {
    const c = withRows('population', [[1, 2]]);
    c.rows.push({ row: 1, kind: 'vacuum', values: Float64Array.from([5, Number.NaN]) });
    const out = rowDiagnostics(c, Uint8Array.from([1, 1]));
    expect(out.map((d) => d.kind)).toEqual(['population', 'vacuum']);
    expect(out[1].rows).toEqual([{ row: 1, mean: 5, robustZ: 0, flagged: false }]);
    expect(rowDiagnostics(emptyColumns(3), new Uint8Array(3))).toEqual([]);
    expect(() => rowDiagnostics(c, new Uint8Array(1))).toThrow(
      /keep \(1\) must have one entry per point \(2\)/,
    );
    expect(() => rowDiagnostics(c, Uint8Array.from([1, 1]), { xRefM: -2 })).toThrow(
      /spacing must be positive/,
    );
  });
});
