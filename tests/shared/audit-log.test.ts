/**
 * The audit: DOMAIN.md §5 worked examples through auditLog, area weighting (DOMAIN.md §6), in-band share and the
 * other statistics on hand-built logs.
 */
import { describe, expect, it } from 'vitest';
import type { MultiPolygon } from 'geojson';
import { auditLog, pointAreas, type AuditInput } from '../../shared/audit/audit-log';
import { cleanLog } from '../../shared/audit/clean-log';
import { emptyColumns, type LogColumns, SPEED_SOURCE_CODE } from '../../shared/audit/log-columns';
import { syntheticLog } from '../../shared/audit/synthetic-log';
import { zoneIndexOf } from '../../shared/audit/zone-join';
import { metresPerDegree } from '../../shared/geo/interpolate-idw';
import { ringFromOffsets } from '../../shared/geo/offset-position';
import { auditResultSchema, cleaningSettingsSchema } from '../../shared/schemas/as-applied.schema';
import { mphToMps, perAcToPerM2, perM2ToPerAc } from '../../shared/units';

const LON0 = -93.6;
const LAT0 = 42.0;
const M = metresPerDegree(LAT0);
const T0 = 1_760_000_000;
const WIDTH = 12; // m, a 16-row planter in 30-in rows is 12.19 m; a round 12 keeps the areas easy to check

type Segment = {
  count: number;
  /** True speed over ground (GNSS), m/s. */
  gnss: number;
  /** Wheel or radar speed, m/s (omit for a log without it). */
  wheel?: number;
  targetPerAc: number;
  /** Logged applied ÷ target, one value or one per point. */
  ratio: number | number[];
  zone?: number;
};

/** A straight pass east at 1 Hz: each point moves on by its GNSS speed, so its area is WIDTH × gnss × 1 s. */
function track(segments: Segment[], opts: { wheel?: boolean; gnss?: boolean } = {}) {
  const n = segments.reduce((s, g) => s + g.count, 0);
  const c = emptyColumns(n, { wheelMps: opts.wheel ?? true, gnssMps: opts.gnss ?? true, widthM: true });
  const zone = new Int16Array(n).fill(-1);
  let i = 0;
  let x = 0;
  for (const g of segments) {
    for (let k = 0; k < g.count; k++, i++) {
      c.t[i] = T0 + i;
      c.lon[i] = LON0 + x / M.lon;
      c.lat[i] = LAT0;
      x += g.gnss;
      if (c.gnssMps) c.gnssMps[i] = g.gnss;
      if (c.wheelMps) c.wheelMps[i] = g.wheel ?? g.gnss;
      c.widthM![i] = WIDTH;
      c.target[i] = perAcToPerM2(g.targetPerAc);
      c.applied[i] = c.target[i] * (Array.isArray(g.ratio) ? g.ratio[k] : g.ratio);
      zone[i] = g.zone ?? -1;
    }
  }
  return { c, zone };
}

function run(c: LogColumns, zone: Int16Array, over: Partial<AuditInput> = {}) {
  return auditLog({
    columns: c,
    keep: new Uint8Array(c.n).fill(1),
    zone,
    zones: [
      { zoneId: 'z1', name: 'Better ground', targetSi: perAcToPerM2(35_100) },
      { zoneId: 'z2', name: 'Sandy knoll', targetSi: perAcToPerM2(30_000) },
    ],
    defaultTargetSi: perAcToPerM2(34_000),
    bandFraction: 0.15,
    fallbackWidthM: WIDTH,
    meteredOn: 'wheel',
    unitSize: 80_000, // seeds per unit of corn (common practice)
    pricePerUnit: 280,
    ...over,
  });
}

const perAc = (si: number) => perM2ToPerAc(si);

