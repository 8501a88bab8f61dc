import { describe, expect, it } from 'vitest';
import geodesic from 'geographiclib-geodesic';
import { booleanPointInPolygon } from '@turf/turf';
import type { MultiPolygon } from 'geojson';
import {
  TURN_S,
  TURN_SPEED_MPS,
  syntheticLog,
  type SyntheticLogOptions,
} from '../../shared/audit/synthetic-log';
import { SPEED_SOURCE_CODE, type LogColumns } from '../../shared/audit/log-columns';
import { ringFromOffsets } from '../../shared/geo/offset-position';

const { Geodesic } = geodesic;
const ORIGIN: [number, number] = [-93.6, 42];
const area = (offsets: [number, number][]): MultiPolygon => ({
  type: 'MultiPolygon',
  coordinates: [[ringFromOffsets(ORIGIN, offsets)]],
});
/** An L-shaped field (a notch in the north-east corner), 400 m × 300 m at most. */
const FIELD = area([
  [0, 0],
  [400, 0],
  [400, 180],
  [260, 180],
  [260, 300],
  [0, 300],
]);
/** The western half of the field's box, to 200 m east. */
const WEST = area([
  [-10, -10],
  [200, -10],
  [200, 310],
  [-10, 310],
]);
const SEEDS_34K = 34_000 / 4046.8564224; // seeds/m² (NIST SP 811 acre)
const SEEDS_36K = 36_000 / 4046.8564224;

const base = (over: Partial<SyntheticLogOptions> = {}): SyntheticLogOptions => ({
  boundary: FIELD,
  zones: [{ geometry: WEST, targetSi: SEEDS_34K }],
  defaultTargetSi: SEEDS_36K,
  swathM: 9.144, // 12 rows × 30 in (NIST SP 811: 1 in = 0.0254 m)
  speedMps: 2.2352, // 5 mph (NIST SP 811 B.8, exact)
  hz: 1,
  startTime: Date.UTC(2027, 3, 28, 13) / 1000,
  seed: 7,
  ...over,
});

const inside = (g: MultiPolygon, lon: number, lat: number) => booleanPointInPolygon([lon, lat], g);
const working = (c: LogColumns) => [...Array(c.n).keys()].filter((i) => c.workOn![i] === 1);
const mean = (v: number[]) => v.reduce((a, b) => a + b, 0) / v.length;
/** Runs of consecutive working points 1/hz apart: the passes. */
function passes(c: LogColumns, hz: number): number[][] {
  const out: number[][] = [];
  for (const i of working(c)) {
    const run = out.at(-1);
    if (run && run.at(-1) === i - 1 && Math.abs(c.t[i] - c.t[i - 1] - 1 / hz) < 1e-6) run.push(i);
    else out.push([i]);
  }
  return out;
}

