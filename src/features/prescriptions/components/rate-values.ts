import type { Crop } from '@shared/schemas/crops';
import type { Product } from '@shared/schemas/product.schema';
import { RATE_UNIT_DEFS, rateFromSi, rateToSi, type RateUnit } from '@shared/rates/rate-units';
import { roundTo } from '@shared/units';
import { formatNumber } from '@/lib/format';

/** An SI rate as the number a person reads and types in `unit`, rounded to the decimals worth showing. */
export const rateShown = (si: number, unit: RateUnit) =>
  roundTo(rateFromSi(si, unit), RATE_UNIT_DEFS[unit].decimals);

/** An SI rate as figures in `unit` ("32,000"), without the unit. */
export const rateFigures = (si: number, unit: RateUnit) =>
  formatNumber(rateFromSi(si, unit), RATE_UNIT_DEFS[unit].decimals);

/** An SI rate with its unit ("32,000 seeds/ac"). */
export const rateWords = (si: number, unit: RateUnit) =>
  `${rateFigures(si, unit)} ${RATE_UNIT_DEFS[unit].label}`;

/** What a person typed, read as a rate in `unit` and turned to SI; null when it is not a number of at least 0. */
export function readRate(text: string, unit: RateUnit): number | null {
  const cleaned = text.replace(/[\s,]/g, '');
  if (cleaned === '') return null;
  const v = Number(cleaned);
  return Number.isFinite(v) && v >= 0 ? rateToSi(v, unit) : null;
}

/**
 * A rounding step for the rate rule that suits the unit (common practice: seed rates are set to the
 * nearest 500 seeds/ac or 1 000 seeds/ha, mass and volume to a convenient fraction).
 */
export const RULE_STEP: Record<RateUnit, number> = {
  'seeds/ac': 500,
  'seeds/ha': 1000,
  'kseeds/ac': 0.5,
  'lb/ac': 0.5,
  'kg/ha': 0.5,
  'gal/ac': 0.1,
  'L/ha': 1,
};

/**
 * Starting rates for a new seed prescription, in seeds per acre: a plausible lowest, default and highest
 * population for the crop (common practice; the agronomist types their own). Not for other products.
 */
const SEED_START_PER_AC: Record<Crop, { min: number; value: number; max: number }> = {
  corn: { min: 28_000, value: 32_000, max: 40_000 },
  soybean: { min: 100_000, value: 140_000, max: 180_000 },
  sorghum: { min: 40_000, value: 80_000, max: 120_000 },
  sunflower: { min: 16_000, value: 22_000, max: 28_000 },
  cotton: { min: 30_000, value: 40_000, max: 50_000 },
  canola: { min: 250_000, value: 400_000, max: 600_000 },
  'dry-bean': { min: 70_000, value: 90_000, max: 120_000 },
  'sugar-beet': { min: 40_000, value: 50_000, max: 60_000 },
};

/** SI starting rates (seeds/m²) for a product, or null when there is no sensible guess (not seed). */
export function startingRatesSi(product: Product | undefined) {
  if (!product || product.kind !== 'seed' || !product.crop) return null;
  const s = SEED_START_PER_AC[product.crop];
  const si = (perAc: number) => rateToSi(perAc, 'seeds/ac');
  return { minRateSi: si(s.min), defaultRateSi: si(s.value), maxRateSi: si(s.max) };
}
