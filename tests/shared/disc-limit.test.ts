/**
 * The disc at its limit (DOMAIN.md §4): where applied fell short because the disc would have had to turn faster
 * than its top rpm at the speed driven. A synthetic log with the disc capped, and a hand-built one.
 */
import { describe, expect, it } from 'vitest';
import type { MultiPolygon } from 'geojson';
import { pointAreas } from '../../shared/audit/audit-log';
import { discLimitShortfall } from '../../shared/audit/disc-limit';
import { emptyColumns } from '../../shared/audit/log-columns';
import { syntheticLog } from '../../shared/audit/synthetic-log';
import { zoneIndexOf } from '../../shared/audit/zone-join';
import { ringFromOffsets } from '../../shared/geo/offset-position';
import { DEFAULT_LINE_ID } from '../../shared/rates/totals';
import { discLimitSchema } from '../../shared/schemas/as-applied.schema';

const ORIGIN: [number, number] = [-93.6, 42];
const box = (w: number, s: number, e: number, n: number): MultiPolygon => ({
  type: 'MultiPolygon',
  coordinates: [
    [
      ringFromOffsets(ORIGIN, [
        [w, s],
        [e, s],
        [e, n],
        [w, n],
      ]),
    ],
  ],
});
const FIELD = box(0, 0, 400, 300);
const WEST = box(-10, -10, 200, 310);
const EAST_STRIP = box(330, -10, 410, 310);
const ACRE_M2 = 4046.8564224; // NIST SP 811
const perAc = (v: number) => v / ACRE_M2;
const ROW_M = 0.762; // 30 in (NIST SP 811: 1 in = 0.0254 m)
const HOLES = 30;
const MPH_5 = 2.2352; // NIST SP 811 B.8 (exact)
/** DOMAIN.md §4 worked: 34 000 seeds/ac in 30-in rows at 5 mph turn a 30-hole disc at 28.62 rpm: its top here. */
const RPM_MAX = 28.62;
const PLANTER = { rowSpacingM: ROW_M, holesPerDisc: HOLES, discRpmMax: RPM_MAX };
const BAND = 0.15; // common practice (DOMAIN.md §6)

function planted(zones: { geometry: MultiPolygon; targetSi: number }[], defaultTargetSi: number) {
  const c = syntheticLog({
    boundary: FIELD,
    zones,
    defaultTargetSi,
    swathM: 9.144,
    speedMps: MPH_5,
    hz: 1,
    startTime: 1_760_000_000,
    seed: 4,
    faults: { discLimitSi: perAc(34_000) }, // the disc delivers no more than 34 000 seeds/ac at 5 mph
  });
  const zone = zoneIndexOf(
    c.lon,
    c.lat,
    zones.map((z) => z.geometry),
    FIELD,
  );
  return { c, zone, keep: c.workOn!.slice(), area: pointAreas(c, 9.144) };
}

