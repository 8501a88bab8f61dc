/**
 * Cleaning in FORMATS.md's order: each step removes exactly the bad points injected for it, and a point counts
 * against the first step that removes it. The log is built by hand: 1 Hz, 2.5 m/s, one pass east, a headland
 * turn, one pass west (times 0…119 s).
 */
import { describe, expect, it } from 'vitest';
import type { MultiPolygon } from 'geojson';
import { cleanLog } from '../../shared/audit/clean-log';
import { emptyColumns, type LogColumns } from '../../shared/audit/log-columns';
import { syntheticLog } from '../../shared/audit/synthetic-log';
import { OUT_OF_FIELD, zoneIndexOf } from '../../shared/audit/zone-join';
import { metresPerDegree } from '../../shared/geo/interpolate-idw';
import { ringFromOffsets } from '../../shared/geo/offset-position';
import { CLEANING_STEPS, cleaningSettingsSchema } from '../../shared/schemas/as-applied.schema';
import { perAcToPerM2 } from '../../shared/units';

const DEFAULTS = cleaningSettingsSchema.parse({});
const LON0 = -93.6;
const LAT0 = 42.0;
const M = metresPerDegree(LAT0);
const T0 = 1_760_000_000; // an invented morning, seconds since the epoch

const range = (a: number, b: number) => Array.from({ length: b - a + 1 }, (_, k) => a + k);

/** What each fault is and the times (s after T0) it covers. */
const STOP = range(20, 29); // standing still
const WORK_OFF = range(40, 42);
const TURN = range(60, 63); // 45°/s, faster than the 20°/s setting
const TARGET_CHANGE_AT = 90;
const BAD_RATIO = [100, 101]; // applied 10 % of target; applied missing
const OUTSIDE = 110;
const DUPLICATE_OF = 50;

/**
 * The log, in a shuffled order. `withHeadingAndGnss` false leaves only positions: speed and heading then come
 * from the positions.
 */
function handLog(withHeadingAndGnss: boolean): { c: LogColumns; zone: Int16Array; dupApplied: number } {
  const times = range(0, 119);
  const n = times.length + 1; // + the duplicate
  const c = emptyColumns(n, { heading: withHeadingAndGnss, gnssMps: withHeadingAndGnss, workOn: true });
  const zone = new Int16Array(n);
  const high = perAcToPerM2(34_000);
  const low = perAcToPerM2(30_000);
  const dupApplied = high * 1.01;
  let x = 0;
  let y = 0;
  const rows: { t: number; x: number; y: number; h: number; v: number }[] = [];
  for (const t of times) {
    let h = t < 60 ? 90 : 270;
    if (TURN.includes(t)) h = 90 + 45 * (t - 59);
    const v = STOP.includes(t) ? 0 : 2.5;
    x += v * Math.sin((h * Math.PI) / 180);
    y += v * Math.cos((h * Math.PI) / 180);
    rows.push({ t, x, y, h, v });
  }
  rows.push({ ...rows[DUPLICATE_OF] });
  // A fixed shuffle: every 7th row first, then the rest backwards; the duplicate last, so its twin comes first
  // in the file and is the one kept.
  const order = [
    ...range(0, n - 2).filter((i) => i % 7 === 0),
    ...range(0, n - 2)
      .filter((i) => i % 7)
      .reverse(),
    n - 1,
  ];
  order.forEach((src, k) => {
    const r = rows[src];
    c.t[k] = T0 + r.t;
    c.lon[k] = LON0 + r.x / M.lon;
    c.lat[k] = LAT0 + r.y / M.lat;
    if (c.heading) c.heading[k] = r.h;
    if (c.gnssMps) c.gnssMps[k] = r.v;
    c.workOn![k] = WORK_OFF.includes(r.t) ? 0 : 1;
    c.target[k] = r.t >= TARGET_CHANGE_AT ? low : high;
    c.applied[k] = c.target[k] * 1.02;
    if (r.t === BAD_RATIO[0]) c.applied[k] = c.target[k] * 0.1;
    if (r.t === BAD_RATIO[1]) c.applied[k] = Number.NaN;
    if (src === n - 1) c.applied[k] = dupApplied;
    zone[k] = r.t === OUTSIDE ? OUT_OF_FIELD : 0;
  });
  return { c, zone, dupApplied };
}

/** Times (s after T0) of the points a step removed. */
function removedTimes(r: ReturnType<typeof cleanLog>, step: (typeof CLEANING_STEPS)[number]) {
  const code = CLEANING_STEPS.indexOf(step) + 1;
  const out: number[] = [];
  for (let i = 0; i < r.columns.n; i++) if (r.removedBy[i] === code) out.push(r.columns.t[i] - T0);
  return out;
}

