import { describe, expect, it } from 'vitest';
import { mphToMps, inToM, perAcToPerM2, M2_PER_AC } from '../../shared/units';
import {
  checkDeliverable,
  discRpmFor,
  fastestDeliverableSpeedMps,
  seedsPerSecondPerRow,
} from '../../shared/rates/seed-meter';
import { appliedPopulation, appliedWithSlip, slip, truePopulation } from '../../shared/rates/ground-speed';
import {
  DDI_SETPOINT_COUNT_PER_AREA,
  DDI_SETPOINT_MASS_PER_AREA,
  DDI_SETPOINT_VOLUME_PER_AREA,
  DEFAULT_SEEDS_PER_UNIT,
  ddi11ValueFromPerAc,
  seedsFor,
  unitsToOrder,
} from '../../shared/rates/seed-units';

describe('the seed meter (DOMAIN.md §4)', () => {
  const corn = perAcToPerM2(34_000); // 8.40158 seeds/m², DOMAIN.md §4
  it('34 000 seeds/ac in 30-in rows at 5 mph is 14.31 seeds/s per row; a 30-hole disc turns 28.62 rpm', () => {
    expect(corn).toBeCloseTo(8.40158, 5);
    expect(seedsPerSecondPerRow(corn, inToM(30), mphToMps(5))).toBeCloseTo(14.31, 2); // DOMAIN.md §4
    expect(discRpmFor(corn, inToM(30), mphToMps(5), 30)).toBeCloseTo(28.62, 2); // DOMAIN.md §4
  });

  it('140 000 seeds/ac in 15-in rows at 5 mph is 29.46 seeds/s, not the 1.6–2 seeds/s some items print', () => {
    const s = seedsPerSecondPerRow(perAcToPerM2(140_000), inToM(15), mphToMps(5));
    expect(s).toBeCloseTo(29.46, 2); // DOMAIN.md §4
    expect(s).toBeGreaterThan(10);
  });

  it('the fastest deliverable speed is where the disc reaches its top rpm (derived)', () => {
    const v = fastestDeliverableSpeedMps(corn, inToM(30), 30, 45);
    expect(discRpmFor(corn, inToM(30), v, 30)).toBeCloseTo(45, 10);
    // 28.62 rpm at 5 mph scales linearly: 45 rpm at 5 × 45 / 28.62 mph (derived).
    expect(v / mphToMps(1)).toBeCloseTo((5 * 45) / discRpmFor(corn, inToM(30), mphToMps(5), 30), 10);
  });

  it('flags a rate the disc cannot deliver at the planned speeds, naming the speed', () => {
    const planter = { rowSpacingM: inToM(30), holesPerDisc: 30, discRpmMin: 4, discRpmMax: 30 };
    const ok = checkDeliverable(corn, planter, [mphToMps(4), mphToMps(5)]);
    expect(ok.deliverable).toBe(true);
    const fast = checkDeliverable(corn, planter, [mphToMps(4), mphToMps(5), mphToMps(6)]);
    expect(fast.deliverable).toBe(false);
    expect(fast.outside).toHaveLength(1);
    expect(fast.outside[0].limit).toBe('above-max');
    expect(fast.outside[0].speedMps).toBeCloseTo(mphToMps(6), 12);
    expect(fast.fastestSpeedMps).toBeLessThan(mphToMps(6));
    expect(fast.fastestSpeedMps).toBeGreaterThan(mphToMps(5));
    // 5 000 seeds/ac at 4 mph turns the disc 28.62 × 5 000/34 000 × 4/5 = 3.37 rpm, under a 4 rpm floor (derived).
    const slow = checkDeliverable(perAcToPerM2(5_000), planter, [mphToMps(4)]);
    expect(slow.rpm[0]).toBeCloseTo((28.62 * 5_000 * 4) / (34_000 * 5), 2);
    expect(slow.outside.map((o) => o.limit)).toEqual(['below-min']);
  });
});

describe('ground speed and population (DOMAIN.md §5)', () => {
  it('10 % slip turns 34 000 into 37 778 seeds/ac, not the naive 37 400', () => {
    expect(appliedWithSlip(34_000, 0.1)).toBeCloseTo(37_777.78, 1); // DOMAIN.md §5, derived
    expect(Math.round(appliedWithSlip(34_000, 0.1))).not.toBe(Math.round(34_000 * 1.1));
    expect(Math.round(appliedWithSlip(34_000, 0.02))).toBe(34_694); // DOMAIN.md §5, derived
  });

  it('a radar reading 3 % low meters 32 980 for 34 000', () => {
    expect(appliedPopulation(34_000, 0.97, 1)).toBeCloseTo(32_980, 6); // DOMAIN.md §5, derived
  });

  it('a tractor reading 6.0 mph while moving 5.8 mph over-seeds by 3.4 % (common practice)', () => {
    const over = appliedPopulation(1, mphToMps(6), mphToMps(5.8)) - 1;
    expect(over * 100).toBeCloseTo(3.4, 1);
    expect(slip(mphToMps(5.8), mphToMps(6))).toBeCloseTo(1 - 5.8 / 6, 12); // ASABE S296, from memory
    expect(truePopulation(34_000, mphToMps(6), mphToMps(5.8))).toBeCloseTo((34_000 * 6) / 5.8, 6);
  });
});

describe('seed and units (DOMAIN.md §3, §8)', () => {
  it('orders whole units, rounded up', () => {
    const seeds = seedsFor(perAcToPerM2(34_000), 160 * M2_PER_AC); // 160 ac at 34 000 seeds/ac = 5 440 000 seeds
    expect(seeds).toBeCloseTo(5_440_000, 3);
    expect(unitsToOrder(seeds, DEFAULT_SEEDS_PER_UNIT.corn)).toBe(68); // 5 440 000 / 80 000 = 68 exactly
    expect(unitsToOrder(seeds + 1, DEFAULT_SEEDS_PER_UNIT.corn)).toBe(69);
    expect(DEFAULT_SEEDS_PER_UNIT.soybean).toBe(140_000); // Univ. of Missouri IPM, Wiebold 2008
  });

  it('pins the task-data DDIs: 34 000 seeds/ac is DDI 11 value 8402', () => {
    expect(DDI_SETPOINT_COUNT_PER_AREA).toBe(11); // ISO 11783-11, DOMAIN.md §8
    expect(DDI_SETPOINT_MASS_PER_AREA).toBe(6);
    expect(DDI_SETPOINT_VOLUME_PER_AREA).toBe(1);
    expect(ddi11ValueFromPerAc(34_000)).toBe(8402); // DOMAIN.md §8
  });
});
