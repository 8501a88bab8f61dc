/**
 * Controller lag (DOMAIN.md §6): latency from target steps by step fitting, and the distance planted at the old
 * rate = speed × latency. Synthetic logs with a known lag, and hand-built steps.
 */
import { describe, expect, it } from 'vitest';
import type { MultiPolygon } from 'geojson';
import { pointAreas } from '../../shared/audit/audit-log';
import { controllerLag, quantileSorted } from '../../shared/audit/controller-lag';
import { emptyColumns } from '../../shared/audit/log-columns';
import { syntheticLog, type SyntheticLogOptions } from '../../shared/audit/synthetic-log';
import { ringFromOffsets } from '../../shared/geo/offset-position';
import { controllerLagSchema } from '../../shared/schemas/as-applied.schema';

const ORIGIN: [number, number] = [-93.6, 42];
const rect = (w: number, e: number): MultiPolygon => ({
  type: 'MultiPolygon',
  coordinates: [
    [
      ringFromOffsets(ORIGIN, [
        [w, -10],
        [e, -10],
        [e, 310],
        [w, 310],
      ]),
    ],
  ],
});
const FIELD: MultiPolygon = {
  type: 'MultiPolygon',
  coordinates: [
    [
      ringFromOffsets(ORIGIN, [
        [0, 0],
        [400, 0],
        [400, 300],
        [0, 300],
      ]),
    ],
  ],
};
const ACRE_M2 = 4046.8564224; // NIST SP 811
const LOW = 30_000 / ACRE_M2; // seeds/m², invented rates
const HIGH = 36_000 / ACRE_M2;
const MPH_5 = 2.2352; // m/s, NIST SP 811 B.8 (exact)
const SWATH = 9.144; // 12 rows × 30 in (NIST SP 811: 1 in = 0.0254 m)

const synth = (over: Partial<SyntheticLogOptions>) => {
  const c = syntheticLog({
    boundary: FIELD,
    zones: [{ geometry: rect(-10, 200), targetSi: LOW }], // every east–west pass crosses x = 200 m once
    defaultTargetSi: HIGH,
    swathM: SWATH,
    speedMps: MPH_5,
    hz: 1,
    startTime: 1_760_000_000,
    seed: 3,
    ...over,
  });
  // The pipeline passes every planting point (the cleaning would drop the seconds after each change).
  return { c, keep: c.workOn!.slice(), area: pointAreas(c, SWATH) };
};

