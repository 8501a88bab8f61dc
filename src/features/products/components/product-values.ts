import type { Crop } from '@shared/schemas/crops';
import type { Product, ProductInput } from '@shared/schemas/product.schema';
import {
  defaultQuantityUnit,
  quantityFromSi,
  quantityToSi,
  QUANTITY_UNIT_DEFS,
  type RateKind,
} from '@shared/rates/rate-units';
import { DEFAULT_SEEDS_PER_UNIT } from '@shared/rates/seed-units';
import { roundTo, type UnitSystem } from '@shared/units';
import { formatNumber } from '@/lib/format';

/**
 * The product form holds the unit size in the person's units (seeds; lb or kg; gal or L) under the API's
 * own key `unitSize`, so an error the server reports for it lands beside that input. It is converted to SI
 * (seeds, kg, m³) only when validated and sent. An empty number input is NaN.
 */
export type ProductFormValues = {
  kind: 'seed' | 'other';
  name: string;
  crop: Crop | '';
  rateKind: RateKind;
  unitName: string;
  unitSize: number;
  pricePerUnit: number;
  currency: string;
  notes: string;
  version?: number;
};

/** Decimals worth keeping when a unit size is shown in the person's units. */
const SIZE_DECIMALS = 3;

/** The quantity unit a unit size is typed and shown in, for a rate kind and unit system. */
export const sizeUnit = (rateKind: RateKind, system: UnitSystem) => defaultQuantityUnit(rateKind, system);

const sizeToDisplay = (si: number, rateKind: RateKind, system: UnitSystem) =>
  roundTo(quantityFromSi(si, sizeUnit(rateKind, system)), SIZE_DECIMALS);

/** The default seeds in a unit for a crop, when the trade has one (DOMAIN.md §3). */
export const defaultSeedsPerUnit = (crop: Crop | '' | null): number | null =>
  crop === 'corn' || crop === 'soybean' ? DEFAULT_SEEDS_PER_UNIT[crop] : null;

/** Form values from a saved product, or the blank form of a new seed product. */
export function productToForm(p: Product | undefined, system: UnitSystem): ProductFormValues {
  if (!p) {
    return {
      kind: 'seed',
      name: '',
      crop: '',
      rateKind: 'count',
      unitName: 'unit',
      unitSize: Number.NaN,
      pricePerUnit: Number.NaN,
      currency: 'USD',
      notes: '',
    };
  }
  return {
    kind: p.kind,
    name: p.name,
    crop: p.crop ?? '',
    rateKind: p.rateKind,
    unitName: p.unitName,
    unitSize: sizeToDisplay(p.unitSize, p.rateKind, system),
    pricePerUnit: p.pricePerUnit ?? Number.NaN,
    currency: p.currency,
    notes: p.notes ?? '',
    version: p.version,
  };
}

/**
 * Form values to the API's SI shape. A unit size left as shown keeps the saved SI value exactly, so saving
 * a product in other units does not creep by rounding. An empty price means no price.
 */
export function formToSi(v: ProductFormValues, system: UnitSystem, saved?: Product): ProductInput {
  const seed = v.kind === 'seed';
  const rateKind: RateKind = seed ? 'count' : v.rateKind;
  const unchanged =
    saved && saved.rateKind === rateKind && v.unitSize === sizeToDisplay(saved.unitSize, rateKind, system);
  return {
    kind: v.kind,
    name: v.name,
    crop: seed ? ((v.crop || null) as Crop | null) : null,
    rateKind,
    unitName: v.unitName,
    unitSize: unchanged ? saved.unitSize : quantityToSi(v.unitSize, sizeUnit(rateKind, system)),
    pricePerUnit: Number.isNaN(v.pricePerUnit) ? null : v.pricePerUnit,
    currency: v.currency.trim().toUpperCase(),
    notes: v.notes,
  };
}

/** "80,000 seeds per unit", "2.5 gal per jug": a unit size in the person's units. */
export function unitSizeWords(p: Pick<Product, 'unitSize' | 'rateKind' | 'unitName'>, system: UnitSystem) {
  const unit = sizeUnit(p.rateKind, system);
  const value = quantityFromSi(p.unitSize, unit);
  const decimals = unit === 'seeds' ? 0 : Number.isInteger(roundTo(value, 1)) ? 0 : value < 10 ? 2 : 1;
  return `${formatNumber(value, decimals)} ${QUANTITY_UNIT_DEFS[unit].label} per ${p.unitName}`;
}

/** A price in its currency, "$245.00" (any well-formed three-letter code formats); "No price" when none is set. */
export const priceWords = (price: number | null, currency: string) =>
  price == null ? 'No price' : new Intl.NumberFormat('en-US', { style: 'currency', currency }).format(price);