describe('auditLog: the speed error (DOMAIN.md §5)', () => {
  // The controller metered on the wheel and logged the target it believed it applied.
  const slipping = (s: number) =>
    track([{ count: 200, gnss: 2.5, wheel: 2.5 / (1 - s), targetPerAc: 34_000, ratio: 1 }]);

  it('10 % slip turns 34 000 into 37 778 seeds/ac, not the naive 37 400', () => {
    const { c, zone } = slipping(0.1);
    const r = run(c, zone);
    const trueMean = perAc(r.fieldTrue!.meanAppliedSi);
    expect(Math.round(trueMean)).toBe(37_778); // DOMAIN.md §5 (derived)
    expect(Math.abs(trueMean - 37_400)).toBeGreaterThan(300); // the "+s" mistake must not pass
    expect(perAc(r.field.meanAppliedSi)).toBeCloseTo(34_000, 6); // the log shows the target
    expect(r.speed!.meanSlip).toBeCloseTo(0.1, 12);
    expect(r.speed!.populationError).toBeCloseTo(1 / 0.9 - 1, 12); // +11.1 %, DOMAIN.md §5 (derived)
    expect(r.speed!.meteredOn).toBe('wheel');
    // Seed the log does not show: (37 777.8 − 34 000) seeds/ac over 200 points × 12 m × 2.5 m (derived).
    const areaM2 = 200 * WIDTH * 2.5;
    expect(r.field.areaM2).toBeCloseTo(areaM2, 6);
    const hidden = perAcToPerM2(34_000 / 0.9 - 34_000) * areaM2;
    expect(r.speed!.quantityHidden).toBeCloseTo(hidden, 3);
    expect(r.speed!.unitsHidden).toBeCloseTo(hidden / 80_000, 9);
    expect(r.speed!.costHidden).toBeCloseTo((hidden / 80_000) * 280, 6);
    expect(r.speed!.areaSlipOver5PctM2).toBeCloseTo(areaM2, 6);
    expect(r.trueApplied![0]).toBeCloseTo(perAcToPerM2(34_000 / 0.9), 12);
  });

  it('2 % slip gives 34 694 seeds/ac', () => {
    const { c, zone } = slipping(0.02);
    const r = run(c, zone);
    expect(Math.round(perAc(r.fieldTrue!.meanAppliedSi))).toBe(34_694); // DOMAIN.md §5 (derived)
    expect(r.speed!.areaSlipOver5PctM2).toBe(0);
  });

  it('a wheel reading 6.0 mph at a true 5.8 mph over-seeds by 3.4 %', () => {
    const { c, zone } = track([
      { count: 100, gnss: mphToMps(5.8), wheel: mphToMps(6.0), targetPerAc: 34_000, ratio: 1 },
    ]);
    const r = run(c, zone);
    expect(r.speed!.populationError).toBeCloseTo(6.0 / 5.8 - 1, 12); // 3.45 %: common practice
    expect(Math.round(r.speed!.populationError * 1000) / 10).toBe(3.4);
    expect(r.fieldTrue!.biasPct).toBeCloseTo((6.0 / 5.8 - 1) * 100, 9);
  });

  it('a radar reading 3 % low turns 34 000 into 32 980 seeds/ac', () => {
    const { c, zone } = track([{ count: 50, gnss: 2.5, wheel: 2.5 * 0.97, targetPerAc: 34_000, ratio: 1 }]);
    const r = run(c, zone, { meteredOn: 'radar' });
    expect(perAc(r.fieldTrue!.meanAppliedSi)).toBeCloseTo(32_980, 6); // DOMAIN.md §5 (derived)
    expect(r.speed!.meteredOn).toBe('radar');
    expect(r.speed!.populationError).toBeCloseTo(-0.03, 12);
  });

  it('metered on GNSS: slip is reported, nothing is hidden, nothing corrected', () => {
    const { c, zone } = slipping(0.1);
    const r = run(c, zone, { meteredOn: 'gnss' });
    expect(r.speed!.meteredOn).toBe('gnss');
    expect(r.speed!.meanSlip).toBeCloseTo(0.1, 12);
    expect(r.speed!.populationError).toBe(0);
    expect(r.speed!.quantityHidden).toBe(0);
    expect(r.fieldTrue).toBeNull();
    expect(r.trueApplied).toBeNull();
    expect(r.zones.every((z) => z.statsTrue === null)).toBe(true);
  });

  it('the speed-source column decides per point; the larger area names the source', () => {
    const { c, zone } = track([
      { count: 60, gnss: 2.5, wheel: 2.5 / 0.9, targetPerAc: 34_000, ratio: 1 },
      { count: 40, gnss: 2.5, wheel: 2.5 / 0.9, targetPerAc: 34_000, ratio: 1 },
    ]);
    c.speedSource = new Uint8Array(c.n);
    c.speedSource.fill(SPEED_SOURCE_CODE.gnss, 0, 60).fill(SPEED_SOURCE_CODE.wheel, 60);
    const r = run(c, zone, { meteredOn: 'wheel' });
    expect(r.speed!.meteredOn).toBe('gnss');
    // Only the 40 % of the area metered on the wheel was over-seeded, by 1/0.9 (derived).
    expect(r.speed!.populationError).toBeCloseTo(0.4 * (1 / 0.9 - 1), 12);
    expect(r.fieldTrue).not.toBeNull();
  });

  it('without both speeds there is no speed error', () => {
    const { c, zone } = track([{ count: 20, gnss: 2.5, targetPerAc: 34_000, ratio: 1 }], { wheel: false });
    const r = run(c, zone);
    expect(r.speed).toBeNull();
    expect(r.fieldTrue).toBeNull();
  });
});