describe('cleanLog', () => {
  for (const full of [true, false]) {
    it(`removes exactly the injected points, step by step (${full ? 'heading and GNSS speed' : 'positions only'})`, () => {
      const { c, zone, dupApplied } = handLog(full);
      const r = cleanLog(c, DEFAULTS, zone);

      // Sorted by time, the zone array carried along.
      for (let i = 1; i < r.columns.n; i++) expect(r.columns.t[i]).toBeGreaterThanOrEqual(r.columns.t[i - 1]);
      for (let i = 0; i < r.columns.n; i++) {
        expect(r.zone![i]).toBe(r.columns.t[i] - T0 === OUTSIDE ? OUT_OF_FIELD : 0);
      }

      // 1. The duplicate (its second copy, told apart by its applied rate) and nothing else.
      const dup = range(0, r.columns.n - 1).filter((i) => r.removedBy[i] === 1);
      expect(dup.length).toBe(1);
      expect(r.columns.applied[dup[0]]).toBe(dupApplied);
      expect(r.columns.t[dup[0]] - T0).toBe(DUPLICATE_OF);
      // 2. Work switch off.
      expect(removedTimes(r, 'work-off')).toEqual(WORK_OFF);
      // 3. The stop, and the first point after it (0 → 2.5 m/s in 1 s is over 1.5 m/s²).
      expect(removedTimes(r, 'speed')).toEqual([...STOP, 30]);
      // 4. Passes 0–19, 31–59 and 64–119 (the stop's 11 s gap splits; the 4 s work-off gap does not): first 3 s
      //    and last 2 s of each (defaults), and the turn.
      expect(removedTimes(r, 'pass-ends')).toEqual([
        0,
        1,
        2,
        18,
        19,
        31,
        32,
        33,
        58,
        59,
        ...TURN,
        64,
        65,
        66,
        118,
        119,
      ]);
      // 5. 3 s from the change of target.
      expect(removedTimes(r, 'target-change')).toEqual([90, 91, 92]);
      expect(removedTimes(r, 'plausibility')).toEqual(BAD_RATIO);
      expect(removedTimes(r, 'boundary')).toEqual([OUTSIDE]);

      // keep is the complement of removedBy, and the report counts what each step removed.
      for (let i = 0; i < r.columns.n; i++) expect(r.keep[i]).toBe(r.removedBy[i] === 0 ? 1 : 0);
      expect(r.report.map((s) => s.removed)).toEqual([1, 3, 11, 19, 3, 2, 1]);
      expect(r.report.map((s) => s.step)).toEqual([...CLEANING_STEPS]);
    });
  }

  it('states each setting in words', () => {
    const { c, zone } = handLog(true);
    const r = cleanLog(c, DEFAULTS, zone);
    const setting = Object.fromEntries(r.report.map((s) => [s.step, s.setting]));
    expect(setting.speed).toBe('0.9–5.4 m/s, at most 1.5 m/s²');
    expect(setting['pass-ends']).toContain('first 3 s and last 2 s');
    expect(setting['target-change']).toBe('3 s after each change of target');
    expect(setting.plausibility).toBe('applied ÷ target from 0.3 to 3');
    expect(r.report[0].label).toMatch(/Sorted by time/);
  });

  it('keeps points outside the boundary when told to, and with no zone array', () => {
    const { c, zone } = handLog(true);
    const off = cleanLog(c, { ...DEFAULTS, clipToBoundary: false }, zone);
    expect(off.report.find((s) => s.step === 'boundary')!.removed).toBe(0);
    expect(off.report.find((s) => s.step === 'boundary')!.setting).toMatch(/off/);
    const none = cleanLog(c, DEFAULTS, null);
    expect(none.zone).toBeNull();
    expect(none.report.find((s) => s.step === 'boundary')!.removed).toBe(0);
  });

  it('drops points without a time and refuses a zone array of the wrong length', () => {
    const c = emptyColumns(3);
    c.t.set([T0 + 2, Number.NaN, T0 + 1]);
    c.lon.fill(LON0);
    c.lat.fill(LAT0);
    c.target.fill(1);
    c.applied.fill(1);
    const r = cleanLog(c, { ...DEFAULTS, trimPassStartS: 0, trimPassEndS: 0 }, null);
    expect([...r.columns.t.subarray(0, 2)]).toEqual([T0 + 1, T0 + 2]);
    expect(Number.isNaN(r.columns.t[2])).toBe(true);
    expect(r.removedBy[2]).toBe(1);
    expect(() => cleanLog(c, DEFAULTS, new Int16Array(2))).toThrow(/2 entries for a log of 3 points/);
  });
});

