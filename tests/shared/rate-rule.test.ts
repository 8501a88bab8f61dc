import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { ratesByRule } from '../../shared/rates/rate-rule';

const rule = { base: 34_000, min: 28_000, max: 38_000, step: 500 };
type Bounds = typeof rule;
/** The rule applied to one zone "z". */
const one = (bounds: Bounds, productivityIndex: number | null) =>
  ratesByRule({ ...bounds, zones: [{ zoneId: 'z', productivityIndex }] })[0];

describe('the rate rule (DEVELOPERS.md "Prescriptions")', () => {
  it('scales the base by the productivity index, rounds to the step and clamps', () => {
    const out = ratesByRule({
      ...rule,
      zones: [
        { zoneId: 'a', productivityIndex: 1 },
        { zoneId: 'b', productivityIndex: 1.06 }, // 36 040 → 36 000 (hand-computed)
        { zoneId: 'c', productivityIndex: 0.9 }, // 30 600 → 30 500 (hand-computed)
        { zoneId: 'd', productivityIndex: 1.2 }, // 40 800 → 41 000, above 38 000 (hand-computed)
        { zoneId: 'e', productivityIndex: 0.5 }, // 17 000, below 28 000 (hand-computed)
      ],
    });
    expect(out).toEqual([
      { zoneId: 'a', rate: 34_000, raw: 34_000, clamped: null },
      { zoneId: 'b', rate: 36_000, raw: expect.closeTo(36_040, 6), clamped: null },
      { zoneId: 'c', rate: 30_500, raw: expect.closeTo(30_600, 6), clamped: null },
      { zoneId: 'd', rate: 38_000, raw: expect.closeTo(40_800, 6), clamped: 'max' },
      { zoneId: 'e', rate: 28_000, raw: 17_000, clamped: 'min' },
    ]);
  });

  it('gives a zone without an index the base rate, rounded and clamped alike', () => {
    expect(one({ base: 34_200, min: 0, max: 33_000, step: 500 }, null)).toEqual({
      zoneId: 'z',
      rate: 33_000,
      raw: 34_200,
      clamped: 'max',
    });
    expect(one({ base: 34_200, min: 0, max: 40_000, step: 500 }, null).rate).toBe(34_000); // nearest 500
  });

  it('does not round when the step is 0 or less', () => {
    for (const step of [0, -5]) {
      expect(one({ base: 100, min: 0, max: 1000, step }, 1.234).rate).toBeCloseTo(123.4, 10); // 100 × 1.234
    }
  });

  it('rounds to decimal steps without float noise (lb/ac in tenths)', () => {
    expect(one({ base: 1, min: 0, max: 10, step: 0.1 }, 0.3).rate).toBe(0.3);
  });

  it('refuses a lowest rate above the highest and numbers that are not finite', () => {
    const zones = [{ zoneId: 'z', productivityIndex: 1 }];
    expect(() => ratesByRule({ ...rule, min: 40_000, zones })).toThrow(RangeError);
    expect(() => ratesByRule({ ...rule, base: Number.NaN, zones })).toThrow(/base rate/);
    expect(() => ratesByRule({ ...rule, max: Infinity, zones })).toThrow(RangeError);
    expect(() => ratesByRule({ ...rule, step: Number.NaN, zones })).toThrow(RangeError);
    expect(() => ratesByRule({ ...rule, zones: [{ zoneId: 'q', productivityIndex: Infinity }] })).toThrow(
      /zone q/,
    );
  });

  it('always lands inside [min, max], on a multiple of the step unless clamped', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 100_000 }),
        fc.integer({ min: 0, max: 100_000 }),
        fc.integer({ min: 0, max: 100_000 }),
        fc.integer({ min: 1, max: 5_000 }),
        fc.array(fc.option(fc.double({ min: 0, max: 3, noNaN: true }), { nil: null }), { maxLength: 20 }),
        (base, a, b, step, pis) => {
          const [min, max] = a <= b ? [a, b] : [b, a];
          const out = ratesByRule({
            base,
            min,
            max,
            step,
            zones: pis.map((productivityIndex, i) => ({ zoneId: String(i), productivityIndex })),
          });
          expect(out).toHaveLength(pis.length);
          for (const r of out) {
            expect(r.rate).toBeGreaterThanOrEqual(min);
            expect(r.rate).toBeLessThanOrEqual(max);
            if (r.clamped === null) {
              expect(Math.abs(r.rate / step - Math.round(r.rate / step))).toBeLessThan(1e-9);
              expect(Math.abs(r.rate - r.raw)).toBeLessThanOrEqual(step / 2 + 1e-9);
            } else {
              expect(r.rate).toBe(r.clamped === 'min' ? min : max);
            }
          }
        },
      ),
    );
  });
});