describe('auditLog: statistics', () => {
  it('weights by area, not by point count (DOMAIN.md §6)', () => {
    // Zone 0: 100 points at 1 m/s, 10 % over; zone 1: 25 points at 4 m/s, 5 % under: 1 200 m² each.
    const { c, zone } = track([
      { count: 100, gnss: 1, targetPerAc: 34_000, ratio: 1.1, zone: 0 },
      { count: 25, gnss: 4, targetPerAc: 34_000, ratio: 0.95, zone: 1 },
    ]);
    const r = run(c, zone);
    expect(r.zones[0].stats.areaM2).toBeCloseTo(1200, 6);
    expect(r.zones[1].stats.areaM2).toBeCloseTo(1200, 6);
    expect(r.zones[0].stats.points).toBe(100);
    const areaWeighted = ((1.1 + 0.95) / 2 - 1) * 100; // +2.5 % (derived)
    const countWeighted = ((100 * 1.1 + 25 * 0.95) / 125 - 1) * 100; // +7.0 % (derived)
    expect(Math.abs(areaWeighted - countWeighted)).toBeGreaterThan(4);
    expect(r.field.biasPct).toBeCloseTo(areaWeighted, 9);
    expect(r.zones[0].stats.biasPct).toBeCloseTo(10, 9);
    expect(r.zones[1].stats.biasPct).toBeCloseTo(-5, 9);
    expect(r.zones[0].name).toBe('Better ground');
    expect(r.zones[0].targetSi).toBeCloseTo(perAcToPerM2(35_100), 12);
  });

  it('in-band share, over, under, RMSE, CV and quantities on ten equal points', () => {
    const ratios = [1.0, 1.05, 0.9, 1.2, 0.8, 1.14, 0.86, 1.16, 1.0, 1.3];
    const { c, zone } = track([{ count: 10, gnss: 2, targetPerAc: 32_000, ratio: ratios }]);
    const r = run(c, zone);
    const a = WIDTH * 2; // m² per point
    // Within ±15 %: 1.0, 1.05, 0.9, 1.14, 0.86, 1.0; over: 1.2, 1.16, 1.3; under: 0.8 (by hand).
    expect(r.field.inBandShare).toBeCloseTo(0.6, 9); // positions round-trip through degrees: 1e-9 m
    expect(r.field.areaOverM2).toBeCloseTo(3 * a, 6);
    expect(r.field.areaUnderM2).toBeCloseTo(1 * a, 6);
    // Equal weights: the plain formulas (derived).
    const T = perAcToPerM2(32_000);
    const mean = ratios.reduce((s, v) => s + v, 0) / 10;
    const sd = Math.sqrt(ratios.reduce((s, v) => s + (v - mean) ** 2, 0) / 10);
    expect(r.field.cvPct).toBeCloseTo((sd / mean) * 100, 6);
    const rmse = Math.sqrt(ratios.reduce((s, v) => s + ((v - 1) * T) ** 2, 0) / 10);
    expect(r.field.rmseSi).toBeCloseTo(rmse, 9);
    expect(r.field.quantityDelta).toBeCloseTo(
      ratios.reduce((s, v) => s + (v - 1) * T * a, 0),
      6,
    );
    expect(r.field.unitsDelta).toBeCloseTo(r.field.quantityDelta / 80_000, 12);
    expect(r.field.costDelta).toBeCloseTo((r.field.quantityDelta / 80_000) * 280, 9);
    expect(r.field.biasPct).toBeCloseTo((mean - 1) * 100, 6);
  });

  it('only kept points count; a zone with none has zero area', () => {
    const { c, zone } = track([
      { count: 10, gnss: 2, targetPerAc: 32_000, ratio: 1, zone: 0 },
      { count: 10, gnss: 2, targetPerAc: 32_000, ratio: 2, zone: 1 },
    ]);
    const keep = new Uint8Array(c.n).fill(1).fill(0, 10);
    const r = run(c, zone, { keep, pricePerUnit: null });
    expect(r.field.biasPct).toBeCloseTo(0, 12);
    expect(r.zones[1].stats.areaM2).toBe(0);
    expect(r.zones[1].stats.points).toBe(0);
    expect(r.field.costDelta).toBeNull();
  });

  it('the histogram bins applied ÷ target by 0.025 from 0.5 to 1.5 and holds the whole area', () => {
    const { c, zone } = track([
      { count: 6, gnss: 2, targetPerAc: 32_000, ratio: [0.3, 0.51, 1.0, 1.01, 1.49, 2] },
    ]);
    const r = run(c, zone);
    expect(r.histogram.length).toBe(42);
    expect(r.histogram[0]).toMatchObject({ from: 0, to: 0.5 });
    expect(r.histogram[1].from).toBe(0.5);
    expect(r.histogram[40].to).toBe(1.5);
    const total = r.histogram.reduce((s, b) => s + b.areaM2, 0);
    expect(total).toBeCloseTo(r.field.areaM2, 6);
    const binOf = (ratio: number) =>
      r.histogram.findIndex((b, k) => (k === 41 || ratio < b.to) && ratio >= b.from);
    for (const k of [0, 1, 41]) expect(r.histogram[k].areaM2).toBeCloseTo(WIDTH * 2, 6);
    expect(r.histogram[binOf(1.0)].areaM2).toBeCloseTo(2 * WIDTH * 2, 6); // 1.0 and 1.01 share [1.0, 1.025)
    expect(r.histogram[binOf(1.49)].from).toBeCloseTo(1.475, 12);
  });

  it('the result matches the schema; the speed series is thinned to 2 000 samples', () => {
    const { c, zone } = track([{ count: 5001, gnss: 2.5, wheel: 2.6, targetPerAc: 34_000, ratio: 1.01 }]);
    const r = run(c, zone);
    expect(r.speedSeries.length).toBeLessThanOrEqual(2000);
    expect(r.speedSeries.length).toBeGreaterThan(1500);
    expect(r.speedSeries[0].wheelMps).toBeCloseTo(2.6, 12);
    expect(r.speedSeries[0].gnssMps).toBeCloseTo(2.5, 12);
    const { trueApplied: _t, area: _a, ...plain } = r;
    expect(() => auditResultSchema.parse({ ...plain, findings: [] })).not.toThrow();
  });
});

