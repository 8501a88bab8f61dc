import type { ReactNode } from 'react';
import { Checkbox, recordOptions, Select } from './input';
import { FormField } from './form-field';

/** The row of filters above a list. */
export function FilterBar({ children, label = 'Filters' }: { children: ReactNode; label?: string }) {
  return (
    <div role="group" aria-label={label} className="mb-3 flex flex-wrap items-end gap-x-4 gap-y-2">
      {children}
    </div>
  );
}

type Option = { id: string; name: string };

/** A labelled picker whose first choice means "no filter". */
export function FilterSelect({
  label,
  value,
  options,
  allLabel,
  onChange,
}: {
  label: string;
  value: string;
  options: Option[];
  allLabel: string;
  onChange: (value: string) => void;
}) {
  return (
    <FormField label={label} className="w-56">
      <Select
        value={value}
        onChange={(e) => onChange(e.target.value)}
        placeholder={allLabel}
        options={recordOptions(options)}
      />
    </FormField>
  );
}

export function ShowArchivedToggle({
  checked,
  onChange,
}: {
  checked: boolean;
  onChange: (checked: boolean) => void;
}) {
  return (
    <Checkbox
      className="h-9"
      label="Show archived"
      checked={checked}
      onChange={(e) => onChange(e.target.checked)}
    />
  );
}
