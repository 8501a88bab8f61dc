/** A row of mutually exclusive choices that switch what the page shows below them (not navigation). */
export function Segmented<K extends string>({
  label,
  value,
  options,
  onChange,
}: {
  label: string;
  value: K;
  options: { value: K; label: string }[];
  onChange: (value: K) => void;
}) {
  return (
    <div
      role="radiogroup"
      aria-label={label}
      className="inline-flex rounded-card border border-ink-line bg-paper-sunk p-0.5"
    >
      {options.map((o) => (
        <button
          key={o.value}
          type="button"
          role="radio"
          aria-checked={value === o.value}
          onClick={() => onChange(o.value)}
          className={`cursor-pointer rounded-[0.3rem] px-3 py-1 text-sm font-medium ${
            value === o.value ? 'bg-paper-raised text-ink shadow-card' : 'text-ink-soft hover:text-ink'
          }`}
        >
          {o.label}
        </button>
      ))}
    </div>
  );
}
