import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  M3_PER_GAL,
  QUANTITY_UNITS,
  RATE_UNITS,
  RATE_UNIT_DEFS,
  defaultQuantityUnit,
  defaultRateUnit,
  formatRate,
  quantityFromSi,
  quantityToSi,
  rateFromSi,
  rateToSi,
  rateUnitsOf,
} from '../../shared/rates/rate-units';

describe('rate units (DOMAIN.md §1, §3)', () => {
  it('34 000 seeds/ac is 8.40158 seeds/m²', () => {
    expect(rateToSi(34_000, 'seeds/ac')).toBeCloseTo(8.40158, 5); // DOMAIN.md §4
  });

  it('seeds/ha = seeds/ac × 2.471053814671653', () => {
    const perHa = rateFromSi(rateToSi(34_000, 'seeds/ac'), 'seeds/ha');
    expect(perHa).toBeCloseTo(34_000 * 2.471053814671653, 6); // DOMAIN.md §3 (derived)
  });

  it('34 kseeds/ac is 34 000 seeds/ac', () => {
    expect(rateFromSi(rateToSi(34, 'kseeds/ac'), 'seeds/ac')).toBeCloseTo(34_000, 9); // definition of k (SI prefix)
  });

  it('lb/ac × 1.120851156 = kg/ha', () => {
    expect(rateFromSi(rateToSi(100, 'lb/ac'), 'kg/ha')).toBeCloseTo(112.0851156, 7); // DOMAIN.md §3 (derived)
    expect(rateToSi(1, 'kg/ha')).toBeCloseTo(1e-4, 15); // 1 kg over 10 000 m² (SI)
  });

  it('10 gal/ac is 93.5396 L/ha', () => {
    // US gallon 3.785411784 L (exact, NIST SP 811 B.8); 1 ha = 10 000 m², 1 ac = 4046.8564224 m² (exact,
    // NIST SP 811 B.8). 10 gal/ac = 10 × 3.785411784 L × 10 000 / 4046.8564224 per ha (derived) = 93.5396.
    const expected = (10 * 3.785411784 * 10_000) / 4046.8564224; // derived
    expect(M3_PER_GAL).toBe(3.785411784e-3); // NIST SP 811 B.8 (exact)
    expect(rateFromSi(rateToSi(10, 'gal/ac'), 'L/ha')).toBeCloseTo(expected, 9);
    expect(rateFromSi(rateToSi(10, 'gal/ac'), 'L/ha')).toBeCloseTo(93.5396, 4); // derived above, to 4 places
  });

  it('a seed rate sent as DDI 11 is round(seeds/m² × 1000): 34 000 seeds/ac → 8402', () => {
    expect(Math.round(rateToSi(34_000, 'seeds/ac') * 1000)).toBe(8402); // DOMAIN.md §8
  });

  it.each(RATE_UNITS)('%s goes to SI and back unchanged', (unit) => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e7, noNaN: true }), (v) => {
        expect(rateFromSi(rateToSi(v, unit), unit)).toBeCloseTo(v, 6);
      }),
    );
    expect(rateFromSi(rateToSi(1234.5, unit), unit)).toBeCloseTo(1234.5, 9);
  });

  it('groups units by kind and picks the one a person of each unit system expects', () => {
    expect(rateUnitsOf('count')).toEqual(['seeds/ac', 'seeds/ha', 'kseeds/ac']);
    expect(rateUnitsOf('mass')).toEqual(['lb/ac', 'kg/ha']);
    expect(rateUnitsOf('volume')).toEqual(['gal/ac', 'L/ha']);
    for (const u of RATE_UNITS) expect(rateUnitsOf(RATE_UNIT_DEFS[u].kind)).toContain(u);
    expect(defaultRateUnit('count', 'imperial')).toBe('seeds/ac');
    expect(defaultRateUnit('count', 'metric')).toBe('seeds/ha');
    expect(defaultRateUnit('mass', 'imperial')).toBe('lb/ac');
    expect(defaultRateUnit('mass', 'metric')).toBe('kg/ha');
    expect(defaultRateUnit('volume', 'imperial')).toBe('gal/ac');
    expect(defaultRateUnit('volume', 'metric')).toBe('L/ha');
  });

  it('formats a rate in the unit asked for', () => {
    expect(formatRate(rateToSi(34_000, 'seeds/ac'), 'seeds/ac')).toBe('34,000 seeds/ac');
    expect(formatRate(rateToSi(34, 'kseeds/ac'), 'kseeds/ac')).toBe('34 k seeds/ac');
    expect(formatRate(rateToSi(100, 'lb/ac'), 'kg/ha')).toBe('112.1 kg/ha'); // 112.0851156, DOMAIN.md §3
    expect(formatRate(rateToSi(10, 'gal/ac'), 'L/ha')).toBe('93.5 L/ha'); // 93.5396, derived above
  });
});

describe('quantity units (NIST SP 811 B.8)', () => {
  it('a pound is 0.45359237 kg and a US gallon 3.785411784 L', () => {
    expect(quantityToSi(1, 'lb')).toBe(0.45359237); // exact
    expect(quantityFromSi(quantityToSi(1, 'gal'), 'L')).toBeCloseTo(3.785411784, 12); // exact
    expect(quantityToSi(80_000, 'seeds')).toBe(80_000);
  });

  it.each(QUANTITY_UNITS)('%s goes to SI and back unchanged', (unit) => {
    expect(quantityFromSi(quantityToSi(42.5, unit), unit)).toBeCloseTo(42.5, 9);
  });

  it('picks the quantity unit a person expects', () => {
    expect(defaultQuantityUnit('count', 'metric')).toBe('seeds');
    expect(defaultQuantityUnit('mass', 'imperial')).toBe('lb');
    expect(defaultQuantityUnit('mass', 'metric')).toBe('kg');
    expect(defaultQuantityUnit('volume', 'imperial')).toBe('gal');
    expect(defaultQuantityUnit('volume', 'metric')).toBe('L');
  });
});
