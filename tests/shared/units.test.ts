import { describe, expect, it } from 'vitest';
import {
  AC_PER_HA,
  IN2_PER_AC,
  M2_PER_AC,
  lbPerAcToKgPerHa,
  kgPerHaToLbPerAc,
  m2ToAc,
  m2ToHa,
  mphToMps,
  mpsToMph,
  inToM,
  mToIn,
  perAcToPerHa,
  perAcToPerM2,
  perM2ToPerAc,
  rowSpacingFromDisplay,
  rowSpacingToDisplay,
  seedsPerAcFromSpacing,
  seedsPerFtOfRow,
  speedFromDisplay,
  speedToDisplay,
} from '../../shared/units';

describe('unit factors (NIST SP 811, Appendix B.8)', () => {
  it('holds the exact factors', () => {
    expect(inToM(1)).toBe(0.0254); // NIST SP 811 B.8, exact
    expect(mphToMps(1)).toBe(0.44704); // NIST SP 811 B.8, exact
    expect(M2_PER_AC).toBe(4046.8564224); // NIST SP 811 B.8, international acre, exact
    expect(IN2_PER_AC).toBe(6_272_640); // DOMAIN.md §1, derived: 43 560 × 144
  });

  it('derives acres per hectare', () => {
    expect(AC_PER_HA).toBeCloseTo(2.471053814671653, 14); // DOMAIN.md §1, derived
    expect(m2ToAc(10_000)).toBeCloseTo(2.471053814671653, 14);
    expect(m2ToHa(M2_PER_AC)).toBeCloseTo(0.40468564224, 14);
  });

  it('uses the international acre, not the US survey acre (4 ppm apart)', () => {
    const surveyAcre = 4046.872609874; // DOMAIN.md §1, US survey acre
    expect(Math.abs(M2_PER_AC - surveyAcre) / M2_PER_AC).toBeCloseTo(4e-6, 6);
    expect(M2_PER_AC).not.toBe(surveyAcre);
  });

  it('converts mass rates: 1 lb/ac = 1.120851156 kg/ha (DOMAIN.md §3, derived)', () => {
    expect(lbPerAcToKgPerHa(1)).toBeCloseTo(1.120851156, 9);
    expect(kgPerHaToLbPerAc(lbPerAcToKgPerHa(87.5))).toBeCloseTo(87.5, 10);
  });

  it('converts populations: 34 000 seeds/ac = 8.40158 seeds/m² (DOMAIN.md §4)', () => {
    expect(perAcToPerM2(34_000)).toBeCloseTo(8.40158, 5);
    expect(perM2ToPerAc(perAcToPerM2(34_000))).toBeCloseTo(34_000, 8);
    expect(perAcToPerHa(34_000)).toBeCloseTo(34_000 * 2.471053814671653, 6); // DOMAIN.md §3, derived
  });
});

describe('seeds from spacing (Iowa State Agron 212, "Seeds per row")', () => {
  it('5 seeds/ft in 15-in rows is 174 240 seeds/ac', () => {
    expect(seedsPerAcFromSpacing(15, 12 / 5)).toBeCloseTo(174_240, 6); // Iowa State Agron 212
  });
  it('200 000 seeds/ac in 15-in rows is 5.74 seeds/ft', () => {
    expect(seedsPerFtOfRow(200_000, 15)).toBeCloseTo(5.74, 2); // Iowa State Agron 212, printed to 2 decimals
  });
});

describe('display conversions round-trip', () => {
  it.each([
    ['imperial', 30, 0.762],
    ['metric', 76.2, 0.762],
  ] as const)('row spacing in %s', (system, shown, metres) => {
    expect(rowSpacingFromDisplay(shown, system)).toBeCloseTo(metres, 12);
    expect(rowSpacingToDisplay(metres, system)).toBeCloseTo(shown, 10);
  });
  it.each([
    ['imperial', 5, 2.2352],
    ['metric', 8.04672, 2.2352],
  ] as const)('speed in %s', (system, shown, mps) => {
    expect(speedFromDisplay(shown, system)).toBeCloseTo(mps, 12); // 5 mph = 2.2352 m/s, derived from NIST
    expect(speedToDisplay(mps, system)).toBeCloseTo(shown, 10);
  });
  it('mph and inches invert exactly', () => {
    expect(mpsToMph(mphToMps(6))).toBeCloseTo(6, 12);
    expect(mToIn(inToM(30))).toBeCloseTo(30, 12);
  });
});
