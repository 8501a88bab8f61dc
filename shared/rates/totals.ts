import type { z } from 'zod';
import type { Product } from '../schemas/product.schema';
import type {
  PrescriptionTotals,
  seedOrderFieldSchema,
  seedOrderLineSchema,
} from '../schemas/prescription.schema';
import { unitsToOrder } from './seed-units';

/**
 * What a prescription needs (DEVELOPERS.md "Prescriptions", DOMAIN.md §3): quantity = rate × area,
 * units = quantity / unit size, whole units rounded up, cost on whole units. All in SI: rates in
 * seeds/m², kg/m² or m³/m², areas in m², unit size in seeds, kg or m³.
 */

export type SeedOrderField = z.infer<typeof seedOrderFieldSchema>;
export type SeedOrderLine = z.infer<typeof seedOrderLineSchema>;

export type TotalsZone = { zoneId: string; name: string; areaM2: number; rateSi: number };

export type TotalsInput = {
  zones: TotalsZone[];
  /** Boundary area no zone covers: planted at the default rate. */
  uncoveredAreaM2: number;
  defaultRateSi: number;
  /** Seeds, kg or m³ in one purchase unit. */
  unitSize: number;
  pricePerUnit: number | null;
};

/**
 * Less uncovered area than this is the slivers of polygon arithmetic along zone edges (seen: 0.7 m² on a
 * 64 ha demo field), not land to plant: less than a metre's travel of a 12 m planter.
 */
export const UNCOVERED_MIN_M2 = 10;
export const DEFAULT_LINE_ID = 'default';
export const DEFAULT_LINE_NAME = 'Not in any zone (default rate)';

function requireNonNegative(value: number, what: string) {
  if (!Number.isFinite(value) || value < 0) {
    throw new RangeError(`${what} must be a number of at least 0, got ${String(value)}`);
  }
}

const sum = (values: number[]) => values.reduce((a, b) => a + b, 0);
const costOf = (units: number, price: number | null) => (price === null ? null : units * price);
/** Whole units, rounded up; `|| 0` turns the -0 that ceil gives for nothing at all into 0. */
const wholeUnits = (quantity: number, unitSize: number) => unitsToOrder(quantity, unitSize) || 0;

export function prescriptionTotals(input: TotalsInput): PrescriptionTotals {
  const { unitSize, pricePerUnit } = input;
  if (!(unitSize > 0) || !Number.isFinite(unitSize)) {
    throw new RangeError(`The unit size must be more than 0, got ${String(unitSize)}`);
  }
  if (pricePerUnit !== null) requireNonNegative(pricePerUnit, 'The price per unit');
  requireNonNegative(input.uncoveredAreaM2, 'The area no zone covers');
  requireNonNegative(input.defaultRateSi, 'The default rate');
  const rows: TotalsZone[] = [...input.zones];
  if (input.uncoveredAreaM2 > UNCOVERED_MIN_M2) {
    rows.push({
      zoneId: DEFAULT_LINE_ID,
      name: DEFAULT_LINE_NAME,
      areaM2: input.uncoveredAreaM2,
      rateSi: input.defaultRateSi,
    });
  }
  const lines = rows.map((z) => {
    requireNonNegative(z.areaM2, `The area of zone ${z.name}`);
    requireNonNegative(z.rateSi, `The rate of zone ${z.name}`);
    const quantity = z.rateSi * z.areaM2;
    const units = quantity / unitSize;
    return { ...z, quantity, units, cost: costOf(units, pricePerUnit) };
  });
  const areaM2 = sum(lines.map((l) => l.areaM2));
  const quantity = sum(lines.map((l) => l.quantity));
  const toOrder = wholeUnits(quantity, unitSize);
  return {
    lines,
    field: {
      areaM2,
      meanRateSi: areaM2 > 0 ? quantity / areaM2 : 0,
      quantity,
      units: sum(lines.map((l) => l.units)),
      unitsToOrder: toOrder,
      cost: costOf(toOrder, pricePerUnit),
    },
  };
}

/**
 * A grower's order of one product over several fields. Each field rounds up on its own (`unitsByField`);
 * ordered together the part units pool (`unitsAcrossFields`, never more), and the cost is on that.
 */
export function seedOrderLine(
  product: Product,
  fields: Omit<SeedOrderField, 'unitsToOrder' | 'cost'>[],
): SeedOrderLine {
  const price = product.pricePerUnit;
  const withUnits = fields.map((f) => {
    const units = wholeUnits(f.quantity, product.unitSize);
    return { ...f, unitsToOrder: units, cost: costOf(units, price) };
  });
  const quantity = sum(fields.map((f) => f.quantity));
  const unitsByField = sum(withUnits.map((f) => f.unitsToOrder));
  // Each field forgives float noise below 1e-9 of a unit (unitsToOrder); the noise of several fields added
  // can pass that tolerance, so pooled never orders more than field by field.
  const unitsAcrossFields = Math.min(wholeUnits(quantity, product.unitSize), unitsByField);
  return {
    product,
    fields: withUnits,
    areaM2: sum(fields.map((f) => f.areaM2)),
    quantity,
    unitsByField,
    unitsAcrossFields,
    cost: costOf(unitsAcrossFields, price),
  };
}
