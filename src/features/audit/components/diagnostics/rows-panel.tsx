import type { RowDiagnostic } from '@shared/schemas/as-applied.schema';
import { RATE_UNIT_DEFS, rateFromSi, type RateUnit } from '@shared/rates/rate-units';
import { lengthUnitLabel, rowSpacingToDisplay, type UnitSystem } from '@shared/units';
import { Facts } from '@/components/ui/facts';
import { formatNumber } from '@/lib/format';
import { ChartFigure, DiagnosticPanel, MedianLine } from './panel';
import { MARK } from './units';

const KIND_WORDS: Record<RowDiagnostic['kind'], string> = {
  population: 'Population',
  singulation: 'Singulation',
  load: 'Meter load',
  vacuum: 'Vacuum',
  spacing: 'Seed spacing',
};

/** How a kind's row values read: population in the prescription's rate unit, spacing in in or cm. */
function valueFormat(kind: RowDiagnostic['kind'], rateUnit: RateUnit, system: UnitSystem) {
  if (kind === 'population') {
    const def = RATE_UNIT_DEFS[rateUnit];
    return { unit: def.label, show: (v: number) => formatNumber(rateFromSi(v, rateUnit), def.decimals) };
  }
  if (kind === 'spacing')
    return {
      unit: lengthUnitLabel(system),
      show: (v: number) => formatNumber(rowSpacingToDisplay(v, system), 1),
    };
  return { unit: kind === 'singulation' ? '%' : '', show: (v: number) => formatNumber(v, 1) };
}

const W = 640;
const H = 150;
const PAD = { left: 12, right: 12, top: 22, bottom: 22 };

/**
 * Every row of the planter side by side: a stem from the planter's median to the row's mean, the flagged
 * rows in a second colour, larger, and named; the shaded strip is how far a row may stray before it is
 * flagged.
 */
function RowStrip({ d, show, unit }: { d: RowDiagnostic; show: (v: number) => string; unit: string }) {
  const rows = [...d.rows].sort((a, b) => a.row - b.row);
  const limit = d.threshold * 1.4826 * d.mad;
  // From the lowest to the highest of the rows and the strip, with a little room for the name of a row.
  const means = rows.map((r) => r.mean);
  let lo = Math.min(d.median - limit, ...means);
  let hi = Math.max(d.median + limit, ...means);
  if (hi - lo <= 0) [lo, hi] = [d.median - 1, d.median + 1];
  const room = (hi - lo) * 0.08;
  const x = (i: number) => PAD.left + ((i + 0.5) / rows.length) * (W - PAD.left - PAD.right);
  const y = (v: number) => PAD.top + ((hi + room - v) / (hi - lo + 2 * room)) * (H - PAD.top - PAD.bottom);
  const flagged = rows.filter((r) => r.flagged);
  return (
    <ChartFigure
      label={`${KIND_WORDS[d.kind]} of ${rows.length} rows; median ${show(d.median)} ${unit}${
        flagged.length ? `; apart: ${flagged.map((r) => `Row ${r.row}`).join(', ')}` : '; no row apart'
      }`}
      width={W}
      height={H}
      wide
      caption={
        <>
          {KIND_WORDS[d.kind]} by row (numbers under the rows); the dashed line is the planter&apos;s median,{' '}
          {show(d.median)} {unit}; a row outside the shaded strip stands apart.
        </>
      }
    >
      {limit > 0 ? (
        <rect
          x={PAD.left}
          width={W - PAD.left - PAD.right}
          y={y(d.median + limit)}
          height={y(d.median - limit) - y(d.median + limit)}
          fill="#e9e4d8"
        />
      ) : null}
      <MedianLine x1={PAD.left} x2={W - PAD.right} y={y(d.median)} />
      {rows.map((r, i) => (
        <g key={r.row}>
          <line
            x1={x(i)}
            x2={x(i)}
            y1={y(d.median)}
            y2={y(r.mean)}
            stroke={r.flagged ? MARK.vermillion : MARK.soft}
            strokeWidth={r.flagged ? 2.5 : 1.5}
          />
          {r.flagged ? (
            <rect
              x={x(i) - 5}
              y={y(r.mean) - 5}
              width={10}
              height={10}
              fill={MARK.vermillion}
              stroke={MARK.ink}
            />
          ) : (
            <circle cx={x(i)} cy={y(r.mean)} r={3.2} fill={MARK.blue} />
          )}
          <title>{`Row ${r.row}: ${show(r.mean)} ${unit}${r.flagged ? ' (apart from the others)' : ''}`}</title>
          {r.flagged ? (
            // Named beside its mark, on the side with more room.
            <text
              x={i < rows.length * 0.7 ? x(i) + 9 : x(i) - 9}
              y={y(r.mean) + 4}
              textAnchor={i < rows.length * 0.7 ? 'start' : 'end'}
              className="fill-ink text-[11px] font-semibold"
            >
              Row {r.row}
            </text>
          ) : null}
          {r.flagged || rows.length <= 32 || i % 4 === 0 ? (
            <text
              x={x(i)}
              y={H - 6}
              textAnchor="middle"
              className={r.flagged ? 'fill-ink text-[9px] font-semibold' : 'fill-ink-soft text-[9px]'}
            >
              {r.row}
            </text>
          ) : null}
        </g>
      ))}
    </ChartFigure>
  );
}

