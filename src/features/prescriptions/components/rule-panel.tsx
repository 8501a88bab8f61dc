import { useState } from 'react';
import type { PrescriptionZone } from '@shared/schemas/prescription.schema';
import { ratesByRule, type RuleRate } from '@shared/rates/rate-rule';
import { RATE_UNIT_DEFS, rateFromSi, rateToSi, type RateUnit } from '@shared/rates/rate-units';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Input } from '@/components/ui/input';
import { formatNumber } from '@/lib/format';
import { rateFigures, rateShown, RULE_STEP } from './rate-values';

type RuleText = { base: string; min: string; max: string; step: string };

const read = (text: string) => {
  const v = Number(text.replace(/[\s,]/g, ''));
  return text.trim() !== '' && Number.isFinite(v) ? v : null;
};

/**
 * Rates by rule: each zone's rate is the base rate times its productivity index, rounded to the step and
 * held between the lowest and highest rate (shared/rates/rate-rule.ts). The preview shows each zone's
 * current and new rate; "Use these rates" puts them in the table, to be saved with the rest.
 */
export function RulePanel({
  zones,
  rates,
  unit,
  defaults,
  onUse,
}: {
  zones: PrescriptionZone[];
  rates: Record<string, number | null>;
  unit: RateUnit;
  /** SI starting values: the draft's default, lowest and highest rate. */
  defaults: { baseSi: number | null; minSi: number | null; maxSi: number | null };
  onUse: (rates: Record<string, number>) => void;
}) {
  const initial = (u: RateUnit): RuleText => ({
    base: defaults.baseSi === null ? '' : String(rateShown(defaults.baseSi, u)),
    min: defaults.minSi === null ? '' : String(rateShown(defaults.minSi, u)),
    max: defaults.maxSi === null ? '' : String(rateShown(defaults.maxSi, u)),
    step: String(RULE_STEP[u]),
  });
  const [text, setText] = useState(() => ({ unit, ...initial(unit) }));
  // Another unit: the rule's figures are converted (the step starts afresh at the unit's usual step).
  if (text.unit !== unit) {
    const conv = (t: string) => {
      const v = read(t);
      return v === null ? t : String(rateShown(rateToSi(v, text.unit), unit));
    };
    setText({
      unit,
      base: conv(text.base),
      min: conv(text.min),
      max: conv(text.max),
      step: String(RULE_STEP[unit]),
    });
  }
  const base = read(text.base);
  const min = read(text.min);
  const max = read(text.max);
  const step = read(text.step) ?? 0;
  const problem =
    base === null || min === null || max === null
      ? 'Type the base, lowest and highest rate.'
      : min > max
        ? 'The lowest rate is above the highest.'
        : base < 0 || min < 0 || step < 0
          ? 'Rates and the step cannot be negative.'
          : null;
  let preview: RuleRate[] = [];
  if (!problem) {
    preview = ratesByRule({
      base: base!,
      min: min!,
      max: max!,
      step,
      zones: zones.map((z) => ({ zoneId: z.id, productivityIndex: z.productivityIndex })),
    });
  }
  const label = RATE_UNIT_DEFS[unit].label;
  const decimals = RATE_UNIT_DEFS[unit].decimals;
  const field = (key: keyof RuleText, title: string, hint?: string) => (
    <FormField label={title} unit={label} hint={hint}>
      <Input
        type="text"
        inputMode="decimal"
        className="text-right font-mono tabular-nums"
        value={text[key]}
        onChange={(e) => setText((t) => ({ ...t, [key]: e.target.value }))}
      />
    </FormField>
  );
  const noIndex = zones.filter((z) => z.productivityIndex == null).length;
  return (
    <div className="space-y-3">
      <p className="text-sm text-ink-soft">
        Each zone gets the base rate × its productivity index, rounded to the step and held between the lowest
        and highest rate.
        {noIndex
          ? ` ${noIndex === 1 ? 'One zone has' : `${noIndex} zones have`} no index and get${noIndex === 1 ? 's' : ''} the base rate.`
          : ''}
      </p>
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        {field('base', 'Base rate')}
        {field('min', 'Lowest')}
        {field('max', 'Highest')}
        {field('step', 'Round to')}
      </div>
      {problem ? (
        <p className="text-sm text-ink-faint">{problem}</p>
      ) : (
        <div className="overflow-x-auto rounded-card border border-ink-line bg-paper-raised">
          <table className="w-full border-collapse text-sm" aria-label="Rates by rule, preview">
            <thead>
              <tr className="border-b border-ink-line bg-paper-sunk/60 text-xs text-ink-soft">
                <th scope="col" className="px-2 py-1.5 text-left font-medium">
                  Zone
                </th>
                <th scope="col" className="px-2 py-1.5 text-right font-medium">
                  Index
                </th>
                <th scope="col" className="px-2 py-1.5 text-right font-medium">
                  Now ({label})
                </th>
                <th scope="col" className="px-2 py-1.5 text-right font-medium">
                  New ({label})
                </th>
              </tr>
            </thead>
            <tbody>
              {preview.map((r) => {
                const z = zones.find((x) => x.id === r.zoneId)!;
                const now = rates[r.zoneId];
                const changed =
                  now == null || Math.abs(rateFromSi(now, unit) - r.rate) > 10 ** -(decimals + 1);
                return (
                  <tr key={r.zoneId} className="border-b border-ink-line/70 last:border-b-0">
                    <th scope="row" className="px-2 py-1 text-left font-normal">
                      {z.name}
                    </th>
                    <td className="px-2 py-1 text-right font-mono tabular-nums">
                      {z.productivityIndex == null ? '—' : formatNumber(z.productivityIndex, 2)}
                    </td>
                    <td className="px-2 py-1 text-right font-mono text-ink-soft tabular-nums">
                      {now == null ? '—' : rateFigures(now, unit)}
                    </td>
                    <td className="px-2 py-1 text-right font-mono tabular-nums">
                      <span className={changed ? 'font-medium text-ink' : 'text-ink-soft'}>
                        {formatNumber(r.rate, decimals)}
                      </span>
                      {r.clamped ? (
                        <span
                          className="ml-1.5 rounded-sm border border-caution/30 bg-caution-soft px-1 text-xs text-caution"
                          title={`The rule gave ${formatNumber(r.raw, decimals)}`}
                        >
                          held at {r.clamped === 'min' ? 'lowest' : 'highest'}
                        </span>
                      ) : null}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      <Button
        variant="secondary"
        disabled={!!problem}
        onClick={() => onUse(Object.fromEntries(preview.map((r) => [r.zoneId, rateToSi(r.rate, unit)])))}
      >
        Use these rates
      </Button>
      <p className="text-xs text-ink-soft">
        The rates go into the table; nothing is saved until you press Save.
      </p>
    </div>
  );
}
