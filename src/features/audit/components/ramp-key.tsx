import type { ReactNode } from 'react';
import type { Stop } from './map-colours';

export type KeyMark = { key: string; swatch: ReactNode; label: string };

/**
 * A colour bar for a continuous ramp, with figures under its ends and marks, and a few other marks beside
 * it (zone outlines, points without a value).
 */
export function RampKey({
  title,
  stops,
  ticks,
  marks,
  note,
}: {
  title: string;
  stops: Stop[];
  /** Positions along the bar (values on the ramp) and their labels. */
  ticks: { value: number; label: string }[];
  marks: KeyMark[];
  note?: ReactNode;
}) {
  const lo = stops[0][0];
  const hi = stops[stops.length - 1][0];
  const at = (v: number) => `${(100 * (v - lo)) / (hi - lo || 1)}%`;
  const gradient = `linear-gradient(to right, ${stops.map(([v, c]) => `${c} ${at(v)}`).join(', ')})`;
  return (
    <div
      className="flex flex-wrap items-end gap-x-6 gap-y-2 text-xs text-ink"
      aria-label={`Key: ${title}`}
      role="group"
    >
      <div className="min-w-56 flex-1">
        <p className="mb-1 font-medium">{title}</p>
        <div className="h-3 rounded-[2px] border border-ink/30" style={{ backgroundImage: gradient }} />
        <div className="relative mt-0.5 h-4">
          {ticks.map((t, i) => (
            <span
              key={t.value}
              className={`absolute top-0 font-mono whitespace-nowrap text-ink-soft ${
                i === 0 ? '' : i === ticks.length - 1 ? '-translate-x-full' : '-translate-x-1/2'
              }`}
              style={{ left: at(t.value) }}
            >
              {t.label}
            </span>
          ))}
        </div>
      </div>
      <ul className="flex flex-wrap gap-x-4 gap-y-1 pb-4">
        {marks.map((m) => (
          <li key={m.key} className="flex items-center gap-1.5">
            {m.swatch}
            {m.label}
          </li>
        ))}
      </ul>
      {note ? <p className="w-full text-ink-soft">{note}</p> : null}
    </div>
  );
}

/** The dashed outline the zones are drawn with, as a swatch. */
export const ZoneSwatch = () => (
  <span aria-hidden className="inline-block h-3 w-4 rounded-[2px] border-2 border-dashed border-ink/70" />
);

/** A dot of one colour, as a swatch. */
export const DotSwatch = ({ colour }: { colour: string }) => (
  <span
    aria-hidden
    className="inline-block size-2.5 rounded-full border border-ink/30"
    style={{ backgroundColor: colour }}
  />
);
