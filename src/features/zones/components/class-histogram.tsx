import { rampColours } from '@/components/map/ramp';
import { formatNumber } from '@/lib/format';

type Bin = { from: number; to: number; count: number };

/** The class of a value: how many breaks lie strictly below it (a value on a break joins the lower class). */
const classOf = (v: number, breaks: number[]) => breaks.filter((b) => b < v).length;

const decimalsFor = (span: number) => (span >= 100 ? 0 : span >= 10 ? 1 : 2);

/**
 * The attribute's distribution as bars coloured by the zone class their middle falls in, with the class
 * breaks drawn as lines: how the classing cut the data.
 */
export function ClassHistogram({
  bins,
  breaks,
  attribute,
}: {
  bins: Bin[];
  breaks: number[];
  attribute: string;
}) {
  if (bins.length === 0) return null;
  const colours = rampColours(breaks.length + 1);
  const [lo, hi] = [bins[0].from, bins[bins.length - 1].to];
  const span = hi - lo || 1;
  const most = Math.max(...bins.map((b) => b.count), 1);
  const [w, h, pad, base] = [380, 150, 8, 118];
  const x = (v: number) => pad + ((v - lo) / span) * (w - 2 * pad);
  const y = (n: number) => base - (n / most) * (base - 14);
  const d = decimalsFor(span);
  return (
    <figure className="rounded-card border border-ink-line bg-paper-raised p-3">
      <svg
        viewBox={`0 0 ${w} ${h}`}
        className="h-auto w-full"
        role="img"
        aria-label={`Histogram of ${attribute} with ${breaks.length} class breaks`}
      >
        {bins.map((b, i) => (
          <rect
            key={i}
            x={x(b.from) + 0.5}
            width={Math.max(1, x(b.to) - x(b.from) - 1)}
            y={y(b.count)}
            height={base - y(b.count)}
            fill={colours[classOf((b.from + b.to) / 2, breaks)]}
          >
            <title>
              {formatNumber(b.from, d)}–{formatNumber(b.to, d)}: {b.count} points
            </title>
          </rect>
        ))}
        <line x1={pad} x2={w - pad} y1={base} y2={base} stroke="#1f2630" strokeWidth={1} />
        {breaks.map((b, i) => (
          <g key={i}>
            <line
              x1={x(b)}
              x2={x(b)}
              y1={6}
              y2={base + 4}
              stroke="#1f2630"
              strokeWidth={1.25}
              strokeDasharray="4 3"
            />
            <text x={x(b)} y={base + 14} textAnchor="middle" className="fill-ink font-mono text-[10px]">
              {formatNumber(b, d)}
            </text>
          </g>
        ))}
        <text x={pad} y={h - 2} className="fill-ink-soft font-mono text-[10px]">
          {formatNumber(lo, d)}
        </text>
        <text x={w - pad} y={h - 2} textAnchor="end" className="fill-ink-soft font-mono text-[10px]">
          {formatNumber(hi, d)}
        </text>
      </svg>
      <figcaption className="mt-1 text-xs text-ink-soft">
        {attribute}: points per bar, coloured by the zone class each bar falls in; dashed lines are the class
        breaks.
      </figcaption>
    </figure>
  );
}
