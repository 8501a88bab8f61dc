import { useId, type ReactNode } from 'react';

/** One diagnostic under "Why it happened": a titled region with a one-line verdict above its figures. */
export function DiagnosticPanel({
  title,
  verdict,
  children,
  className = '',
}: {
  title: string;
  verdict: ReactNode;
  children: ReactNode;
  className?: string;
}) {
  const id = useId();
  return (
    <section
      aria-labelledby={id}
      className={`diagnostic-panel space-y-3 rounded-card border border-ink-line bg-paper-raised/60 p-4 ${className}`}
    >
      <div>
        <h3 id={id} className="font-semibold text-ink">
          {title}
        </h3>
        <p className="mt-0.5 max-w-3xl text-sm text-ink-soft">{verdict}</p>
      </div>
      {children}
    </section>
  );
}

/**
 * A small table of figures: a row per thing, named in its first cell, with figures in the other columns
 * (right-aligned). `heads` names every column, the first one too (an empty name is read as "Measure").
 */
export function FigureTable({
  label,
  heads,
  rows,
}: {
  label: string;
  heads: ReactNode[];
  rows: { key: string; name: ReactNode; cells: ReactNode[] }[];
}) {
  return (
    <div className="overflow-x-auto rounded-card border border-ink-line bg-paper-raised">
      <table className="w-full border-collapse text-sm" aria-label={label}>
        <thead>
          <tr className="border-b border-ink-line bg-paper-sunk/60 text-xs text-ink-soft">
            {heads.map((h, i) => (
              <th
                key={i}
                scope="col"
                className={`px-3 py-1.5 font-medium ${i === 0 ? 'text-left' : 'text-right'}`}
              >
                {h === '' ? <span className="sr-only">Measure</span> : h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} className="border-b border-ink-line/70 last:border-b-0">
              <th scope="row" className="px-3 py-1.5 text-left font-normal">
                {r.name}
              </th>
              {r.cells.map((c, i) => (
                <td key={i} className="px-3 py-1.5 text-right font-mono whitespace-nowrap tabular-nums">
                  {c}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** A small SVG chart with its caption, kept on one page in print. */
export function ChartFigure({
  label,
  width,
  height,
  caption,
  wide = false,
  children,
}: {
  label: string;
  width: number;
  height: number;
  caption: ReactNode;
  wide?: boolean;
  children: ReactNode;
}) {
  return (
    <figure className="keep-together">
      <svg
        viewBox={`0 0 ${width} ${height}`}
        className={`w-full ${wide ? 'max-w-3xl' : 'max-w-2xl'}`}
        role="img"
        aria-label={label}
      >
        {children}
      </svg>
      <figcaption className="mt-1 text-xs text-ink-soft">{caption}</figcaption>
    </figure>
  );
}

/** The dashed line a chart draws its median (or target) with, across the plot. */
export const MedianLine = ({ x1, x2, y }: { x1: number; x2: number; y: number }) => (
  <line x1={x1} x2={x2} y1={y} y2={y} stroke="#1f2630" strokeDasharray="4 3" />
);