describe('controllerLag', () => {
  it('a 3 s lag at 1 Hz: latency 3 ± 0.5 s, and 5 mph × 3 s = 6.706 m at the old rate', () => {
    const { c, keep, area } = synth({ faults: { lagS: 3 } });
    const r = controllerLag(c, keep, area);
    expect(controllerLagSchema.parse(r)).toEqual(r);
    expect(r.transitions).toBeGreaterThan(25); // 33 passes of 9.144 m over 300 m, each crossing the edge once
    expect(Math.abs(r.latencyS! - 3)).toBeLessThanOrEqual(0.5);
    expect(r.leadS).toBe(r.latencyS);
    expect(r.spreadS!).toBeLessThanOrEqual(0.5);
    // DOMAIN.md §6 (derived): at 5 mph, 3 s = 6.706 m; the synthetic speed varies by 1 %, so within 1 %.
    expect(Math.abs(r.metresAtOldRate! - 6.706)).toBeLessThanOrEqual(0.07);
    // Area at the old rate: per transition width × speed × latency (DOMAIN.md §6, derived), within 2 %.
    const expected = r.transitions * SWATH * MPH_5 * 3;
    expect(Math.abs(r.areaAffectedM2 / expected - 1)).toBeLessThan(0.02);
    // Every step here is between the two rates: quantity = |HIGH − LOW| × that area.
    expect(r.quantityAffected).toBeCloseTo((HIGH - LOW) * r.areaAffectedM2, 6);
    expect(r.perTransition).toHaveLength(r.transitions);
    for (const p of r.perTransition) expect(Math.abs(p.latencyS - 3)).toBeLessThanOrEqual(0.5);
  });

  it('a 3 s lag at 5 Hz: latency 3 ± 0.2 s', () => {
    const { c, keep, area } = synth({ hz: 5, faults: { lagS: 3 } });
    const r = controllerLag(c, keep, area);
    expect(r.transitions).toBeGreaterThan(25);
    expect(Math.abs(r.latencyS! - 3)).toBeLessThanOrEqual(0.2);
    expect(Math.abs(r.metresAtOldRate! - 6.706)).toBeLessThanOrEqual(0.07); // DOMAIN.md §6 (derived), ±1 %
  });

  it('no lag: latency about 0 and next to nothing planted at the old rate', () => {
    const { c, keep, area } = synth({});
    const r = controllerLag(c, keep, area);
    expect(r.transitions).toBeGreaterThan(25);
    expect(Math.abs(r.latencyS!)).toBeLessThanOrEqual(0.5);
    expect(r.areaAffectedM2).toBe(0);
    expect(r.metresAtOldRate!).toBeLessThan(1.2); // under half a second at 5 mph
  });

  it('step fitting holds under noise in the applied rate (2 %, against a 20 % step)', () => {
    const { c, keep, area } = synth({ seed: 9, faults: { lagS: 5, noiseCv: 0.02 } });
    const r = controllerLag(c, keep, area);
    expect(Math.abs(r.latencyS! - 5)).toBeLessThanOrEqual(0.5);
  });

  it('times a controller that sits off target: the disc capped between the two rates', () => {
    // Applied steps between 30 000 and a 32 000 cap, never reaching 33 000, halfway between the targets: the
    // crossing is timed halfway between the levels it held (31 000).
    const { c, keep, area } = synth({ faults: { lagS: 3, discLimitSi: 32_000 / ACRE_M2 } });
    const r = controllerLag(c, keep, area);
    expect(r.transitions).toBeGreaterThan(25);
    expect(Math.abs(r.latencyS! - 3)).toBeLessThanOrEqual(0.5);
    // The quantity still counts the target step: |36 000 − 30 000| per acre over the area affected.
    expect(r.quantityAffected).toBeCloseTo((HIGH - LOW) * r.areaAffectedM2, 6);
  });

  /** A 1 Hz straight line at 2 m/s: the target steps from 10 to 12 at point `at`; applied from `applied(t)`. */
  function step(opts: {
    n?: number;
    at?: number;
    to?: number;
    maxLagS?: number;
    applied: (t: number) => number;
  }) {
    const n = opts.n ?? 40;
    const at = opts.at ?? 10;
    const c = emptyColumns(n, { gnssMps: true });
    for (let i = 0; i < n; i++) {
      c.t[i] = i;
      c.lon[i] = ORIGIN[0] + i * 2.4e-5;
      c.lat[i] = ORIGIN[1];
      c.gnssMps![i] = 2;
      c.target[i] = i < at ? 10 : (opts.to ?? 12);
      c.applied[i] = opts.applied(i);
    }
    const lagOpts = opts.maxLagS === undefined ? undefined : { maxLagS: opts.maxLagS };
    return controllerLag(c, new Uint8Array(n).fill(1), new Float64Array(n).fill(1), lagOpts);
  }

  it('interpolates the halfway crossing of a ramp', () => {
    // Target changes between t = 9 and t = 10 (at 9.5); applied ramps 10 → 12 from t = 11 to t = 15, halfway
    // (11) at t = 13: latency 13 − 9.5 = 3.5 s (by hand).
    const r = step({ applied: (t) => 10 + 2 * Math.min(1, Math.max(0, (t - 11) / 4)) });
    expect(r.transitions).toBe(1);
    expect(r.latencyS).toBeCloseTo(3.5, 9);
    expect(r.spreadS).toBe(0);
    expect(r.metresAtOldRate).toBeCloseTo(2 * 3.5, 9); // 2 m/s × 3.5 s
    // Points at t = 10, 11, 12 stand before the crossing, 1 m² each; quantity |12 − 10| × 3.
    expect(r.areaAffectedM2).toBe(3);
    expect(r.quantityAffected).toBe(6);
    expect(r.perTransition).toEqual([{ t: 9.5, latencyS: r.latencyS }]);
  });

  it('passes over steps that are too small, too short, or never followed within maxLagS', () => {
    const follows = (t: number) => (t < 13 ? 10 : 12);
    expect(step({ applied: follows }).transitions).toBe(1);
    // A 4 % step is under the 5 % default.
    const small = step({ to: 10.4, applied: (t) => (t < 13 ? 10 : 10.4) });
    expect(small.transitions).toBe(0);
    expect(small.latencyS).toBeNull();
    // A 5 % step counts.
    expect(step({ to: 10.5, applied: (t) => (t < 13 ? 10 : 10.5) }).transitions).toBe(1);
    // Only 2 s steady before the change.
    expect(step({ at: 2, applied: (t) => (t < 5 ? 10 : 12) }).transitions).toBe(0);
    // Applied never moves.
    const never = step({ applied: () => 10 });
    expect(never).toMatchObject({ transitions: 0, latencyS: null, spreadS: null, metresAtOldRate: null });
    // Applied follows after 20 s: beyond the 15 s default, within a 25 s maxLagS.
    const late = (t: number) => (t < 30 ? 10 : 12);
    expect(step({ applied: late }).transitions).toBe(0);
    // Crossing halfway at 29.5 s for a change at 9.5 s: 20 s (by hand).
    const wide = step({ n: 45, maxLagS: 25, applied: late });
    expect(wide.transitions).toBe(1);
    expect(wide.latencyS).toBe(20);
  });

  it('the median and interquartile range are those of the per-transition latencies', () => {
    const { c, keep, area } = synth({ seed: 21, faults: { lagS: 2, noiseCv: 0.03 } });
    const r = controllerLag(c, keep, area);
    const sorted = r.perTransition.map((p) => p.latencyS).sort((a, b) => a - b);
    expect(sorted.length).toBe(r.transitions); // under the 200 cap
    expect(r.latencyS).toBe(quantileSorted(sorted, 0.5));
    expect(r.spreadS).toBe(quantileSorted(sorted, 0.75) - quantileSorted(sorted, 0.25));
    // R type 7 quantiles of 1…4 (by hand): median 2.5, quartiles 1.75 and 3.25.
    expect([0.25, 0.5, 0.75].map((q) => quantileSorted([1, 2, 3, 4], q))).toEqual([1.75, 2.5, 3.25]);
  });

  it('says what is wrong with its input', () => {
    const { c, keep, area } = synth({});
    expect(() => controllerLag(c, keep.subarray(1), area)).toThrow(
      /keep \(\d+\) and area .* one entry per point/,
    );
    expect(() => controllerLag(c, keep, area, { minStepFraction: 5 })).toThrow(
      /smallest step must be a fraction/,
    );
    expect(() => controllerLag(c, keep, area, { maxLagS: 0 })).toThrow(/longest lag must be positive/);
  });
});
