/** A value shown where an input would be, when it cannot be changed here, with the reason under it. */
export function ReadOnlyValue({ label, value, note }: { label: string; value: string; note: string }) {
  return (
    <div className="flex flex-col gap-1">
      <span className="text-sm font-medium">{label}</span>
      <span className="flex h-9 items-center rounded-card border border-ink-line bg-paper-sunk px-2.5 text-ink-soft">
        {value}
      </span>
      <span className="text-xs text-ink-soft">{note}</span>
    </div>
  );
}