describe('pointAreas', () => {
  it('width × distance to the next point; a pass end uses speed × the median step; fallback width', () => {
    const { c } = track([{ count: 6, gnss: 3, targetPerAc: 34_000, ratio: 1 }]);
    c.widthM![2] = Number.NaN; // → fallback 9 m
    c.widthM![3] = 6; // three sections of six off
    c.t[5] += 20; // a gap of 21 s: point 4 ends a pass
    const a = pointAreas(c, 9);
    expect(a[0]).toBeCloseTo(WIDTH * 3, 6);
    expect(a[2]).toBeCloseTo(9 * 3, 6);
    expect(a[3]).toBeCloseTo(6 * 3, 6);
    expect(a[4]).toBeCloseTo(WIDTH * 3 * 1, 6); // 3 m/s × the median step of 1 s
    expect(a[5]).toBeCloseTo(WIDTH * 3 * 1, 6);
    expect(() => pointAreas(c, 0)).toThrow(/width must be positive/);
  });
});

/* ------------------------------------------------------------------ synthetic logs, the whole chain */

// A 400 m × 300 m field of our own (invented), 12 m swath at 2.5 m/s and 1 Hz: about 4 000 points.
const ORIGIN: [number, number] = [-93.61, 41.99];
const rectangle = (e0: number, n0: number, e1: number, n1: number): MultiPolygon => ({
  type: 'MultiPolygon',
  coordinates: [
    [
      ringFromOffsets(ORIGIN, [
        [e0, n0],
        [e1, n0],
        [e1, n1],
        [e0, n1],
      ]),
    ],
  ],
});
const FIELD = rectangle(0, 0, 400, 300);
const WEST_HALF = rectangle(-50, -50, 200, 350); // the western half of the field, and beyond it
const TARGET = perAcToPerM2(34_000);
const CLEANING = cleaningSettingsSchema.parse({});

