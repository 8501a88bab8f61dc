/**
 * Alarm replay (DOMAIN.md §6): an alarm fires when the rate stays outside the band for at least the delay.
 * Hand-built 1 Hz logs with episodes of known length, and a property on a noisy synthetic log.
 */
import { describe, expect, it } from 'vitest';
import type { MultiPolygon } from 'geojson';
import { MAX_ALARMS_LISTED, replayAlarms } from '../../shared/audit/alarm-replay';
import { pointAreas } from '../../shared/audit/audit-log';
import { cleanLog } from '../../shared/audit/clean-log';
import { emptyColumns } from '../../shared/audit/log-columns';
import { syntheticLog } from '../../shared/audit/synthetic-log';
import { zoneIndexOf } from '../../shared/audit/zone-join';
import { ringFromOffsets } from '../../shared/geo/offset-position';
import { alarmReplaySchema, cleaningSettingsSchema } from '../../shared/schemas/as-applied.schema';

/** ±15 % band with a 2 s delay, often raised to 30 s: DOMAIN.md §6 (common practice). */
const BAND = 0.15;
const SHORT_DELAY_S = 2;
const LONG_DELAY_S = 30;
const T0 = 1_760_000_000;
const TARGET = 8; // seeds/m², invented

type Piece = { seconds: number; ratio: number; gapBeforeS?: number };

/**
 * A 1 Hz log built from pieces of constant applied ÷ target (one point per second). `gapBeforeS` puts that
 * much time between the previous point and the piece's first. Zone: the index of the piece.
 */
function build(pieces: Piece[]) {
  const n = pieces.reduce((s, p) => s + p.seconds, 0);
  const c = emptyColumns(n);
  const zone = new Int16Array(n);
  const starts: number[] = [];
  let i = 0;
  let t = T0;
  pieces.forEach((p, k) => {
    if (p.gapBeforeS !== undefined) t += p.gapBeforeS - 1;
    starts.push(i);
    for (let s = 0; s < p.seconds; s++, i++, t++) {
      c.t[i] = t;
      c.lon[i] = -93.6 + i * 1e-5;
      c.lat[i] = 42;
      c.target[i] = TARGET;
      c.applied[i] = TARGET * p.ratio;
      zone[i] = k;
    }
  });
  return { c, zone, starts, keep: new Uint8Array(n).fill(1) };
}

const IN = 1.02;
/** In-band stretches of 5 s between out-of-band episodes of 1, 3, 10 and 40 s (over, under, over, under). */
const EPISODES: Piece[] = [
  { seconds: 5, ratio: IN },
  { seconds: 1, ratio: 1.3 },
  { seconds: 5, ratio: IN },
  { seconds: 3, ratio: 0.7 },
  { seconds: 5, ratio: IN },
  { seconds: 10, ratio: 1.2 },
  { seconds: 5, ratio: IN },
  { seconds: 40, ratio: 0.8 },
  { seconds: 5, ratio: IN },
];

