import { M2_PER_AC } from '../units';

/** Seeds in a seed unit: corn 80 000 (common practice), soybean 140 000 (Univ. of Missouri IPM, Wiebold 2008). */
export const DEFAULT_SEEDS_PER_UNIT = { corn: 80_000, soybean: 140_000 } as const;

/** Seeds for an area at a population (seeds per m²). */
export const seedsFor = (seedsPerM2: number, areaM2: number) => seedsPerM2 * areaM2;

/** Whole units to order: rounded up (a part unit is a whole bag). */
export function unitsToOrder(seeds: number, seedsPerUnit: number): number {
  if (!(seedsPerUnit > 0)) throw new RangeError('seedsPerUnit must be positive');
  // A whole unit more only when the seeds pass a whole number of units (not by float noise); never -0.
  return Math.max(0, Math.ceil(seeds / seedsPerUnit - 1e-9));
}

/**
 * ISO 11783-11 DDI 11 "Setpoint Count Per Area Application Rate": seeds per m² at a resolution of 0.001, so
 * the integer sent is round(seeds/m² × 1000) (DOMAIN.md §8: 34 000 seeds/ac → 8402).
 */
export const DDI_SETPOINT_COUNT_PER_AREA = 11;
/** DDI 6: setpoint mass per area application rate, mg/m² (DOMAIN.md §8). */
export const DDI_SETPOINT_MASS_PER_AREA = 6;
/** DDI 1: setpoint volume per area application rate, mm³/m² (DOMAIN.md §8). */
export const DDI_SETPOINT_VOLUME_PER_AREA = 1;

export const ddi11Value = (seedsPerM2: number) => Math.round(seedsPerM2 * 1000);
export const ddi11ValueFromPerAc = (seedsPerAc: number) => ddi11Value(seedsPerAc / M2_PER_AC);
