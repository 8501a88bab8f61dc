/**
 * Units and conversions. Everything is stored in SI (metres, square metres, metres per second, seeds per
 * square metre) and converted only for display and input.
 *
 * Source: NIST SP 811 (2008), Appendix B.8. Factors marked exact are printed in bold there.
 */

/** Metres per inch (exact, NIST SP 811 B.8). */
export const M_PER_IN = 0.0254;
/** Metres per foot (exact, NIST SP 811 B.8). */
export const M_PER_FT = 0.3048;
/** Metres per statute mile (exact, NIST SP 811 B.8). */
export const M_PER_MI = 1609.344;
/** Metres per second per mile per hour (exact, NIST SP 811 B.8). */
export const MPS_PER_MPH = 0.44704;
/** Kilograms per pound avoirdupois (exact, NIST SP 811 B.8). */
export const KG_PER_LB = 0.45359237;
/** Square metres per international acre, 43 560 ft² (exact, NIST SP 811 B.8). */
export const M2_PER_AC = 4046.8564224;
/** Square metres per hectare (exact, SI). */
export const M2_PER_HA = 10_000;
/** Acres per hectare (derived: 10 000 / 4046.8564224). */
export const AC_PER_HA = M2_PER_HA / M2_PER_AC;
/** Square inches per acre: 43 560 × 144 (derived). */
export const IN2_PER_AC = 43_560 * 144;
/** Pascals per conventional inch of mercury (NIST SP 811 B.8, rounded). */
export const PA_PER_INHG = 3386.389;

export type UnitSystem = 'imperial' | 'metric';

export const inToM = (inches: number) => inches * M_PER_IN;
export const mToIn = (m: number) => m / M_PER_IN;
export const cmToM = (cm: number) => cm / 100;
export const mToCm = (m: number) => m * 100;
export const mphToMps = (mph: number) => mph * MPS_PER_MPH;
export const mpsToMph = (mps: number) => mps / MPS_PER_MPH;
export const kmhToMps = (kmh: number) => kmh / 3.6;
export const mpsToKmh = (mps: number) => mps * 3.6;
export const m2ToAc = (m2: number) => m2 / M2_PER_AC;
export const m2ToHa = (m2: number) => m2 / M2_PER_HA;
export const acToM2 = (ac: number) => ac * M2_PER_AC;
export const haToM2 = (ha: number) => ha * M2_PER_HA;

/** Seeds per acre → seeds per square metre. */
export const perAcToPerM2 = (perAc: number) => perAc / M2_PER_AC;
/** Seeds per square metre → seeds per acre. */
export const perM2ToPerAc = (perM2: number) => perM2 * M2_PER_AC;
/** Per hectare → per square metre. */
export const perHaToPerM2 = (perHa: number) => perHa / M2_PER_HA;
export const perM2ToPerHa = (perM2: number) => perM2 * M2_PER_HA;
/** Per acre → per hectare (× 2.471053814671653, derived). */
export const perAcToPerHa = (perAc: number) => perAc * AC_PER_HA;

/** Pounds per acre → kilograms per hectare (× 1.120851156…, derived). */
export const lbPerAcToKgPerHa = (lbPerAc: number) => (lbPerAc * KG_PER_LB) / (M2_PER_AC / M2_PER_HA);
export const kgPerHaToLbPerAc = (kgPerHa: number) => (kgPerHa * (M2_PER_AC / M2_PER_HA)) / KG_PER_LB;

/**
 * Seeds per acre from row spacing and in-row seed spacing, both in inches:
 * 6 272 640 / (row in × seed in). Source: DOMAIN.md §3 (derived from IN2_PER_AC).
 */
export const seedsPerAcFromSpacing = (rowSpacingIn: number, seedSpacingIn: number) =>
  IN2_PER_AC / (rowSpacingIn * seedSpacingIn);

/** Seeds per foot of row for a population (seeds/ac) in rows of the given spacing (inches). */
export const seedsPerFtOfRow = (seedsPerAc: number, rowSpacingIn: number) =>
  (seedsPerAc * (rowSpacingIn / 12)) / 43_560;

/** Length-unit helpers for forms: the row spacing and speed a user types, in their system. */
export const lengthUnitLabel = (system: UnitSystem) => (system === 'imperial' ? 'in' : 'cm');
export const speedUnitLabel = (system: UnitSystem) => (system === 'imperial' ? 'mph' : 'km/h');
export const areaUnitLabel = (system: UnitSystem) => (system === 'imperial' ? 'ac' : 'ha');

export const rowSpacingToDisplay = (m: number, system: UnitSystem) =>
  system === 'imperial' ? mToIn(m) : mToCm(m);
export const rowSpacingFromDisplay = (v: number, system: UnitSystem) =>
  system === 'imperial' ? inToM(v) : cmToM(v);
export const speedToDisplay = (mps: number, system: UnitSystem) =>
  system === 'imperial' ? mpsToMph(mps) : mpsToKmh(mps);
export const speedFromDisplay = (v: number, system: UnitSystem) =>
  system === 'imperial' ? mphToMps(v) : kmhToMps(v);
export const areaToDisplay = (m2: number, system: UnitSystem) =>
  system === 'imperial' ? m2ToAc(m2) : m2ToHa(m2);

/** Rounds to a number of decimals without the float noise of toFixed on display values. */
export const roundTo = (value: number, decimals: number) => {
  const f = 10 ** decimals;
  return Math.round(value * f) / f;
};