describe('replayAlarms', () => {
  const log = build(EPISODES);
  const ones = new Float64Array(log.c.n).fill(1);
  const replay = (delayS: number, area = ones) =>
    replayAlarms(log.c, log.keep, log.zone, area, { bandFraction: BAND, delayS });

  it('episodes of 1, 3, 10 and 40 s: three alarms with a 2 s delay, one with 30 s', () => {
    const short = replay(SHORT_DELAY_S);
    expect(alarmReplaySchema.parse(short)).toEqual(short);
    expect(short.count).toBe(3);
    expect(short.alarms.map((a) => a.durationS)).toEqual([3, 10, 40]);
    // Each begins where its episode began: pieces 3, 5 and 7.
    expect(short.alarms.map((a) => a.startT)).toEqual([3, 5, 7].map((k) => log.c.t[log.starts[k]]));
    expect(short.alarms.map((a) => a.endT - a.startT)).toEqual([3, 10, 40]);
    expect(short.alarms.map((a) => a.zone)).toEqual([3, 5, 7]);
    expect(short.alarms.map((a) => a.direction)).toEqual(['under', 'over', 'under']);
    expect(short.alarms[0].lon).toBe(log.c.lon[log.starts[3]]);
    expect(short.alarms[0].lat).toBe(42);

    const long = replay(LONG_DELAY_S);
    expect(long.count).toBe(1);
    expect(long.alarms[0].durationS).toBe(40);
    expect(long.alarms[0].zone).toBe(7);
  });

  it('out-of-band and unreported time, worked by hand', () => {
    const short = replay(SHORT_DELAY_S);
    // Out of band: 1 + 3 + 10 + 40 = 54 s (by hand).
    expect(short.outOfBandTimeS).toBe(54);
    // 2 s delay: the 1 s episode whole, plus the first 2 s of each of the three alarms: 1 + 2 × 3 = 7 s (by hand).
    expect(short.unreportedTimeS).toBe(7);
    // 30 s delay: 1 + 3 + 10 whole, and the first 30 s of the 40 s one: 44 s (by hand).
    const long = replay(LONG_DELAY_S);
    expect(long.unreportedTimeS).toBe(44);
    expect(long.outOfBandTimeS).toBe(54);
    // With a delay of 0 every episode is an alarm and nothing goes unreported.
    const none = replay(0);
    expect(none.count).toBe(4);
    expect(none.unreportedTimeS).toBe(0);
  });

  it('weights by the area of each point, not by the count', () => {
    // Point i stands for i + 1 m² (invented, all different).
    const area = Float64Array.from({ length: log.c.n }, (_, i) => i + 1);
    const r = replay(SHORT_DELAY_S, area);
    // Sum the areas of the points of each episode, and of its first min(length, delay) points, directly.
    let out = 0;
    let unreported = 0;
    for (const k of [1, 3, 5, 7]) {
      for (let s = 0; s < EPISODES[k].seconds; s++) {
        const a = log.starts[k] + s + 1;
        out += a;
        if (s < SHORT_DELAY_S) unreported += a;
      }
    }
    expect(r.outOfBandAreaM2).toBe(out);
    expect(r.unreportedAreaM2).toBe(unreported);
    expect(r.unreportedAreaM2).not.toBe(r.unreportedTimeS); // the count would give 7
  });

  it('a pass gap longer than passGapS splits an episode', () => {
    // Two runs of 2 s out of band with 10 s between them (a turn): neither reaches a 3 s delay.
    const split = build([
      { seconds: 3, ratio: IN },
      { seconds: 2, ratio: 1.4 },
      { seconds: 2, ratio: 1.4, gapBeforeS: 10 },
      { seconds: 3, ratio: IN },
    ]);
    const ones2 = new Float64Array(split.c.n).fill(1);
    const opts = { bandFraction: BAND, delayS: 3 };
    const apart = replayAlarms(split.c, split.keep, split.zone, ones2, opts);
    expect(apart.count).toBe(0);
    // Each point before the gap still stands for the typical 1 s step: 4 s out of band in all.
    expect(apart.outOfBandTimeS).toBe(4);
    // The same with a gap of 1 s: one episode of 4 s, one alarm.
    const joined = build([
      { seconds: 3, ratio: IN },
      { seconds: 2, ratio: 1.4 },
      { seconds: 2, ratio: 1.4, gapBeforeS: 1 },
      { seconds: 3, ratio: IN },
    ]);
    const together = replayAlarms(joined.c, joined.keep, joined.zone, ones2, opts);
    expect(together.count).toBe(1);
    expect(together.alarms[0].durationS).toBe(4);
    // A 10 s gap within a 15 s passGapS joins them too (the gap point then stands for 10 s).
    const wide = replayAlarms(split.c, split.keep, split.zone, ones2, { ...opts, passGapS: 15 });
    expect(wide.count).toBe(1);
    expect(wide.alarms[0].durationS).toBe(13);
  });

  it('removed points are not replayed; an in-band point ends an episode', () => {
    const keep = log.keep.slice();
    // Drop the last 20 s of the 40 s episode: the next kept point is 21 s later (a gap over 5 s), so the episode
    // ends after its 20 kept points (the last standing for the typical 1 s step) and stays under 30 s.
    for (let s = 20; s < 40; s++) keep[log.starts[7] + s] = 0;
    const r = replayAlarms(log.c, keep, log.zone, ones, { bandFraction: BAND, delayS: LONG_DELAY_S });
    expect(r.count).toBe(0);
    expect(r.outOfBandTimeS).toBe(1 + 3 + 10 + 20);
    const flip = build([
      { seconds: 3, ratio: 0.5 },
      { seconds: 1, ratio: 1 },
      { seconds: 3, ratio: 0.5 },
    ]);
    const f = replayAlarms(flip.c, flip.keep, flip.zone, new Float64Array(7).fill(1), {
      bandFraction: BAND,
      delayS: 3,
    });
    expect(f.count).toBe(2);
  });

  it('lists at most 500 alarms and counts them all', () => {
    const pieces: Piece[] = [];
    for (let k = 0; k < 600; k++) pieces.push({ seconds: 2, ratio: IN }, { seconds: 3, ratio: 1.5 });
    const many = build(pieces);
    const r = replayAlarms(many.c, many.keep, many.zone, new Float64Array(many.c.n).fill(1), {
      bandFraction: BAND,
      delayS: SHORT_DELAY_S,
    });
    expect(r.count).toBe(600);
    expect(r.alarms).toHaveLength(MAX_ALARMS_LISTED);
    expect(MAX_ALARMS_LISTED).toBe(500);
    // Listed alarms are spread over the whole log: the first and the last alarm are among them, in order.
    const all = replayAlarms(many.c, many.keep, many.zone, new Float64Array(many.c.n).fill(1), {
      bandFraction: BAND,
      delayS: SHORT_DELAY_S,
    }).alarms;
    expect(all[0].startT).toBe(many.c.t[2]);
    expect(all[all.length - 1].startT).toBeGreaterThan(many.c.t[many.c.n - 10]);
    for (let i = 1; i < all.length; i++) expect(all[i].startT).toBeGreaterThan(all[i - 1].startT);
  });

  it('says what is wrong with its input', () => {
    expect(() =>
      replayAlarms(log.c, log.keep.subarray(1), log.zone, ones, { bandFraction: BAND, delayS: 2 }),
    ).toThrow(/keep \(78\).*one entry per point \(79\)/);
    expect(() => replay(-1)).toThrow(/delay must be 0 s or more, got -1/);
    expect(() => replayAlarms(log.c, log.keep, log.zone, ones, { bandFraction: 15, delayS: 2 })).toThrow(
      /band must be a fraction/,
    );
  });

  it('on a noisy synthetic log the alarm count falls as the delay rises', () => {
    const field: MultiPolygon = {
      type: 'MultiPolygon',
      coordinates: [
        [
          ringFromOffsets(
            [-93.6, 42],
            [
              [0, 0],
              [400, 0],
              [400, 300],
              [0, 300],
            ],
          ),
        ],
      ],
    };
    const raw = syntheticLog({
      boundary: field,
      zones: [],
      defaultTargetSi: TARGET,
      swathM: 12,
      speedMps: 2.2352,
      hz: 1,
      startTime: T0,
      seed: 11,
      faults: { noiseCv: 0.1 },
    });
    const cleaned = cleanLog(raw, cleaningSettingsSchema.parse({}), zoneIndexOf(raw.lon, raw.lat, [], field));
    const area = pointAreas(cleaned.columns, 12);
    const counts = [0, 1, 2, 3, 5, 10, 30].map(
      (delayS) =>
        replayAlarms(cleaned.columns, cleaned.keep, cleaned.zone!, area, { bandFraction: BAND, delayS })
          .count,
    );
    for (let k = 1; k < counts.length; k++) expect(counts[k]).toBeLessThanOrEqual(counts[k - 1]);
    expect(counts[0]).toBeGreaterThan(counts[2]);
    expect(counts[2]).toBeGreaterThan(counts.at(-1)!);
  });
});
