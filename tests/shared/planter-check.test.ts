import { describe, expect, it } from 'vitest';
import { checkPlanter, type CheckPlanter } from '../../shared/rates/planter-check';
import { planterCheckSchema } from '../../shared/schemas/prescription.schema';
import { inToM, mphToMps, perAcToPerM2 } from '../../shared/units';

/** An invented 24-row planter in 30-in rows with a 30-hole corn disc turning 4–45 rpm. */
const planter = (over: Partial<CheckPlanter> = {}): CheckPlanter => ({
  id: '7f1c2a64-3b1e-4c2d-9a0e-5d6b7c8e9f01',
  name: 'North 24',
  rowCount: 24,
  rowSpacingM: inToM(30),
  rowsPerSection: 2,
  displaySectionLimit: 16,
  holesPerDisc: [{ crop: 'corn', holes: 30 }],
  discRpmMin: 4,
  discRpmMax: 45,
  speedMinMps: mphToMps(4),
  speedPlannedMps: mphToMps(7),
  speedMaxMps: mphToMps(8),
  ...over,
});

const zone = (zoneId: string, seedsPerAc: number, name = `Zone ${zoneId}`) => ({
  zoneId,
  name,
  rateSi: perAcToPerM2(seedsPerAc),
});

const run = (p: CheckPlanter, zones: ReturnType<typeof zone>[], crop: 'corn' | 'soybean' = 'corn') =>
  planterCheckSchema.parse(
    checkPlanter({ planter: p, crop, zones, unitSystem: 'imperial', rateUnit: 'seeds/ac' }),
  );

