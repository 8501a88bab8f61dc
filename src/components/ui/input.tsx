import type { InputHTMLAttributes, Ref, SelectHTMLAttributes, TextareaHTMLAttributes } from 'react';
import { useFieldControl } from './form-field';

export const controlClass =
  'w-full rounded-card border border-ink-line bg-paper-raised px-2.5 text-base text-ink placeholder:text-ink-faint hover:border-ink-faint aria-[invalid=true]:border-danger disabled:bg-paper-sunk disabled:text-ink-soft';

type InputProps = InputHTMLAttributes<HTMLInputElement> & { ref?: Ref<HTMLInputElement> };

/** A text or number input. Number inputs get `step="any"` unless a step is given, so decimals submit. */
export function Input({ className = '', type = 'text', step, ...rest }: InputProps) {
  const control = useFieldControl(rest);
  const isNumber = type === 'number';
  return (
    <input
      type={type}
      step={isNumber ? (step ?? 'any') : step}
      inputMode={isNumber ? 'decimal' : rest.inputMode}
      className={`${controlClass} h-9 ${isNumber ? 'text-right font-mono tabular-nums' : ''} ${className}`}
      {...rest}
      {...control}
    />
  );
}

type TextareaProps = TextareaHTMLAttributes<HTMLTextAreaElement> & { ref?: Ref<HTMLTextAreaElement> };

export function Textarea({ className = '', rows = 3, ...rest }: TextareaProps) {
  const control = useFieldControl(rest);
  return <textarea rows={rows} className={`${controlClass} py-1.5 ${className}`} {...rest} {...control} />;
}

export type SelectOption = { value: string; label: string };

/** Options from a list of codes and their labels: `labelled(CROPS, CROP_LABELS)`. */
export const labelled = <K extends string>(values: readonly K[], labels: Record<K, string>): SelectOption[] =>
  values.map((value) => ({ value, label: labels[value] }));

/** Options from records with an id and a name. */
export const recordOptions = (rows: { id: string; name: string }[]): SelectOption[] =>
  rows.map((r) => ({ value: r.id, label: r.name }));

type SelectProps = SelectHTMLAttributes<HTMLSelectElement> & {
  ref?: Ref<HTMLSelectElement>;
  options?: SelectOption[];
  /** The first, empty choice ("Choose a crop", "All growers"). */
  placeholder?: string;
};

export function Select({ className = '', children, options, placeholder, ...rest }: SelectProps) {
  const control = useFieldControl(rest);
  return (
    <select className={`${controlClass} h-9 pr-7 ${className}`} {...rest} {...control}>
      {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
      {options?.map((o) => (
        <option key={o.value} value={o.value}>
          {o.label}
        </option>
      ))}
      {children}
    </select>
  );
}

type CheckboxProps = Omit<InputHTMLAttributes<HTMLInputElement>, 'type'> & {
  label: string;
  ref?: Ref<HTMLInputElement>;
};

/** A checkbox with its own label beside it. */
export function Checkbox({ label, className = '', ...rest }: CheckboxProps) {
  return (
    <label className={`inline-flex items-center gap-2 text-sm text-ink ${className}`}>
      <input type="checkbox" className="size-4 accent-clay-600" {...rest} />
      {label}
    </label>
  );
}