/** syntheticLog → zoneIndexOf → cleanLog → auditLog, with no zones (one rate everywhere). */
function chain(faults: Parameters<typeof syntheticLog>[0]['faults'], cleaning = CLEANING, band = 0.15) {
  const log = syntheticLog({
    boundary: FIELD,
    zones: [],
    defaultTargetSi: TARGET,
    swathM: 12,
    speedMps: 2.5,
    hz: 1,
    startTime: T0,
    seed: 7,
    faults,
  });
  const zone = zoneIndexOf(log.lon, log.lat, [], FIELD);
  const cleaned = cleanLog(log, cleaning, zone);
  const result = auditLog({
    columns: cleaned.columns,
    keep: cleaned.keep,
    zone: cleaned.zone!,
    zones: [],
    defaultTargetSi: TARGET,
    bandFraction: band,
    fallbackWidthM: 12,
    meteredOn: 'gnss',
    unitSize: 80_000,
    pricePerUnit: 280,
  });
  return { log, cleaned, result };
}

/** Standard normal CDF by Abramowitz & Stegun 26.2.17 (|error| < 7.5e-8). */
function phi(z: number): number {
  const t = 1 / (1 + 0.2316419 * Math.abs(z));
  const poly =
    t * (0.31938153 + t * (-0.356563782 + t * (1.781477937 + t * (-1.821255978 + t * 1.330274429))));
  const tail = (Math.exp((-z * z) / 2) / Math.sqrt(2 * Math.PI)) * poly;
  return z >= 0 ? 1 - tail : tail;
}

describe('auditLog on synthetic logs', () => {
  it('8 % slip over half the field: mean slip about 4 %, population error about 4.35 %', () => {
    const { result: r, cleaned } = chain({ slip: { fraction: 0.08, where: WEST_HALF } });
    expect(cleaned.keep.reduce((s, k) => s + k, 0)).toBeGreaterThan(3000);
    expect(r.speed!.meteredOn).toBe('wheel'); // the log's speed-source column says wheel
    // Half the area slips 8 %, half not at all: 0.5 × 8 % (derived); ±0.5 % for the half-way line and noise.
    expect(Math.abs(r.speed!.meanSlip - 0.04)).toBeLessThanOrEqual(0.005);
    // True ÷ logged over the field: 0.5 × 1/(1 − 0.08) + 0.5 × 1 − 1 = 4.35 % (derived); ±0.2 %.
    const derived = 0.5 * (1 / (1 - 0.08)) + 0.5 - 1;
    expect(Math.abs(r.speed!.populationError - derived)).toBeLessThanOrEqual(0.002);
    // The log shows the target; the truth is above it by the population error.
    expect(r.field.biasPct).toBeCloseTo(0, 9);
    expect(r.fieldTrue!.biasPct / 100).toBeCloseTo(r.speed!.populationError, 9);
    // About half the planted area slipped more than 5 %.
    expect(Math.abs(r.speed!.areaSlipOver5PctM2 / r.field.areaM2 - 0.5)).toBeLessThanOrEqual(0.05);
    // The area: about the field's 12 ha less the cleaned-off pass ends (400 × 300 m = 12 ha, derived).
    expect(r.field.areaM2).toBeGreaterThan(0.85 * 120_000);
    expect(r.field.areaM2).toBeLessThan(1.01 * 120_000);
  });

  it('noise only: in-band share is P(|Z| ≤ band / cv) of the normal distribution', () => {
    const cv = 0.1;
    const band = 0.15;
    const { result: r, cleaned } = chain({ noiseCv: cv }, CLEANING, band);
    const kept = cleaned.keep.reduce((s, k) => s + k, 0);
    // P(|Z| ≤ 1.5) = 2Φ(1.5) − 1 = 0.8664 (derived; standard normal table).
    const expected = 2 * phi(band / cv) - 1;
    expect(expected).toBeCloseTo(0.8664, 4);
    // Nearly equal weights: binomial standard error sqrt(p(1 − p)/n) ≈ 0.006; allow four of them.
    const tolerance = 4 * Math.sqrt((expected * (1 - expected)) / kept);
    expect(Math.abs(r.field.inBandShare - expected)).toBeLessThanOrEqual(tolerance);
    // CV of applied ÷ target is the noise's 10 %; the bias within 4 standard errors of 0 (derived).
    expect(Math.abs(r.field.cvPct - 10)).toBeLessThanOrEqual(0.5);
    expect(Math.abs(r.field.biasPct)).toBeLessThanOrEqual(4 * (10 / Math.sqrt(kept)));
    expect(r.speed!.meteredOn).toBe('gnss');
    expect(r.fieldTrue).toBeNull();
  });
});
