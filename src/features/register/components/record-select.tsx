import type { UseFormRegisterReturn } from 'react-hook-form';
import { z } from 'zod';
import { idSchema } from '@shared/schemas/common.schema';
import { FormField } from '@/components/ui/form-field';
import { recordOptions, Select } from '@/components/ui/input';

type Option = { id: string; name: string; detail?: string };

/** A parent picker's value: the shared id rule, with "Choose a farm" rather than "Not a valid id" when empty. */
export const pickedId = (what: string) => z.string().min(1, `Choose a ${what}`).pipe(idSchema);

/** A labelled picker of records (grower, farm, field) bound to a form field. */
export function RecordSelect({
  label,
  options,
  registration,
  error,
  placeholder,
  hint,
  loading,
}: {
  label: string;
  options: Option[];
  registration: UseFormRegisterReturn;
  error?: string;
  placeholder: string;
  hint?: string;
  loading?: boolean;
}) {
  return (
    <FormField label={label} error={error} hint={hint}>
      <Select
        // The form writes its value into the select when the select mounts; an id whose option was not
        // there yet (the list still loading, or cached from before the record was added) would show as the
        // placeholder. Drawing the select afresh when its options change writes the value in again.
        key={options.map((o) => o.id).join(' ')}
        {...registration}
        disabled={loading || registration.disabled}
        placeholder={loading ? 'Loading…' : placeholder}
        options={options.map((o) => ({ value: o.id, label: o.detail ? `${o.name} (${o.detail})` : o.name }))}
      />
    </FormField>
  );
}

/** A grower picker outside the form's values, used only to narrow the next picker. */
export function NarrowByGrower({
  growers,
  value,
  onChange,
  narrows,
}: {
  growers: Option[];
  value: string;
  onChange: (growerId: string) => void;
  narrows: string;
}) {
  return (
    <FormField label="Grower" hint={`Narrows the ${narrows} to choose from.`}>
      <Select
        value={value}
        onChange={(e) => onChange(e.target.value)}
        placeholder="All growers"
        options={recordOptions(growers)}
      />
    </FormField>
  );
}
