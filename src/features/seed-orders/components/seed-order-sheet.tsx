import type { ReactNode } from 'react';
import type { z } from 'zod';
import { CROP_LABELS } from '@shared/schemas/crops';
import {
  PRESCRIPTION_STATUS_LABELS,
  type PrescriptionStatus,
  type SeedOrder,
  type seedOrderLineSchema,
} from '@shared/schemas/prescription.schema';
import {
  defaultQuantityUnit,
  defaultRateUnit,
  quantityFromSi,
  QUANTITY_UNIT_DEFS,
  rateFromSi,
  RATE_UNIT_DEFS,
} from '@shared/rates/rate-units';
import { areaToDisplay, areaUnitLabel, type UnitSystem } from '@shared/units';
import { Badge, type Tone } from '@/components/ui/badge';
import { EmptyState } from '@/components/ui/empty-state';
import { formatDateTime, formatNumber } from '@/lib/format';
import { useUnitSystem } from '@/lib/viewer';
import './seed-order-print.css';

type Line = z.infer<typeof seedOrderLineSchema>;

export const SEED_ORDER_CAUTION =
  "Seed quantities are planning figures: check them against your supplier's bag counts. Treated seed is a pesticide: follow the label.";

const STATUS_TONE: Record<PrescriptionStatus, Tone> = {
  approved: 'ok',
  draft: 'caution',
  superseded: 'neutral',
};

const money = (amount: number | null, currency: string) =>
  amount == null ? '—' : new Intl.NumberFormat('en-US', { style: 'currency', currency }).format(amount);

/** How a product's figures are shown: rates and quantities in its natural unit for the person's system. */
function unitsOf(line: Line, system: UnitSystem) {
  const rate = defaultRateUnit(line.product.rateKind, system);
  const quantity = defaultQuantityUnit(line.product.rateKind, system);
  return {
    rateLabel: RATE_UNIT_DEFS[rate].label,
    rate: (si: number) => formatNumber(rateFromSi(si, rate), RATE_UNIT_DEFS[rate].decimals),
    quantityLabel: QUANTITY_UNIT_DEFS[quantity].label,
    quantity: (si: number) => formatNumber(quantityFromSi(si, quantity), quantity === 'seeds' ? 0 : 1),
    size: `${formatNumber(quantityFromSi(line.product.unitSize, quantity), quantity === 'seeds' ? 0 : 1)} ${QUANTITY_UNIT_DEFS[quantity].label} per ${line.product.unitName}`,
  };
}

/** "unit" → "units", "box" → "boxes": enough for the names of purchase units. */
const plural = (name: string) => (/(s|x|z|ch|sh)$/.test(name) ? `${name}es` : `${name}s`);

const th = 'px-2 py-1.5 text-left font-medium';
const thNum = 'px-2 py-1.5 text-right font-medium';
const td = 'px-2 py-1.5';
const tdNum = 'px-2 py-1.5 text-right font-mono tabular-nums';