describe('syntheticLog', () => {
  it('is deterministic: the same options give the same arrays, another seed others', () => {
    const opts = base({ faults: { noiseCv: 0.03, lagS: 2, lowRow: { row: 3, factor: 0.8, rowCount: 6 } } });
    const a = syntheticLog(opts);
    const b = syntheticLog(opts);
    expect(b).toEqual(a);
    const c = syntheticLog({ ...opts, seed: 8 });
    expect(c.applied).not.toEqual(a.applied);
  });

  it('fills every column the audit reads, in SI, with exact-length arrays', () => {
    const c = syntheticLog(base());
    expect(c.n).toBeGreaterThan(1000);
    for (const a of [c.t, c.lon, c.lat, c.heading!, c.target, c.applied, c.wheelMps!, c.gnssMps!, c.widthM!])
      expect(a.length).toBe(c.n);
    expect(c.speedMps).toBeNull();
    expect(c.sectionsOn).toBeNull();
    expect(c.rows).toEqual([]);
    expect(c.t[0]).toBe(Date.UTC(2027, 3, 28, 13) / 1000);
    for (let i = 1; i < c.n; i++) expect(c.t[i]).toBeGreaterThan(c.t[i - 1]);
    expect(new Set(c.widthM)).toEqual(new Set([9.144]));
    expect(new Set(c.speedSource)).toEqual(new Set([SPEED_SOURCE_CODE.gnss]));
  });

  it('plants only inside the boundary; turn points are outside, slow and not planting', () => {
    const c = syntheticLog(base());
    const work = working(c);
    for (const i of work) expect(inside(FIELD, c.lon[i], c.lat[i])).toBe(true);
    const turns = [...Array(c.n).keys()].filter((i) => c.workOn![i] === 0);
    expect(turns.length).toBeGreaterThan(20);
    for (const i of turns) {
      expect(inside(FIELD, c.lon[i], c.lat[i])).toBe(false);
      expect(c.applied[i]).toBe(0);
      expect(Math.abs(c.gnssMps![i] - TURN_SPEED_MPS)).toBeLessThan(0.1);
    }
    // The time jumps by the turn time between passes.
    const runs = passes(c, 1);
    for (let k = 1; k < runs.length; k++)
      expect(c.t[runs[k][0]] - c.t[runs[k - 1].at(-1)!]).toBeCloseTo(TURN_S, 9);
    // Covering the field: the notch (east of 260 m, north of 180 m) has no planted point.
    const [lonNotch, latNotch] = ringFromOffsets(ORIGIN, [[260, 180]])[0];
    expect(work.some((i) => c.lon[i] > lonNotch && c.lat[i] > latNotch)).toBe(false);
    expect(work.some((i) => c.lon[i] > lonNotch)).toBe(true);
  });

  it('spaces east–west passes one swath apart and points speed × 1/hz apart', () => {
    const c = syntheticLog(base({ hz: 2 }));
    const lats = [...new Set(working(c).map((i) => c.lat[i]))].sort((a, b) => a - b);
    expect(lats.length).toBe(Math.floor((300 - 9.144 / 2) / 9.144) + 1); // passes whose line is in the field
    for (let k = 1; k < lats.length; k++)
      expect(Geodesic.WGS84.Inverse(lats[k - 1], -93.6, lats[k], -93.6).s12!).toBeCloseTo(9.144, 6);
    const steps: number[] = [];
    for (const run of passes(c, 2))
      for (let k = 1; k < run.length; k++) {
        const [i, j] = [run[k - 1], run[k]];
        const d = Geodesic.WGS84.Inverse(c.lat[i], c.lon[i], c.lat[j], c.lon[j]).s12!;
        // The step is the true speed × 1/hz; the GNSS speed reads it within a few mm/s (invented noise).
        expect(Math.abs(d - c.gnssMps![i] / 2)).toBeLessThan(0.02);
        steps.push(d);
      }
    expect(mean(steps)).toBeCloseTo(2.2352 / 2, 2);
    expect(new Set(working(c).map((i) => c.heading![i]))).toEqual(new Set([90, 270]));
  });

  it('runs north–south passes when asked', () => {
    const c = syntheticLog(base({ headingAlongLat: true }));
    expect(new Set(working(c).map((i) => c.heading![i]))).toEqual(new Set([0, 180]));
    const lons = [...new Set(working(c).map((i) => c.lon[i]))].sort((a, b) => a - b);
    expect(lons.length).toBe(Math.floor((400 - 9.144 / 2) / 9.144) + 1);
    const midLat = mean(working(c).map((i) => c.lat[i]));
    for (let k = 1; k < lons.length; k++)
      expect(
        Math.abs(Geodesic.WGS84.Inverse(midLat, lons[k - 1], midLat, lons[k]).s12! - 9.144),
      ).toBeLessThan(0.005);
    for (const i of working(c)) expect(inside(FIELD, c.lon[i], c.lat[i])).toBe(true);
  });

  it('gives each point the target of the zone holding it', () => {
    const c = syntheticLog(base());
    for (const i of working(c))
      expect(c.target[i]).toBe(inside(WEST, c.lon[i], c.lat[i]) ? SEEDS_34K : SEEDS_36K);
    // Without faults the applied rate is the target.
    for (const i of working(c)) expect(c.applied[i]).toBe(c.target[i]);
  });

  it('slip: the wheel reads 1 / (1 − s) of the GNSS speed and the logged rate stays at target', () => {
    const c = syntheticLog(base({ faults: { slip: { fraction: 0.1 } } }));
    const work = working(c);
    const ratio = mean(work.map((i) => c.wheelMps![i])) / mean(work.map((i) => c.gnssMps![i]));
    // DOMAIN.md §5 (derived): 10 % slip turns 34 000 into 37 778 seeds/ac, not 37 400.
    expect(34_000 * ratio).toBeCloseTo(37_778, 0);
    expect(34_000 * ratio).not.toBeCloseTo(37_400, -1);
    for (const i of work) expect(c.applied[i]).toBe(c.target[i]); // the log hides the error
    expect(new Set(c.speedSource)).toEqual(new Set([SPEED_SOURCE_CODE.wheel]));
  });

  it('slip only where asked', () => {
    const c = syntheticLog(base({ faults: { slip: { fraction: 0.02, where: WEST } } }));
    const work = working(c);
    const west = work.filter((i) => inside(WEST, c.lon[i], c.lat[i]));
    const east = work.filter((i) => !inside(WEST, c.lon[i], c.lat[i]));
    const ratio = (ix: number[]) => mean(ix.map((i) => c.wheelMps![i])) / mean(ix.map((i) => c.gnssMps![i]));
    expect(34_000 * ratio(west)).toBeCloseTo(34_694, 0); // DOMAIN.md §5 (derived): 2 % slip gives 34 694
    expect(ratio(east)).toBeCloseTo(1, 4);
  });

  it('lag: the applied step follows the target step lagS × hz points later', () => {
    const hz = 2;
    const lagS = 3;
    const c = syntheticLog(base({ hz, faults: { lagS } }));
    let steps = 0;
    for (const run of passes(c, hz))
      for (let k = 1; k < run.length; k++) {
        const [i, before] = [run[k], run[k - 1]];
        if (c.target[i] === c.target[before] || k + lagS * hz >= run.length) continue;
        steps++;
        for (let d = 0; d < lagS * hz; d++) expect(c.applied[run[k + d]]).toBe(c.target[before]);
        expect(c.applied[run[k + lagS * hz]]).toBe(c.target[i]);
      }
    expect(steps).toBeGreaterThan(20); // every pass crosses the zone edge once
  });

  it('disc limit: applied never above it, and at it where the target is higher', () => {
    const limit = (SEEDS_34K + SEEDS_36K) / 2;
    const c = syntheticLog(base({ faults: { discLimitSi: limit, noiseCv: 0.005 } }));
    for (const i of working(c)) {
      expect(c.applied[i]).toBeLessThanOrEqual(limit);
      if (c.target[i] === SEEDS_36K) expect(c.applied[i]).toBe(limit); // 0.5 % noise does not reach 2.8 % below
    }
  });

  it('noise: applied ÷ target varies by about noiseCv', () => {
    const c = syntheticLog(base({ faults: { noiseCv: 0.05 } }));
    const r = working(c).map((i) => c.applied[i] / c.target[i]);
    const m = mean(r);
    const sd = Math.sqrt(mean(r.map((x) => (x - m) ** 2)));
    expect(m).toBeCloseTo(1, 2);
    expect(sd).toBeGreaterThan(0.045);
    expect(sd).toBeLessThan(0.055);
  });

  it('low row: one row at factor × the others, the rows averaging to the logged rate', () => {
    const c = syntheticLog(
      base({ faults: { lowRow: { row: 7, factor: 0.9, rowCount: 12 }, noiseCv: 0.02 } }),
    );
    expect(c.rows.map((r) => [r.row, r.kind])).toEqual(
      Array.from({ length: 12 }, (_, k) => [k + 1, 'population']),
    );
    for (const i of working(c)) {
      expect(c.rows[6].values[i] / c.rows[0].values[i]).toBeCloseTo(0.9, 12);
      expect(c.rows[11].values[i]).toBe(c.rows[0].values[i]);
      expect(mean(c.rows.map((r) => r.values[i]))).toBeCloseTo(c.applied[i], 9);
    }
  });

  it('maxPoints: exactly that many, covering the field again when it runs out', () => {
    const once = syntheticLog(base()).n;
    const c = syntheticLog(base({ maxPoints: once * 2 + 17 }));
    expect(c.n).toBe(once * 2 + 17);
    for (let i = 1; i < c.n; i++) expect(c.t[i]).toBeGreaterThan(c.t[i - 1]);
    expect(syntheticLog(base({ maxPoints: 500 })).n).toBe(500);
  });

  it('refuses a field it cannot pass over', () => {
    const tiny = area([
      [0, 0],
      [5, 0],
      [5, 3],
      [0, 3],
    ]);
    expect(() => syntheticLog(base({ boundary: tiny }))).toThrow(/No pass/);
    expect(() => syntheticLog(base({ swathM: 0 }))).toThrow(/positive/);
  });
});
