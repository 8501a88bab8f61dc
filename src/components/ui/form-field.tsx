import { createContext, useContext, useId, type ReactNode } from 'react';

type Control = { id: string; describedBy?: string; invalid: boolean };
const FieldContext = createContext<Control | null>(null);

/** The id and ARIA wiring of the control inside the nearest FormField, for Input, Select and Textarea. */
export function useFieldControl(props: {
  id?: string;
  'aria-describedby'?: string;
  'aria-invalid'?: unknown;
}) {
  const ctx = useContext(FieldContext);
  return {
    id: props.id ?? ctx?.id,
    'aria-describedby': props['aria-describedby'] ?? ctx?.describedBy,
    'aria-invalid': (props['aria-invalid'] as boolean | undefined) ?? (ctx?.invalid || undefined),
  };
}

type FormFieldProps = {
  label: ReactNode;
  error?: string;
  hint?: ReactNode;
  /** A unit shown after the label, e.g. "in" or "km/h". */
  unit?: string;
  className?: string;
  children: ReactNode;
};

/** A label, one control, an optional hint and the error for that control, wired together. */
export function FormField({ label, error, hint, unit, className = '', children }: FormFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-sm font-medium text-ink">
        {label}
        {unit ? <span className="ml-1 font-normal text-ink-faint">({unit})</span> : null}
      </label>
      <FieldContext.Provider value={{ id, describedBy, invalid: !!error }}>{children}</FieldContext.Provider>
      {hint ? (
        <p id={hintId} className="text-xs text-ink-soft">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="text-xs font-medium text-danger">
          {error}
        </p>
      ) : null}
    </div>
  );
}