/** Rows that stand apart from the rest, per kind of row value the log carries; seed spacing uniformity. */
export function RowsPanel({
  rows,
  rateUnit,
  system,
}: {
  rows: RowDiagnostic[];
  rateUnit: RateUnit;
  system: UnitSystem;
}) {
  const apart = rows.flatMap((d) => d.rows.filter((r) => r.flagged).map((r) => ({ d, r })));
  const verdict = apart.length
    ? apart
        .map(({ d, r }) => {
          const pct = d.median !== 0 ? ((r.mean - d.median) / d.median) * 100 : 0;
          return `Row ${r.row} is ${formatNumber(Math.abs(pct), 1)} % ${pct < 0 ? 'below' : 'above'} the median in ${KIND_WORDS[d.kind].toLowerCase()}.`;
        })
        .join(' ') + ' Check that row unit (meter, seed tube, drive) before the next planting.'
    : 'No row stands apart from the others.';
  return (
    <DiagnosticPanel title="Rows compared" verdict={verdict}>
      {rows.map((d) => {
        const f = valueFormat(d.kind, rateUnit, system);
        return (
          <div key={d.kind} className="space-y-2">
            <h4 className="text-sm font-medium text-ink">
              {KIND_WORDS[d.kind]}
              {f.unit ? ` (${f.unit})` : ''}
            </h4>
            <RowStrip d={d} show={f.show} unit={f.unit} />
            {d.uniformity ? (
              <Facts
                columns={4}
                items={[
                  {
                    label: 'Multiples',
                    value: `${formatNumber(d.uniformity.multiples, 1)} %`,
                    numeric: true,
                  },
                  { label: 'Misses', value: `${formatNumber(d.uniformity.misses, 1)} %`, numeric: true },
                  {
                    label: 'Quality of feed',
                    value: `${formatNumber(d.uniformity.quality, 1)} %`,
                    numeric: true,
                  },
                  {
                    label: 'Precision',
                    value: Number.isFinite(d.uniformity.precision)
                      ? `${formatNumber(d.uniformity.precision, 1)} %`
                      : '—',
                    numeric: true,
                  },
                ]}
              />
            ) : null}
            {d.uniformity ? (
              <p className="text-xs text-ink-soft">
                Kachman &amp; Smith (1995) indices against a spacing of {f.show(d.uniformity.xRef)} {f.unit}:
                multiples and misses are spacings under half and over one and a half times it; precision is
                the spread of the rest (lower is better).
              </p>
            ) : null}
          </div>
        );
      })}
    </DiagnosticPanel>
  );
}
