import { KG_PER_LB, M2_PER_AC, M2_PER_HA } from '../units';
import type { UnitSystem } from '../units';

/**
 * Application-rate units. Rates are stored in SI: seeds per m² (count), kg per m² (mass), m³ per m²
 * (volume); they are converted only to show and to read what a person types.
 *
 * Factors: acre and pound exact (NIST SP 811 B.8, DOMAIN.md §1); US liquid gallon 3.785 411 784 × 10⁻³ m³
 * (NIST SP 811 B.8, exact); litre 10⁻³ m³ (SI).
 */

export const RATE_KINDS = ['count', 'mass', 'volume'] as const;
export type RateKind = (typeof RATE_KINDS)[number];

export const RATE_UNITS = ['seeds/ac', 'seeds/ha', 'kseeds/ac', 'lb/ac', 'kg/ha', 'gal/ac', 'L/ha'] as const;
export type RateUnit = (typeof RATE_UNITS)[number];

/** m³ per US liquid gallon (exact, NIST SP 811 B.8). */
export const M3_PER_GAL = 3.785411784e-3;
export const M3_PER_L = 1e-3;

type UnitDef = {
  kind: RateKind;
  label: string;
  /** Long label for selects. */
  title: string;
  /** SI rate per one of this unit. */
  si: number;
  /** Decimals worth showing. */
  decimals: number;
};

export const RATE_UNIT_DEFS: Record<RateUnit, UnitDef> = {
  'seeds/ac': { kind: 'count', label: 'seeds/ac', title: 'Seeds per acre', si: 1 / M2_PER_AC, decimals: 0 },
  'seeds/ha': {
    kind: 'count',
    label: 'seeds/ha',
    title: 'Seeds per hectare',
    si: 1 / M2_PER_HA,
    decimals: 0,
  },
  'kseeds/ac': {
    kind: 'count',
    label: 'k seeds/ac',
    title: 'Thousand seeds per acre',
    si: 1000 / M2_PER_AC,
    decimals: 2,
  },
  'lb/ac': { kind: 'mass', label: 'lb/ac', title: 'Pounds per acre', si: KG_PER_LB / M2_PER_AC, decimals: 1 },
  'kg/ha': { kind: 'mass', label: 'kg/ha', title: 'Kilograms per hectare', si: 1 / M2_PER_HA, decimals: 1 },
  'gal/ac': {
    kind: 'volume',
    label: 'gal/ac',
    title: 'US gallons per acre',
    si: M3_PER_GAL / M2_PER_AC,
    decimals: 2,
  },
  'L/ha': {
    kind: 'volume',
    label: 'L/ha',
    title: 'Litres per hectare',
    si: M3_PER_L / M2_PER_HA,
    decimals: 1,
  },
};

export const rateUnitsOf = (kind: RateKind): RateUnit[] =>
  RATE_UNITS.filter((u) => RATE_UNIT_DEFS[u].kind === kind);

/** A rate typed in `unit` → SI (seeds/m², kg/m², m³/m²). */
export const rateToSi = (value: number, unit: RateUnit) => value * RATE_UNIT_DEFS[unit].si;
/** An SI rate → `unit`. */
export const rateFromSi = (si: number, unit: RateUnit) => si / RATE_UNIT_DEFS[unit].si;

/** The unit a person of a unit system expects first for a kind of product. */
export function defaultRateUnit(kind: RateKind, system: UnitSystem): RateUnit {
  if (kind === 'count') return system === 'imperial' ? 'seeds/ac' : 'seeds/ha';
  if (kind === 'mass') return system === 'imperial' ? 'lb/ac' : 'kg/ha';
  return system === 'imperial' ? 'gal/ac' : 'L/ha';
}

/**
 * Quantities (what a rate times an area gives): seeds, kg, m³ in SI. Product unit sizes are stored the same
 * way (seeds per unit, kg per unit, m³ per unit).
 */
export const QUANTITY_UNITS = ['seeds', 'lb', 'kg', 'gal', 'L'] as const;
export type QuantityUnit = (typeof QUANTITY_UNITS)[number];
export const QUANTITY_UNIT_DEFS: Record<QuantityUnit, { kind: RateKind; si: number; label: string }> = {
  seeds: { kind: 'count', si: 1, label: 'seeds' },
  lb: { kind: 'mass', si: KG_PER_LB, label: 'lb' },
  kg: { kind: 'mass', si: 1, label: 'kg' },
  gal: { kind: 'volume', si: M3_PER_GAL, label: 'gal' },
  L: { kind: 'volume', si: M3_PER_L, label: 'L' },
};
export const quantityToSi = (value: number, unit: QuantityUnit) => value * QUANTITY_UNIT_DEFS[unit].si;
export const quantityFromSi = (si: number, unit: QuantityUnit) => si / QUANTITY_UNIT_DEFS[unit].si;

export function defaultQuantityUnit(kind: RateKind, system: UnitSystem): QuantityUnit {
  if (kind === 'count') return 'seeds';
  if (kind === 'mass') return system === 'imperial' ? 'lb' : 'kg';
  return system === 'imperial' ? 'gal' : 'L';
}

/** Formats a rate given in SI in `unit`, e.g. "34,000 seeds/ac". */
export function formatRate(si: number, unit: RateUnit, locale = 'en-US'): string {
  const def = RATE_UNIT_DEFS[unit];
  const v = rateFromSi(si, unit);
  return `${v.toLocaleString(locale, { maximumFractionDigits: def.decimals, minimumFractionDigits: 0 })} ${def.label}`;
}
