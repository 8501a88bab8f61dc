import { useState, type InputHTMLAttributes } from 'react';
import type { RateUnit } from '@shared/rates/rate-units';
import { Input } from '@/components/ui/input';
import { rateShown, readRate } from './rate-values';

type Shown = { text: string; si: number | null; unit: RateUnit };

const textOf = (si: number | null, unit: RateUnit) => (si === null ? '' : String(rateShown(si, unit)));

/**
 * A rate typed in the chosen unit and handed up in SI. What is typed stays as typed while it reads as the
 * same SI value; a new value from outside (a rule applied, the unit switched) replaces it.
 */
export function RateInput({
  valueSi,
  unit,
  onChange,
  className = '',
  ...rest
}: {
  valueSi: number | null;
  unit: RateUnit;
  onChange: (si: number | null) => void;
} & Omit<InputHTMLAttributes<HTMLInputElement>, 'value' | 'onChange' | 'type'>) {
  const [shown, setShown] = useState<Shown>(() => ({ text: textOf(valueSi, unit), si: valueSi, unit }));
  // Adjusting state to a changed prop while rendering (React's documented pattern): the value came from
  // elsewhere, so show it.
  if (shown.si !== valueSi || shown.unit !== unit) {
    setShown({ text: textOf(valueSi, unit), si: valueSi, unit });
  }
  return (
    <Input
      type="text"
      inputMode="decimal"
      autoComplete="off"
      className={`text-right font-mono tabular-nums ${className}`}
      {...rest}
      value={shown.text}
      onChange={(e) => {
        const si = readRate(e.target.value, unit);
        setShown({ text: e.target.value, si, unit });
        onChange(si);
      }}
    />
  );
}