describe('cleanLog on a synthetic log', () => {
  // A 400 m × 300 m field of our own (invented) with a zone across its middle; 12 m swath, 2.5 m/s, 1 Hz.
  const origin: [number, number] = [-93.61, 41.99];
  const rect = (e0: number, n0: number, e1: number, n1: number): MultiPolygon => ({
    type: 'MultiPolygon',
    coordinates: [
      [
        ringFromOffsets(origin, [
          [e0, n0],
          [e1, n0],
          [e1, n1],
          [e0, n1],
        ]),
      ],
    ],
  });
  const field = rect(0, 0, 400, 300);
  const zones = [{ geometry: rect(150, -10, 250, 310), targetSi: perAcToPerM2(38_000) }];
  const make = (lagS: number) => {
    const log = syntheticLog({
      boundary: field,
      zones,
      defaultTargetSi: perAcToPerM2(32_000),
      swathM: 12,
      speedMps: 2.5,
      hz: 1,
      startTime: T0,
      seed: 11,
      faults: { lagS },
    });
    return {
      log,
      zone: zoneIndexOf(
        log.lon,
        log.lat,
        zones.map((z) => z.geometry),
        field,
      ),
    };
  };

  it('work off takes the turns, pass ends 3 + 2 s of each of the 25 passes; nothing else is bad', () => {
    const { log, zone } = make(0);
    const r = cleanLog(log, DEFAULTS, zone);
    const count = (step: string) => r.report.find((s) => s.step === step)!.removed;
    let turns = 0;
    for (let i = 0; i < log.n; i++) turns += log.workOn![i] === 0 ? 1 : 0;
    expect(turns).toBeGreaterThan(0);
    expect(count('work-off')).toBe(turns);
    for (let i = 0; i < r.columns.n; i++) {
      if (r.columns.workOn![i] === 0) expect(r.removedBy[i]).toBe(2);
    }
    expect(count('pass-ends')).toBe(25 * 5); // 300 m ÷ 12 m = 25 passes; 3 s + 2 s at 1 Hz (derived)
    expect(count('speed')).toBe(0);
    expect(count('plausibility')).toBe(0);
    expect(count('boundary')).toBe(0);
    // Each pass crosses the zone twice: two changes of target, 3 points each (pass ends overlap none).
    expect(count('target-change')).toBe(25 * 2 * 3);
  });

  it('the window after a change of target takes out a controller lag of 2 s', () => {
    const { log, zone } = make(2);
    const offTarget = (settings: typeof DEFAULTS) => {
      const r = cleanLog(log, settings, zone);
      let off = 0;
      for (let i = 0; i < r.columns.n; i++) {
        if (r.keep[i] && Math.abs(r.columns.applied[i] / r.columns.target[i] - 1) > 1e-12) off++;
      }
      return off;
    };
    expect(offTarget({ ...DEFAULTS, afterTargetChangeS: 0 })).toBe(25 * 2 * 2); // 2 lagging points a change
    expect(offTarget(DEFAULTS)).toBe(0);
  });
});

describe('cleanLog: turns by heading', () => {
  /** 1 Hz, 2.5 m/s northward, with the logged headings given (degrees). */
  const northward = (headings: number[]): LogColumns => {
    const n = headings.length;
    const c = emptyColumns(n, { heading: true, gnssMps: true });
    for (let i = 0; i < n; i++) {
      c.t[i] = T0 + i;
      c.lon[i] = LON0;
      c.lat[i] = LAT0 + (2.5 * i) / M.lat;
      c.heading![i] = headings[i];
      c.gnssMps![i] = 2.5;
      c.target[i] = perAcToPerM2(32_000);
      c.applied[i] = perAcToPerM2(32_000);
    }
    return c;
  };
  const settings = { ...DEFAULTS, trimPassStartS: 0, trimPassEndS: 0, afterTargetChangeS: 0 };
  const passEnds = (headings: number[]) => {
    const r = cleanLog(northward(headings), settings, null);
    const code = CLEANING_STEPS.indexOf('pass-ends') + 1;
    return [...r.removedBy].flatMap((b, i) => (b === code ? [i] : []));
  };

  it('takes the short way round through north, and either sign of a full turn (DOMAIN: a turn is the heading changing faster than turnDegPerS)', () => {
    // 359° → 1° → 359° … is 2° a second, not 358°: nothing goes.
    expect(passEnds([359, 1, 359, 1, 359, 1, 359, 1])).toEqual([]);
    // The same heading written as −360°, 0° or 720° is no change at all.
    expect(passEnds([10, -350, 370, 730, -710, 10, 10, 10])).toEqual([]);
    // 90° in one second (faster than the default 20°/s) is a turn, clockwise or not, across north or not.
    expect(passEnds([0, 0, 90, 90, 90, 90, 90, 90])).toEqual([2]);
    expect(passEnds([350, 350, 260, 260, 260, 260, 260, 260])).toEqual([2]);
    expect(passEnds([300, 300, 30, 30, 30, 30, 30, 30])).toEqual([2]);
    // 19° a second stays under the setting; 21° a second is over it at every step.
    expect(passEnds([0, 19, 38, 57, 76, 95])).toEqual([]);
    expect(passEnds([350, 11, 32, 53, 74, 95])).toEqual([1, 2, 3, 4, 5]);
  });
});
