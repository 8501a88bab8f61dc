import type { ColumnDef } from '@tanstack/react-table';
import type { AuditResult, AuditStats } from '@shared/schemas/as-applied.schema';
import { RATE_UNIT_DEFS, rateFromSi, type RateUnit } from '@shared/rates/rate-units';
import type { UnitSystem } from '@shared/units';
import { DataTable } from '@/components/ui/data-table';
import { Facts } from '@/components/ui/facts';
import { formatArea, formatNumber } from '@/lib/format';

type Row = AuditResult['zones'][number];

export type Money = (v: number) => string;

/** A signed figure: "+1,204", "−36", "±0". */
export const signedNumber = (v: number, decimals = 0) => {
  const shown = formatNumber(Math.abs(v), decimals);
  return `${Number(shown.replace(/,/g, '')) === 0 ? '±' : v > 0 ? '+' : '−'}${shown}`;
};

/** An amount of money in a currency, signed. */
export const moneyFormat = (currency: string): Money => {
  const f = new Intl.NumberFormat('en-US', { style: 'currency', currency, maximumFractionDigits: 0 });
  return (v) => `${v > 0 ? '+' : v < 0 ? '−' : '±'}${f.format(Math.abs(v))}`;
};

/** Every figure of one set of statistics, in the reader's units. */
function figures(unit: RateUnit, system: UnitSystem, money: Money) {
  const d = RATE_UNIT_DEFS[unit].decimals;
  return {
    rate: (si: number) => formatNumber(rateFromSi(si, unit), d),
    area: (m2: number) => formatArea(m2, system),
    pct: (v: number, decimals = 1) => `${signedNumber(v, decimals)} %`,
    share: (s: number) => `${formatNumber(s * 100, 0)} %`,
    money: (v: number | null) => (v == null ? '—' : money(v)),
  };
}

/** The whole field in a few figures: area, mean target and applied, bias, share in band, seed and money. */
export function FieldFacts({
  stats,
  statsTrue,
  unit,
  system,
  unitName,
  money,
}: {
  stats: AuditStats;
  statsTrue: AuditStats | null;
  unit: RateUnit;
  system: UnitSystem;
  unitName: string;
  money: Money;
}) {
  const f = figures(unit, system, money);
  const label = RATE_UNIT_DEFS[unit].label;
  return (
    <Facts
      columns={4}
      items={[
        { label: 'Planted area (kept points)', value: f.area(stats.areaM2), numeric: true },
        { label: `Target, mean (${label})`, value: f.rate(stats.meanTargetSi), numeric: true },
        { label: `Applied as logged, mean (${label})`, value: f.rate(stats.meanAppliedSi), numeric: true },
        ...(statsTrue
          ? [
              {
                label: `Applied, corrected (${label})`,
                value: f.rate(statsTrue.meanAppliedSi),
                numeric: true,
              },
            ]
          : []),
        { label: 'Bias', value: f.pct(stats.biasPct), numeric: true },
        { label: 'Area within the band', value: f.share(stats.inBandShare), numeric: true },
        {
          label: `More (+) or less (−) than prescribed, ${unitName}s`,
          value: signedNumber(stats.unitsDelta, 1),
          numeric: true,
        },
        { label: 'The same in money', value: f.money(stats.costDelta), numeric: true },
      ]}
    />
  );
}

/**
 * Per zone: area, mean target and applied, bias, RMSE, CV, share in band, area over and under, seed and
 * money more or less than prescribed, and the corrected figures when the log had both speeds. Sortable.
 */
export function ZoneStatsTable({
  zones,
  unit,
  system,
  unitName,
  money,
}: {
  zones: Row[];
  unit: RateUnit;
  system: UnitSystem;
  unitName: string;
  money: Money;
}) {
  const f = figures(unit, system, money);
  const label = RATE_UNIT_DEFS[unit].label;
  const corrected = zones.some((z) => z.statsTrue);
  /** A right-aligned, sortable column of figures. */
  const num = (id: string, header: string, sortBy: (z: Row) => number, show: (z: Row) => string) =>
    ({
      id,
      header,
      accessorFn: sortBy,
      meta: { numeric: true },
      cell: ({ row }) => show(row.original),
    }) satisfies ColumnDef<Row, unknown>;
  const withTrue = (show: (t: AuditStats) => string) => (z: Row) => (z.statsTrue ? show(z.statsTrue) : '—');
  const columns: ColumnDef<Row, unknown>[] = [
    { id: 'zone', header: 'Zone', accessorFn: (z) => z.name, sortingFn: 'alphanumeric' },
    num(
      'area',
      'Area',
      (z) => z.stats.areaM2,
      (z) => f.area(z.stats.areaM2),
    ),
    num(
      'target',
      `Target (${label})`,
      (z) => z.targetSi,
      (z) => f.rate(z.targetSi),
    ),
    num(
      'applied',
      `Applied (${label})`,
      (z) => z.stats.meanAppliedSi,
      (z) => f.rate(z.stats.meanAppliedSi),
    ),
    num(
      'bias',
      'Bias',
      (z) => z.stats.biasPct,
      (z) => f.pct(z.stats.biasPct),
    ),
    num(
      'rmse',
      `RMSE (${label})`,
      (z) => z.stats.rmseSi,
      (z) => f.rate(z.stats.rmseSi),
    ),
    num(
      'cv',
      'CV',
      (z) => z.stats.cvPct,
      (z) => `${formatNumber(z.stats.cvPct, 1)} %`,
    ),
    num(
      'inBand',
      'In band',
      (z) => z.stats.inBandShare,
      (z) => f.share(z.stats.inBandShare),
    ),
    num(
      'over',
      'Area over',
      (z) => z.stats.areaOverM2,
      (z) => f.area(z.stats.areaOverM2),
    ),
    num(
      'under',
      'Area under',
      (z) => z.stats.areaUnderM2,
      (z) => f.area(z.stats.areaUnderM2),
    ),
    num(
      'units',
      `${unitName}s ±`,
      (z) => z.stats.unitsDelta,
      (z) => signedNumber(z.stats.unitsDelta, 1),
    ),
    num(
      'money',
      'Money ±',
      (z) => z.stats.costDelta ?? 0,
      (z) => f.money(z.stats.costDelta),
    ),
    ...(corrected
      ? [
          num(
            'trueApplied',
            `Corrected applied (${label})`,
            (z) => z.statsTrue?.meanAppliedSi ?? 0,
            withTrue((t) => f.rate(t.meanAppliedSi)),
          ),
          num(
            'trueBias',
            'Corrected bias',
            (z) => z.statsTrue?.biasPct ?? 0,
            withTrue((t) => f.pct(t.biasPct)),
          ),
          num(
            'trueUnits',
            `Corrected ${unitName}s ±`,
            (z) => z.statsTrue?.unitsDelta ?? 0,
            withTrue((t) => signedNumber(t.unitsDelta, 1)),
          ),
        ]
      : []),
  ];
  return (
    <DataTable
      label="Zones"
      data={zones}
      columns={columns}
      getRowId={(z) => z.zoneId}
      initialSort={[{ id: 'zone', desc: false }]}
      rowClassName={() => 'print-row'}
    />
  );
}