function ProductOrder({ line, system }: { line: Line; system: UnitSystem }) {
  const u = unitsOf(line, system);
  const area = areaUnitLabel(system);
  const p = line.product;
  const totalRow = (
    label: ReactNode,
    cells: { area?: string; quantity?: string; units: string; cost?: string },
  ) => (
    <tr className="border-t border-ink-line">
      <th scope="row" colSpan={4} className={`${td} text-left font-medium`}>
        {label}
      </th>
      <td className={tdNum}>{cells.area ?? ''}</td>
      <td className={tdNum} />
      <td className={tdNum}>{cells.quantity ?? ''}</td>
      <td className={`${tdNum} font-semibold`}>{cells.units}</td>
      <td className={`${tdNum} font-semibold`}>{cells.cost ?? ''}</td>
    </tr>
  );
  return (
    <section aria-labelledby={`product-${p.id}`} className="mt-6">
      <div className="keep-together mb-1.5 flex flex-wrap items-baseline justify-between gap-x-4">
        <h3 id={`product-${p.id}`} className="text-base font-semibold text-ink">
          {p.name}
        </h3>
        <p className="text-sm text-ink-soft">
          {[
            p.crop ? CROP_LABELS[p.crop] : 'Other product',
            u.size,
            `${money(p.pricePerUnit, p.currency)} per ${p.unitName}`,
          ].join(' · ')}
        </p>
      </div>
      <div className="overflow-x-auto rounded-card border border-ink-line bg-paper-raised print:overflow-visible">
        <table className="w-full border-collapse text-sm" aria-label={`Fields for ${p.name}`}>
          <thead>
            <tr className="border-b border-ink-line bg-paper-sunk/60 text-xs text-ink-soft">
              {['Farm', 'Field', 'Prescription', 'Status'].map((h) => (
                <th key={h} scope="col" className={th}>
                  {h}
                </th>
              ))}
              {[
                `Area (${area})`,
                `Mean rate (${u.rateLabel})`,
                `Quantity (${u.quantityLabel})`,
                `Whole ${plural(p.unitName)}`,
                'Cost',
              ].map((h) => (
                <th key={h} scope="col" className={thNum}>
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {line.fields.map((f) => (
              <tr key={f.prescriptionId} className="border-b border-ink-line/70 last:border-b-0">
                <td className={td}>{f.farmName}</td>
                <td className={td}>{f.fieldName}</td>
                <td className={td}>
                  {f.prescriptionName} <span className="font-mono text-xs text-ink-soft">v{f.versionNo}</span>
                </td>
                <td className={td}>
                  <Badge tone={STATUS_TONE[f.status]}>{PRESCRIPTION_STATUS_LABELS[f.status]}</Badge>
                </td>
                <td className={tdNum}>{formatNumber(areaToDisplay(f.areaM2, system), 1)}</td>
                <td className={tdNum}>{u.rate(f.meanRateSi)}</td>
                <td className={tdNum}>{u.quantity(f.quantity)}</td>
                <td className={tdNum}>{formatNumber(f.unitsToOrder)}</td>
                <td className={tdNum}>{money(f.cost, p.currency)}</td>
              </tr>
            ))}
          </tbody>
          <tfoot className="bg-paper-sunk/40">
            {totalRow(`Total, each field rounded up to whole ${plural(p.unitName)}`, {
              area: formatNumber(areaToDisplay(line.areaM2, system), 1),
              quantity: u.quantity(line.quantity),
              units: formatNumber(line.unitsByField),
            })}
            {totalRow(`To order: the whole quantity rounded up once`, {
              units: formatNumber(line.unitsAcrossFields),
              cost: money(line.cost, p.currency),
            })}
          </tfoot>
        </table>
      </div>
      <p className="mt-1 text-sm text-ink-soft">
        Order <strong className="font-mono text-ink">{formatNumber(line.unitsAcrossFields)}</strong>{' '}
        {line.unitsAcrossFields === 1 ? p.unitName : plural(p.unitName)}
        {line.unitsByField > line.unitsAcrossFields
          ? ` (${formatNumber(line.unitsByField)} if every field were rounded up on its own).`
          : '.'}
      </p>
    </section>
  );
}

/** Cost of the whole order per currency; products without a price are counted, not guessed. */
function GrandTotal({ lines }: { lines: Line[] }) {
  const byCurrency = new Map<string, number>();
  for (const l of lines)
    if (l.cost != null)
      byCurrency.set(l.product.currency, (byCurrency.get(l.product.currency) ?? 0) + l.cost);
  const unpriced = lines.filter((l) => l.cost == null).map((l) => l.product.name);
  return (
    <section aria-labelledby="seed-order-total" className="keep-together mt-7">
      <h3 id="seed-order-total" className="mb-1.5 text-base font-semibold text-ink">
        Total cost
      </h3>
      {byCurrency.size ? (
        <dl className="inline-grid grid-cols-[auto_auto] gap-x-6 gap-y-1 rounded-card border border-ink-line bg-paper-raised px-3 py-2 text-sm">
          {[...byCurrency].map(([currency, cost]) => (
            <div key={currency} className="contents">
              <dt className="text-ink-soft">{currency}</dt>
              <dd className="text-right font-mono font-semibold tabular-nums">{money(cost, currency)}</dd>
            </div>
          ))}
        </dl>
      ) : (
        <p className="text-sm text-ink-soft">No product on this order has a price.</p>
      )}
      {unpriced.length && byCurrency.size ? (
        <p className="mt-1 text-sm text-ink-soft">
          Without a price, not in the total: {unpriced.join(', ')}.
        </p>
      ) : null}
    </section>
  );
}

/** A grower's order for a year, per product: every field's share, then what to buy. Prints on one sheet. */
export function SeedOrderSheet({ order, drafts }: { order: SeedOrder; drafts: boolean }) {
  const system = useUnitSystem();
  return (
    <article className="seed-order-sheet" aria-labelledby="seed-order-title">
      <header className="border-b border-ink-line pb-2">
        <h2 id="seed-order-title" className="text-lg font-semibold text-ink">
          Seed order: {order.growerName}, {order.year}
        </h2>
        <p className="text-sm text-ink-soft">
          Generated {formatDateTime(order.generatedAt)} ·{' '}
          {drafts ? 'approved and draft prescriptions (drafts marked)' : 'approved prescriptions only'} ·
          areas in {areaUnitLabel(system) === 'ac' ? 'acres' : 'hectares'}
        </p>
      </header>
      {order.lines.length === 0 ? (
        <div className="mt-4">
          <EmptyState title={`Nothing to order for ${order.year}`}>
            {drafts
              ? `${order.growerName} has no prescriptions for ${order.year} yet.`
              : `${order.growerName} has no approved prescriptions for ${order.year}. Include drafts to see what is being planned.`}
          </EmptyState>
        </div>
      ) : (
        <>
          {order.lines.map((line) => (
            <ProductOrder key={line.product.id} line={line} system={system} />
          ))}
          <GrandTotal lines={order.lines} />
        </>
      )}
      <footer className="mt-7 border-t border-ink-line pt-2 text-sm text-ink-soft">
        {SEED_ORDER_CAUTION}
      </footer>
    </article>
  );
}
