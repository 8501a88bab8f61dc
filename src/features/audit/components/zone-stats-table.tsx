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

/** How the figures are shown: the rate unit, the unit system, the product's purchase unit and money. */
type Shown = { unit: RateUnit; system: UnitSystem; unitName: string; money: Money };

/** The whole field in a few figures: area, mean target and applied, bias, share in band, seed and money. */
export function FieldFacts({
  stats,
  statsTrue,
  unit,
  system,
  unitName,
  money,
}: Shown & { stats: AuditStats; statsTrue: AuditStats | null }) {
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
export function ZoneStatsTable({ zones, unit, system, unitName, money }: Shown & { zones: Row[] }) {
  const f = figures(unit, system, money);
  const label = RATE_UNIT_DEFS[unit].label;
  const corrected = zones.some((z) => z.statsTrue);
  const units = `${unitName.charAt(0).toUpperCase()}${unitName.slice(1)}s`;
  type Key = Exclude<keyof AuditStats, 'costDelta'>;
  /** A right-aligned, sortable column of one statistic, as logged or (`true`) corrected for the speed error. */
  const stat = (key: Key | 'costDelta', header: string, show: (v: number) => string, corrected = false) =>
    ({
      id: corrected ? `true-${key}` : key,
      header,
      accessorFn: (z) => (corrected ? z.statsTrue : z.stats)?.[key] ?? 0,
      meta: { numeric: true },
      cell: ({ row }) => {
        const s = corrected ? row.original.statsTrue : row.original.stats;
        const v = s?.[key];
        return <span className="whitespace-nowrap">{v == null ? '—' : show(v)}</span>;
      },
    }) satisfies ColumnDef<Row, unknown>;
  const signed1 = (v: number) => signedNumber(v, 1);
  const columns: ColumnDef<Row, unknown>[] = [
    {
      id: 'zone',
      header: 'Zone',
      accessorFn: (z) => z.name,
      sortingFn: 'alphanumeric',
      cell: ({ row }) => <span className="font-medium whitespace-nowrap">{row.original.name}</span>,
    },
    stat('areaM2', 'Area', f.area),
    {
      id: 'target',
      header: `Target (${label})`,
      accessorFn: (z) => z.targetSi,
      meta: { numeric: true },
      cell: ({ row }) => f.rate(row.original.targetSi),
    },
    stat('meanAppliedSi', `Applied (${label})`, f.rate),
    stat('biasPct', 'Bias', (v) => f.pct(v)),
    stat('rmseSi', `RMSE (${label})`, f.rate),
    stat('cvPct', 'CV', (v) => `${formatNumber(v, 1)} %`),
    stat('inBandShare', 'In band', f.share),
    stat('areaOverM2', 'Area over', f.area),
    stat('areaUnderM2', 'Area under', f.area),
    stat('unitsDelta', `${units} ±`, signed1),
    stat('costDelta', 'Money ±', f.money),
    ...(corrected
      ? [
          stat('meanAppliedSi', `Corrected applied (${label})`, f.rate, true),
          stat('biasPct', 'Corrected bias', (v) => f.pct(v), true),
          stat('unitsDelta', `Corrected, ${unitName}s ±`, signed1, true),
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
