import { useId } from 'react';
import type { UnitSystem } from '@shared/units';
import { describeError } from '@/components/ui/query-state';
import { useUpdatePreferences } from '../api/update-preferences';

const OPTIONS: { value: UnitSystem; label: string; units: string }[] = [
  { value: 'imperial', label: 'Imperial', units: 'ac, in, mph' },
  { value: 'metric', label: 'Metric', units: 'ha, cm, km/h' },
];

/** Two radio buttons that save the user's unit system at once. */
export function UnitSystemSwitch({
  value,
  compact = false,
  legend = 'Units',
}: {
  value: UnitSystem;
  compact?: boolean;
  legend?: string;
}) {
  const update = useUpdatePreferences();
  const name = useId();
  const shown = update.isPending && update.variables ? update.variables.unitSystem : value;
  return (
    <fieldset>
      <legend className={compact ? 'mb-1 text-xs text-ink-faint' : 'mb-1.5 text-sm font-medium'}>
        {legend}
      </legend>
      <div className="inline-flex rounded-card border border-ink-line bg-paper-raised p-0.5">
        {OPTIONS.map((o) => (
          <label
            key={o.value}
            className={`relative cursor-pointer rounded-sm px-2.5 py-1 text-sm has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-clay-500 ${
              shown === o.value ? 'bg-slate-800 text-paper-raised' : 'text-ink-soft hover:text-ink'
            }`}
          >
            <input
              type="radio"
              name={name}
              value={o.value}
              checked={shown === o.value}
              onChange={() => update.mutate({ unitSystem: o.value })}
              className="absolute inset-0 m-0 cursor-pointer opacity-0"
            />
            {o.label}
            {compact ? null : <span className="ml-1.5 text-xs opacity-75">{o.units}</span>}
          </label>
        ))}
      </div>
      {update.isError ? (
        <p role="alert" className="mt-1 text-xs text-danger">
          {describeError(update.error)}
        </p>
      ) : null}
    </fieldset>
  );
}
