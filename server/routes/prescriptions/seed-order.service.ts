import Papa from 'papaparse';
import type { z } from 'zod';
import { CropSeason, Grower, Prescription } from '../../db/associations';
import { assertFound, inScope } from '../../lib/scope';
import { NotFoundError } from '../../errors';
import type { Actor } from '../../types';
import type { SeedOrder, seedOrderQuerySchema } from '../../../shared/schemas/prescription.schema';
import type { Product as ProductDto } from '../../../shared/schemas/product.schema';
import { seedOrderLine } from '../../../shared/rates/totals';
import {
  defaultQuantityUnit,
  defaultRateUnit,
  quantityFromSi,
  rateFromSi,
  RATE_UNIT_DEFS,
  QUANTITY_UNIT_DEFS,
} from '../../../shared/rates/rate-units';
import { m2ToAc, m2ToHa, type UnitSystem } from '../../../shared/units';
import { findPrescription, productOf, totalsOf, unitSystemOf } from './prescription.dto';
import { prescriptionZones } from './prescription-store';

/**
 * A grower's order for a year: every current approved prescription of the grower's seasons of that year
 * (with drafts if asked: per prescription the newest version among those included), grouped by product.
 */
export async function seedOrder(actor: Actor, q: z.output<typeof seedOrderQuerySchema>): Promise<SeedOrder> {
  const grower = await Grower.findByPk(q.growerId, { attributes: ['id', 'name', 'workspaceId'] });
  if (!grower || !inScope(actor, grower.workspaceId, grower.id)) throw new NotFoundError('Grower');
  const statuses = q.drafts === 'true' ? ['approved', 'draft'] : ['approved'];
  const rows = await Prescription.findAll({
    where: { workspaceId: actor.workspaceId, growerId: grower.id, status: statuses },
    include: [
      { model: CropSeason, as: 'season', attributes: ['id', 'year', 'crop'], where: { year: q.year } },
    ],
    attributes: ['id', 'lineageId', 'versionNo'],
    order: [['versionNo', 'DESC']],
  });
  const newestPerLineage = new Map<string, string>();
  for (const r of rows) if (!newestPerLineage.has(r.lineageId)) newestPerLineage.set(r.lineageId, r.id);

  const byProduct = new Map<string, { product: ProductDto; fields: Parameters<typeof seedOrderLine>[1] }>();
  for (const id of newestPerLineage.values()) {
    const p = assertFound(await findPrescription(actor, id), 'Prescription');
    const product = productOf(p);
    const totals = totalsOf(p, await prescriptionZones(p.id));
    const entry = byProduct.get(product.id) ?? { product, fields: [] };
    entry.fields.push({
      prescriptionId: p.id,
      prescriptionName: p.name,
      versionNo: p.versionNo,
      status: p.status,
      fieldName: p.field?.name ?? '',
      farmName: p.field?.farm?.name ?? '',
      areaM2: totals.field.areaM2,
      meanRateSi: totals.field.meanRateSi,
      quantity: totals.field.quantity,
    });
    byProduct.set(product.id, entry);
  }
  const lines = [...byProduct.values()]
    .sort((a, b) =>
      a.product.kind === b.product.kind
        ? a.product.name.localeCompare(b.product.name)
        : a.product.kind === 'seed'
          ? -1
          : 1,
    )
    .map(({ product, fields }) =>
      seedOrderLine(
        product,
        fields.sort((a, b) => a.farmName.localeCompare(b.farmName) || a.fieldName.localeCompare(b.fieldName)),
      ),
    );
  return {
    growerId: grower.id,
    growerName: grower.name,
    year: q.year,
    lines,
    generatedAt: new Date().toISOString(),
  };
}

const r2 = (v: number) => Math.round(v * 100) / 100;

/** The order as CSV (one row per field, then a total row per product), in the reader's units. */
export function seedOrderCsv(order: SeedOrder, system: UnitSystem): string {
  const areaUnit = system === 'imperial' ? 'ac' : 'ha';
  const area = (m2: number) => r2(system === 'imperial' ? m2ToAc(m2) : m2ToHa(m2));
  const rows: Record<string, string | number | null>[] = [];
  for (const line of order.lines) {
    const rateUnit = defaultRateUnit(line.product.rateKind, system);
    const qUnit = defaultQuantityUnit(line.product.rateKind, system);
    const base = {
      grower: order.growerName,
      year: order.year,
      product: line.product.name,
      crop: line.product.crop ?? '',
    };
    for (const f of line.fields) {
      rows.push({
        ...base,
        farm: f.farmName,
        field: f.fieldName,
        prescription: `${f.prescriptionName} v${f.versionNo}${f.status === 'draft' ? ' (draft)' : ''}`,
        [`area_${areaUnit}`]: area(f.areaM2),
        mean_rate:
          Math.round(rateFromSi(f.meanRateSi, rateUnit) * 10 ** RATE_UNIT_DEFS[rateUnit].decimals) /
          10 ** RATE_UNIT_DEFS[rateUnit].decimals,
        rate_unit: RATE_UNIT_DEFS[rateUnit].label,
        quantity: r2(quantityFromSi(f.quantity, qUnit)),
        quantity_unit: QUANTITY_UNIT_DEFS[qUnit].label,
        units: f.unitsToOrder,
        unit_name: line.product.unitName,
        cost: f.cost == null ? '' : r2(f.cost),
        currency: line.product.currency,
      });
    }
    rows.push({
      ...base,
      farm: '',
      field: 'TOTAL',
      prescription: `${line.fields.length} field(s); ${line.unitsByField} ${line.product.unitName}(s) if rounded per field`,
      [`area_${areaUnit}`]: area(line.areaM2),
      mean_rate: '',
      rate_unit: '',
      quantity: r2(quantityFromSi(line.quantity, qUnit)),
      quantity_unit: QUANTITY_UNIT_DEFS[qUnit].label,
      units: line.unitsAcrossFields,
      unit_name: line.product.unitName,
      cost: line.cost == null ? '' : r2(line.cost),
      currency: line.product.currency,
    });
  }
  const columns = [
    'grower',
    'year',
    'product',
    'crop',
    'farm',
    'field',
    'prescription',
    `area_${areaUnit}`,
    'mean_rate',
    'rate_unit',
    'quantity',
    'quantity_unit',
    'units',
    'unit_name',
    'cost',
    'currency',
  ];
  // Cells that a spreadsheet would run as a formula are quoted with a leading apostrophe (CSV injection).
  const safe = rows.map((r) =>
    Object.fromEntries(
      columns.map((c) => [
        c,
        typeof r[c] === 'string' && /^[=+\-@\t\r]/.test(r[c] as string) ? `'${r[c]}` : (r[c] ?? ''),
      ]),
    ),
  );
  return Papa.unparse({ fields: columns, data: safe.map((r) => columns.map((c) => r[c])) });
}

export { unitSystemOf };
