import type { ReactNode } from 'react';

export type LegendEntry = {
  key: string;
  colour: string;
  label: ReactNode;
  hatch?: boolean;
  outline?: 'ink' | 'dashed';
};

/** A small key to the map: a swatch and a word for each colour or mark. */
export function MapLegend({
  title,
  entries,
  note,
}: {
  title: string;
  entries: LegendEntry[];
  note?: ReactNode;
}) {
  return (
    <div className="max-w-56 rounded-card border border-ink-line bg-paper-raised/95 px-3 py-2 text-xs text-ink shadow-card">
      <p className="mb-1 font-medium">{title}</p>
      <ul className="space-y-0.5">
        {entries.map((e) => (
          <li key={e.key} className="flex items-center gap-2">
            <span
              aria-hidden
              className={`inline-block h-3 w-4 shrink-0 rounded-[2px] ${e.outline === 'dashed' ? 'border-2 border-dashed' : 'border border-ink/30'}`}
              style={{
                backgroundColor: e.outline || e.hatch ? 'transparent' : e.colour,
                borderColor: e.outline ? e.colour : undefined,
                backgroundImage: e.hatch
                  ? `repeating-linear-gradient(135deg, ${e.colour} 0 2px, transparent 2px 5px)`
                  : undefined,
              }}
            />
            <span className="min-w-0">{e.label}</span>
          </li>
        ))}
      </ul>
      {note ? <p className="mt-1 text-ink-soft">{note}</p> : null}
    </div>
  );
}
