import { Fragment } from 'react';
import type { PrescriptionZone, ZoneCheck } from '@shared/schemas/prescription.schema';
import { RATE_UNIT_DEFS, type RateUnit } from '@shared/rates/rate-units';
import { areaToDisplay, areaUnitLabel, type UnitSystem } from '@shared/units';
import { Badge } from '@/components/ui/badge';
import { formatNumber } from '@/lib/format';
import { RateInput } from './rate-input';
import { rateFigures } from './rate-values';

const th = 'px-2 py-1.5 text-xs font-medium text-ink-soft';
const num = 'px-2 py-1.5 text-right font-mono tabular-nums';

export const CHECK_LABEL = { ok: 'OK', warning: 'Warning', flagged: 'Flagged' } as const;
export const CHECK_TONE = { ok: 'ok', warning: 'caution', flagged: 'danger' } as const;

/** The id of a zone's rate input, so a click on the map can put the cursor in it. */
export const rateInputId = (zoneId: string) => `rate-${zoneId}`;

/**
 * One row per zone: its name, productivity index and area, its rate (an input while the draft can be
 * changed), and, with a planter, what the seed meter does at the planned speed and what the check says.
 */
export function RatesTable({
  zones,
  rates,
  unit,
  colourOf,
  checks,
  problems,
  editable,
  selectedId,
  onSelect,
  onRate,
  system,
}: {
  zones: PrescriptionZone[];
  rates: Record<string, number | null>;
  unit: RateUnit;
  colourOf: (si: number) => string;
  checks: Map<string, ZoneCheck> | null;
  problems: Record<string, string>;
  editable: boolean;
  selectedId: string | null;
  onSelect: (id: string) => void;
  onRate: (zoneId: string, si: number | null) => void;
  system: UnitSystem;
}) {
  const unitLabel = RATE_UNIT_DEFS[unit].label;
  return (
    <div className="overflow-x-auto rounded-card border border-ink-line bg-paper-raised">
      <table className="w-full border-collapse text-sm" aria-label="Zone rates">
        <thead>
          <tr className="border-b border-ink-line bg-paper-sunk/60">
            <th scope="col" className={`${th} text-left`}>
              Zone
            </th>
            <th scope="col" className={`${th} text-right`} title="Productivity index">
              Index
            </th>
            <th scope="col" className={`${th} text-right`}>
              Area ({areaUnitLabel(system)})
            </th>
            <th scope="col" className={`${th} text-right`}>
              Rate ({unitLabel})
            </th>
            {checks ? (
              <>
                <th
                  scope="col"
                  className={`${th} text-right`}
                  title="Seeds per second per row at the planned speed"
                >
                  Seeds/s/row
                </th>
                <th
                  scope="col"
                  className={`${th} text-right`}
                  title="Disc revolutions per minute at the planned speed"
                >
                  Disc rpm
                </th>
                <th scope="col" className={`${th} text-left`}>
                  Check
                </th>
              </>
            ) : null}
          </tr>
        </thead>
        <tbody>
          {zones.map((z) => {
            const rate = rates[z.id] ?? null;
            const check = checks?.get(z.id);
            const problem = problems[z.id];
            const chosen = selectedId === z.id;
            return (
              <Fragment key={z.id}>
                <tr
                  data-zone={z.name}
                  aria-selected={chosen}
                  onClick={() => onSelect(z.id)}
                  className={`border-b border-ink-line/70 align-top last:border-b-0 ${chosen ? 'bg-clay-50' : 'hover:bg-paper'}`}
                >
                  <th scope="row" className="px-2 py-1.5 text-left font-normal">
                    <button
                      type="button"
                      className="inline-flex cursor-pointer items-center gap-2 rounded-sm pt-1.5 text-left hover:text-clay-700"
                      onClick={() => onSelect(z.id)}
                      title="Show this zone on the map"
                    >
                      <span
                        aria-hidden
                        className="inline-block h-3 w-4 shrink-0 rounded-[2px] border border-ink/30"
                        style={{ backgroundColor: colourOf(rate ?? z.rateSi) }}
                      />
                      <span className="font-medium text-ink">{z.name}</span>
                      {z.isDefault ? <Badge>Default</Badge> : null}
                    </button>
                  </th>
                  <td className={`${num} pt-3`}>
                    {z.productivityIndex == null ? '—' : formatNumber(z.productivityIndex, 2)}
                  </td>
                  <td className={`${num} pt-3`}>{formatNumber(areaToDisplay(z.areaM2, system), 2)}</td>
                  <td className="px-2 py-1.5 text-right">
                    {editable ? (
                      <div className="ml-auto w-28">
                        <RateInput
                          id={rateInputId(z.id)}
                          aria-label={`Rate of ${z.name} (${unitLabel})`}
                          aria-invalid={problem ? true : undefined}
                          aria-describedby={problem ? `${rateInputId(z.id)}-problem` : undefined}
                          valueSi={rate}
                          unit={unit}
                          onChange={(si) => onRate(z.id, si)}
                          onFocus={() => onSelect(z.id)}
                        />
                      </div>
                    ) : (
                      <span className="inline-block pt-1.5 font-mono tabular-nums">
                        {rate === null ? '—' : rateFigures(rate, unit)}
                      </span>
                    )}
                  </td>
                  {checks ? (
                    <>
                      <td className={`${num} pt-3`}>
                        {check ? formatNumber(check.seedsPerSecondPerRow.planned, 1) : '—'}
                      </td>
                      <td className={`${num} pt-3`}>
                        {check ? formatNumber(check.discRpm.planned, 1) : '—'}
                      </td>
                      <td className="px-2 py-1.5 pt-2.5">
                        {check ? (
                          <Badge tone={CHECK_TONE[check.status]}>{CHECK_LABEL[check.status]}</Badge>
                        ) : null}
                      </td>
                    </>
                  ) : null}
                </tr>
                {problem && editable ? (
                  <tr className="border-b border-ink-line/70" data-problem-of={z.name}>
                    <td colSpan={checks ? 7 : 4} className="px-2 pb-1.5 text-right">
                      <p id={`${rateInputId(z.id)}-problem`} className="text-xs font-medium text-danger">
                        {problem}
                      </p>
                    </td>
                  </tr>
                ) : null}
              </Fragment>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