describe('discLimitShortfall', () => {
  it('reports only the zone whose target the disc cannot reach, with the fastest speed of DOMAIN.md §4', () => {
    const { c, zone, keep, area } = planted([{ geometry: WEST, targetSi: perAc(40_000) }], perAc(30_000));
    const zones = [{ zoneId: 'z-high', name: 'High', targetSi: perAc(40_000) }];
    const r = discLimitShortfall(c, keep, zone, area, zones, PLANTER, BAND)!;
    expect(discLimitSchema.parse(r)).toEqual(r);
    expect(r.zones.map((z) => z.zoneId)).toEqual(['z-high']);
    const high = r.zones[0];
    // DOMAIN.md §4 (derived): the disc at 28.62 rpm drops 28.62 × 30 / 60 = 14.31 seeds/s per row; 40 000
    // seeds/ac in 0.762 m rows need 40 000 / 4046.856 × 0.762 = 7.532 seeds per metre of travel, so the disc
    // keeps up to 14.31 / 7.532 = 1.900 m/s (4.25 mph).
    const seedsPerS = (RPM_MAX * HOLES) / 60;
    const seedsPerM = perAc(40_000) * ROW_M;
    expect(high.fastestSpeedMps).toBeCloseTo(seedsPerS / seedsPerM, 12);
    expect(high.fastestSpeedMps).toBeCloseTo(1.9, 2);
    // Capped at 34 000 of 40 000: (40 − 34) / 40 = 15 % short (derived).
    expect(high.shortfallPct).toBeCloseTo(15, 9);
    expect(high.targetSi).toBe(perAc(40_000));
    // Driven at 5 mph (the synthetic speed varies by 1 %).
    expect(Math.abs(high.drivenSpeedMps / MPH_5 - 1)).toBeLessThan(0.01);
    // The zone's planted area: every working point in the zone (x < 200 m of the 400 m field), about half.
    let inZone = 0;
    let all = 0;
    for (let i = 0; i < c.n; i++) {
      if (!keep[i]) continue;
      all += area[i];
      if (zone[i] === 0) inZone += area[i];
    }
    expect(high.areaM2).toBeCloseTo(inZone, 6);
    expect(inZone / all).toBeGreaterThan(0.45);
    expect(inZone / all).toBeLessThan(0.55);
  });

  it('a faster disc (or none in the log at its top) reports nothing; no holes per disc, no answer', () => {
    const { c, zone, keep, area } = planted([{ geometry: WEST, targetSi: perAc(40_000) }], perAc(30_000));
    const zones = [{ zoneId: 'z-high', name: 'High', targetSi: perAc(40_000) }];
    // 40 000 at 5 mph needs 28.62 × 40 / 34 = 33.7 rpm (derived): a 40 rpm disc was not the limit.
    const fast = discLimitShortfall(c, keep, zone, area, zones, { ...PLANTER, discRpmMax: 40 }, BAND);
    expect(fast).toEqual({ zones: [] });
    expect(
      discLimitShortfall(c, keep, zone, area, zones, { ...PLANTER, holesPerDisc: null }, BAND),
    ).toBeNull();
  });

  it('the default rate (zone −1) is reported as such; zones sort by area, largest first', () => {
    // West zone 40 000 (about half the field), an east strip at 42 000 (a fifth), the rest at 30 000.
    const { c, zone, keep, area } = planted(
      [
        { geometry: EAST_STRIP, targetSi: perAc(42_000) },
        { geometry: WEST, targetSi: perAc(40_000) },
      ],
      perAc(30_000),
    );
    const zones = [
      { zoneId: 'strip', name: 'Strip', targetSi: perAc(42_000) },
      { zoneId: 'west', name: 'West', targetSi: perAc(40_000) },
    ];
    const r = discLimitShortfall(c, keep, zone, area, zones, PLANTER, BAND)!;
    expect(r.zones.map((z) => z.zoneId)).toEqual(['west', 'strip']);
    expect(r.zones[1].shortfallPct).toBeCloseTo((100 * (42 - 34)) / 42, 9); // derived
    // The other way round: the high rate is the default.
    const low = planted([{ geometry: WEST, targetSi: perAc(30_000) }], perAc(40_000));
    const d = discLimitShortfall(
      low.c,
      low.keep,
      low.zone,
      low.area,
      [{ zoneId: 'west', name: 'West', targetSi: perAc(30_000) }],
      PLANTER,
      BAND,
    )!;
    expect(d.zones).toHaveLength(1);
    expect(d.zones[0].zoneId).toBe(DEFAULT_LINE_ID);
    expect(d.zones[0].targetSi).toBeCloseTo(perAc(40_000), 9);
  });

  it('hand-built: area-weighted shortfall, the logged speed without GNSS, and the points that do not count', () => {
    // Row spacing 0.5 m, 20 holes, top 60 rpm: a target of 10 seeds/m² needs 60 × 10 × 0.5 × v / 20 = 15 v rpm
    // (DOMAIN.md §4, derived), over the top above 4 m/s. Half the 15 % band: short below 9.25.
    const rows: [applied: number, speed: number, zone: number, area: number][] = [
      [8, 5, 0, 1], // 20 % short, at the limit: counts
      [9, 6, 0, 3], // 10 % short, at the limit: counts
      [9.5, 6, 0, 5], // within half the band
      [8, 3, 0, 7], // the disc was not at its top at 3 m/s
      [8, 6, -2, 11], // outside the field
      [8, Number.NaN, 0, 13], // no speed
    ];
    const c = emptyColumns(rows.length, { speedMps: true });
    rows.forEach(([applied, speed], i) => {
      c.t[i] = i;
      c.lon[i] = ORIGIN[0];
      c.lat[i] = ORIGIN[1];
      c.target[i] = 10;
      c.applied[i] = applied;
      c.speedMps![i] = speed;
    });
    const r = discLimitShortfall(
      c,
      new Uint8Array(rows.length).fill(1),
      Int16Array.from(rows, (x) => x[2]),
      Float64Array.from(rows, (x) => x[3]),
      [{ zoneId: 'a', name: 'A', targetSi: 10 }],
      { rowSpacingM: 0.5, holesPerDisc: 20, discRpmMax: 60 },
      BAND,
    )!;
    expect(r.zones).toHaveLength(1);
    // Area 1 + 3 = 4 m²; shortfall (1 × 20 + 3 × 10) / 4 = 12.5 % (by hand); median of 5 and 6 m/s = 5.5.
    expect(r.zones[0]).toMatchObject({ zoneId: 'a', areaM2: 4, shortfallPct: 12.5, drivenSpeedMps: 5.5 });
    // Fastest: 60 rpm × 20 holes / 60 = 20 seeds/s over 10 × 0.5 = 5 seeds/m: 4 m/s (by hand).
    expect(r.zones[0].fastestSpeedMps).toBeCloseTo(4, 12);
  });

  it('says what is wrong with its input', () => {
    const c = emptyColumns(2);
    const ok = { keep: new Uint8Array(2), zone: new Int16Array(2), area: new Float64Array(2) };
    expect(() => discLimitShortfall(c, ok.keep, new Int16Array(3), ok.area, [], PLANTER, BAND)).toThrow(
      /zone \(3\).*one entry per point \(2\)/,
    );
    expect(() =>
      discLimitShortfall(c, ok.keep, ok.zone, ok.area, [], { ...PLANTER, holesPerDisc: 0 }, BAND),
    ).toThrow(/holes per disc must be positive/);
    expect(() => discLimitShortfall(c, ok.keep, ok.zone, ok.area, [], PLANTER, 0)).toThrow(
      /band must be a fraction/,
    );
  });
});