describe('the planter check (DOMAIN.md §4)', () => {
  it('works the DOMAIN.md example: 34 000 seeds/ac, 30-in rows, 5 mph, 30-hole disc', () => {
    const c = run(
      planter({ speedMinMps: mphToMps(5), speedPlannedMps: mphToMps(5), speedMaxMps: mphToMps(5) }),
      [zone('a', 34_000)],
    );
    const [z] = c.zones;
    expect(z.seedsPerSecondPerRow.planned).toBeCloseTo(14.31, 2); // DOMAIN.md §4
    expect(z.discRpm.planned).toBeCloseTo(28.62, 2); // DOMAIN.md §4
    expect(z.status).toBe('ok');
    expect(z.messages).toEqual([]);
    expect(c.blocking).toBe(false);
    expect(c.holesPerDisc).toBe(30);
  });

  it('flags a 40 000 seeds/ac zone the 45 rpm top cannot deliver at the planned 7 mph', () => {
    const c = run(planter(), [zone('hi', 40_000, 'Hilltop')]);
    const [z] = c.zones;
    // seeds/s at the top = 45 rpm × 30 holes / 60 = 22.5 (DOMAIN.md §4, derived); 40 000 seeds/ac =
    // 9.88422 seeds/m²; v = 22.5 / (9.88422 × 0.762) = 2.98734 m/s = 6.68 mph (hand-computed).
    expect(z.fastestSpeedMps).toBeCloseTo(22.5 / (perAcToPerM2(40_000) * 0.762), 10); // derived
    expect(z.fastestSpeedMps).toBeCloseTo(2.98734, 5); // hand-computed above
    // 28.62 rpm at 34 000 seeds/ac and 5 mph scales to 28.62 × 40/34 × 7/5 = 47.14 rpm (DOMAIN.md §4, derived).
    expect(z.discRpm.planned).toBeCloseTo((28.62 * 40 * 7) / (34 * 5), 1);
    // The floor: 4 rpm × 30 / 60 = 2 seeds/s; v = 2 / (9.88422 × 0.762) = 0.26554 m/s (hand-computed).
    expect(z.slowestSpeedMps).toBeCloseTo(0.26554, 5);
    expect(z.status).toBe('flagged');
    expect(z.messages).toEqual([
      'At 7.0 mph the disc must turn 47.1 rpm for 40,000 seeds/ac, above its top of 45 rpm: this rate is deliverable up to 6.7 mph.',
    ]);
    expect(c.blocking).toBe(true);
    expect(c.messages).toEqual([]);
  });

  it('warns when only the high speed is too fast for the disc', () => {
    // At 6 mph: 28.62 × 40/34 × 6/5 = 40.4 rpm, under 45; at 7 mph 47.1 rpm, over (DOMAIN.md §4, derived).
    const c = run(planter({ speedPlannedMps: mphToMps(6), speedMaxMps: mphToMps(7) }), [
      zone('hi', 40_000),
      zone('lo', 30_000),
    ]);
    const [hi, lo] = c.zones;
    expect(hi.discRpm.planned).toBeCloseTo((28.62 * 40 * 6) / (34 * 5), 1);
    expect(hi.status).toBe('warning');
    expect(hi.messages[0]).toMatch(
      /^At 7\.0 mph the disc must turn 47\.1 rpm .* deliverable up to 6\.7 mph\.$/,
    );
    expect(lo.status).toBe('ok');
    expect(c.blocking).toBe(false);
  });

  it('warns when the low speed is too slow and says the slowest speed the rate needs', () => {
    // 5 000 seeds/ac at 4 mph: 28.62 × 5/34 × 4/5 = 3.37 rpm, under a 4 rpm floor (DOMAIN.md §4, derived).
    // Slowest speed: 2 seeds/s / (5 000 / 4046.8564224 × 0.762) = 2.12433 m/s = 4.75 mph (hand-computed).
    const c = run(planter({ speedPlannedMps: mphToMps(6) }), [zone('thin', 5_000)]);
    const [z] = c.zones;
    expect(z.discRpm.low).toBeCloseTo((28.62 * 5 * 4) / (34 * 5), 2);
    expect(z.slowestSpeedMps).toBeCloseTo(2.12433, 5);
    expect(z.status).toBe('warning');
    expect(z.messages).toEqual([
      'At 4.0 mph the disc would turn 3.4 rpm for 5,000 seeds/ac, below its lowest of 4 rpm: this rate needs at least 4.8 mph.',
    ]);
  });

  it('speaks the metric person’s units', () => {
    const c = checkPlanter({
      planter: planter(),
      crop: 'corn',
      zones: [zone('hi', 40_000)],
      unitSystem: 'metric',
      rateUnit: 'seeds/ha',
    });
    // 7 mph = 11.265 km/h; 2.98734 m/s = 10.754 km/h; 40 000 seeds/ac = 98 842 seeds/ha (derived).
    expect(c.zones[0].messages[0]).toBe(
      'At 11.3 km/h the disc must turn 47.1 rpm for 98,842 seeds/ha, above its top of 45 rpm: this rate is deliverable up to 10.8 km/h.',
    );
  });

  it('says nothing of a zone at rate 0: the disc stands still', () => {
    const c = run(planter(), [zone('skip', 0)]);
    expect(c.zones[0]).toMatchObject({
      status: 'ok',
      messages: [],
      discRpm: { low: 0, planned: 0, high: 0 },
    });
    expect(c.blocking).toBe(false);
  });

  it('blocks when the planter has no seed disc for the crop, still listing seeds per second', () => {
    const c = run(
      planter({ rowSpacingM: inToM(15), speedPlannedMps: mphToMps(5) }),
      [zone('s', 140_000)],
      'soybean',
    );
    expect(c.holesPerDisc).toBeNull();
    expect(c.blocking).toBe(true);
    expect(c.messages).toEqual([
      'Planter North 24 has no seed disc set for soybean: add holes per disc on the planter.',
    ]);
    const [z] = c.zones;
    expect(z.seedsPerSecondPerRow.planned).toBeCloseTo(29.46, 2); // DOMAIN.md §4
    expect(z.discRpm).toEqual({ low: 0, planned: 0, high: 0 });
    expect(z.status).toBe('flagged');
  });

  it('blocks when the display cannot control that many sections', () => {
    // 24 rows with a display limited to 16 sections needs 2 rows per section (common practice).
    const c = run(planter({ rowsPerSection: 1, speedPlannedMps: mphToMps(5), speedMaxMps: mphToMps(6) }), [
      zone('a', 34_000),
    ]);
    expect(c.sections).toEqual({ count: 24, limit: 16, rowsPerSection: 1, ok: false });
    expect(c.zones[0].status).toBe('ok');
    expect(c.blocking).toBe(true);
    expect(c.messages).toHaveLength(1);
    expect(c.messages[0]).toMatch(/24 sections.*at most 16.*at least 2 rows per section/);
    const fine = run(planter({ rowsPerSection: 2, speedPlannedMps: mphToMps(5), speedMaxMps: mphToMps(6) }), [
      zone('a', 34_000),
    ]);
    expect(fine.sections).toEqual({ count: 12, limit: 16, rowsPerSection: 2, ok: true });
    expect(fine.blocking).toBe(false);
  });

  it('refuses a negative or missing rate, naming the zone', () => {
    expect(() => run(planter(), [{ zoneId: 'n', name: 'Creek', rateSi: -1 }])).toThrow(/Creek/);
    expect(() => run(planter(), [{ zoneId: 'n', name: 'Creek', rateSi: Number.NaN }])).toThrow(RangeError);
  });
});
