import type { PrescriptionTotals } from '@shared/schemas/prescription.schema';
import type { Product } from '@shared/schemas/product.schema';
import {
  defaultQuantityUnit,
  quantityFromSi,
  QUANTITY_UNIT_DEFS,
  RATE_UNIT_DEFS,
  type RateUnit,
} from '@shared/rates/rate-units';
import { areaToDisplay, areaUnitLabel, type UnitSystem } from '@shared/units';
import { formatNumber } from '@/lib/format';
import { rateFigures } from './rate-values';

const th = 'px-2 py-1.5 text-xs font-medium text-ink-soft';
const num = 'px-2 py-1.5 text-right font-mono tabular-nums';

/** "unit" → "units", "box" → "boxes". */
export const plural = (word: string) => (/(s|x|z|ch|sh)$/i.test(word) ? `${word}es` : `${word}s`);

const capital = (word: string) => word.charAt(0).toUpperCase() + word.slice(1);

const money = (value: number | null, currency: string) =>
  value === null
    ? '—'
    : new Intl.NumberFormat('en-US', { style: 'currency', currency, maximumFractionDigits: 2 }).format(value);

/**
 * What the prescription needs: per zone (and the part of the field no zone covers) the area, rate,
 * quantity and purchase units; for the field the mean rate weighted by area, the units to order (whole)
 * and their cost.
 */
export function TotalsPanel({
  totals,
  product,
  unit,
  system,
}: {
  totals: PrescriptionTotals;
  product: Product;
  unit: RateUnit;
  system: UnitSystem;
}) {
  const q = defaultQuantityUnit(product.rateKind, system);
  const qLabel = QUANTITY_UNIT_DEFS[q].label;
  const qty = (si: number) => formatNumber(quantityFromSi(si, q), q === 'seeds' ? 0 : 1);
  const area = (m2: number) => formatNumber(areaToDisplay(m2, system), 2);
  const f = totals.field;
  const priced = product.pricePerUnit !== null;
  return (
    <div className="space-y-2">
      <div className="overflow-x-auto rounded-card border border-ink-line bg-paper-raised">
        <table className="w-full border-collapse text-sm" aria-label="Totals">
          <thead>
            <tr className="border-b border-ink-line bg-paper-sunk/60">
              <th scope="col" className={`${th} text-left`}>
                Zone
              </th>
              <th scope="col" className={`${th} text-right`}>
                Area ({areaUnitLabel(system)})
              </th>
              <th scope="col" className={`${th} text-right`}>
                Rate ({RATE_UNIT_DEFS[unit].label})
              </th>
              <th scope="col" className={`${th} text-right`}>
                {qLabel === 'seeds' ? 'Seeds' : `Quantity (${qLabel})`}
              </th>
              <th scope="col" className={`${th} text-right`}>
                {capital(plural(product.unitName))}
              </th>
              {priced ? (
                <th scope="col" className={`${th} text-right`}>
                  Cost
                </th>
              ) : null}
            </tr>
          </thead>
          <tbody>
            {totals.lines.map((l) => (
              <tr key={l.zoneId} className="border-b border-ink-line/70 last:border-b-0">
                <th scope="row" className="px-2 py-1.5 text-left font-normal">
                  {l.name}
                </th>
                <td className={num}>{area(l.areaM2)}</td>
                <td className={num}>{rateFigures(l.rateSi, unit)}</td>
                <td className={num}>{qty(l.quantity)}</td>
                <td className={num}>{formatNumber(l.units, 2)}</td>
                {priced ? <td className={num}>{money(l.cost, product.currency)}</td> : null}
              </tr>
            ))}
          </tbody>
          <tfoot className="border-t-2 border-ink-line bg-paper-sunk/40">
            <tr data-row="field">
              <th scope="row" className="px-2 py-1.5 text-left font-medium">
                Field (mean rate by area)
              </th>
              <td className={`${num} font-medium`}>{area(f.areaM2)}</td>
              <td className={`${num} font-medium`}>{rateFigures(f.meanRateSi, unit)}</td>
              <td className={`${num} font-medium`}>{qty(f.quantity)}</td>
              <td className={`${num} font-medium`}>{formatNumber(f.units, 2)}</td>
              {priced ? <td className={num} /> : null}
            </tr>
            <tr data-row="order">
              <th scope="row" className="px-2 py-1.5 text-left font-medium" colSpan={4}>
                {capital(plural(product.unitName))} to order for this field (whole, rounded up)
              </th>
              <td className={`${num} font-semibold text-ink`}>{formatNumber(f.unitsToOrder)}</td>
              {priced ? (
                <td className={`${num} font-semibold text-ink`}>{money(f.cost, product.currency)}</td>
              ) : null}
            </tr>
          </tfoot>
        </table>
      </div>
      <p className="text-xs text-ink-soft">
        {product.name}: {formatNumber(quantityFromSi(product.unitSize, q), q === 'seeds' ? 0 : 2)} {qLabel} a{' '}
        {product.unitName}
        {priced ? `, ${money(product.pricePerUnit, product.currency)} each` : ', no price set'}. Several
        fields ordered together may need fewer {plural(product.unitName)} than their sum; the seed order adds
        them up per grower.
      </p>
    </div>
  );
}
