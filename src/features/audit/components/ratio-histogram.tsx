import type { AuditResult } from '@shared/schemas/as-applied.schema';
import { formatNumber } from '@/lib/format';
import { colourAt, errorStops } from './map-colours';

const W = 560;
const H = 200;
const PAD = { left: 44, right: 12, top: 12, bottom: 34 };

/**
 * The planted area by applied ÷ target (area-weighted), as bars coloured like the error map, with the
 * tolerance band shaded.
 */
export function RatioHistogram({
  bins,
  bandFraction,
}: {
  bins: AuditResult['histogram'];
  bandFraction: number;
}) {
  const total = bins.reduce((s, b) => s + b.areaM2, 0);
  if (bins.length === 0 || total <= 0)
    return <p className="text-sm text-ink-soft">No planted area to show.</p>;
  // The open-ended bins at either end (everything under, everything over) are drawn two bins wide.
  const widths = bins.map((b) => b.to - b.from).sort((a, b) => a - b);
  const step = widths[Math.floor(widths.length / 2)];
  const shown = bins.map((b, i) => {
    const open = b.to - b.from > 3 * step;
    if (open && i === 0)
      return { ...b, x0: b.to - 2 * step, x1: b.to, open: `< ${formatNumber(b.to * 100)} %` };
    if (open && i === bins.length - 1)
      return { ...b, x0: b.from, x1: b.from + 2 * step, open: `> ${formatNumber(b.from * 100)} %` };
    return { ...b, x0: b.from, x1: b.to, open: null };
  });
  const lo = Math.min(...shown.map((b) => b.x0));
  const hi = Math.max(...shown.map((b) => b.x1));
  const top = Math.max(...bins.map((b) => b.areaM2 / total));
  const x = (r: number) => PAD.left + ((r - lo) / (hi - lo || 1)) * (W - PAD.left - PAD.right);
  const y = (share: number) => H - PAD.bottom - (share / (top || 1)) * (H - PAD.top - PAD.bottom);
  const stops = errorStops(200 * bandFraction);
  const inner = shown.filter((b) => !b.open);
  const innerLo = Math.min(...inner.map((b) => b.x0));
  const innerHi = Math.max(...inner.map((b) => b.x1));
  const tickStep = innerHi - innerLo > 0.6 ? 0.25 : 0.1;
  const ticks: number[] = [];
  for (let t = Math.ceil(innerLo / tickStep - 1e-9) * tickStep; t <= innerHi + 1e-9; t += tickStep)
    // The ends of the inner range are named by the open bins beside them.
    if (!shown.some((b) => b.open && Math.abs((b.x0 + b.x1) / 2 - t) < 2.5 * step)) ticks.push(t);
  const yTicks = [0, top / 2, top];
  const inBand = bins
    .filter((b) => b.from >= 1 - bandFraction - 1e-9 && b.to <= 1 + bandFraction + 1e-9)
    .reduce((s, b) => s + b.areaM2, 0);
  return (
    <figure className="keep-together">
      <svg
        viewBox={`0 0 ${W} ${H}`}
        className="w-full max-w-2xl"
        role="img"
        aria-label={`Area by applied ÷ target: ${formatNumber((100 * inBand) / total)} % of the area in whole bins inside the band of ±${formatNumber(bandFraction * 100)} %`}
      >
        <rect
          x={x(Math.max(lo, 1 - bandFraction))}
          y={PAD.top}
          width={x(Math.min(hi, 1 + bandFraction)) - x(Math.max(lo, 1 - bandFraction))}
          height={H - PAD.top - PAD.bottom}
          fill="#e9e4d8"
        />
        {shown.map((b, i) => {
          const share = b.areaM2 / total;
          const mid = b.open ? (i === 0 ? 0 : 10) : (b.from + b.to) / 2;
          return (
            <rect
              key={i}
              x={x(b.x0) + 0.5}
              y={y(share)}
              width={Math.max(0, x(b.x1) - x(b.x0) - 1)}
              height={H - PAD.bottom - y(share)}
              fill={colourAt(stops, (mid - 1) * 100)}
              stroke="#1f2630"
              strokeOpacity={0.35}
              strokeWidth={0.5}
            >
              <title>{`${b.open ?? `${formatNumber(b.from * 100, 1)}–${formatNumber(b.to * 100, 1)} %`} of target: ${formatNumber(share * 100, 1)} % of the area`}</title>
            </rect>
          );
        })}
        <line x1={x(1)} x2={x(1)} y1={PAD.top} y2={H - PAD.bottom} stroke="#1f2630" strokeDasharray="3 2" />
        <line
          x1={PAD.left}
          x2={W - PAD.right}
          y1={H - PAD.bottom}
          y2={H - PAD.bottom}
          stroke="#4a5462"
          strokeWidth={1}
        />
        {shown.map((b, i) =>
          b.open ? (
            <text
              key={`open-${i}`}
              x={(x(b.x0) + x(b.x1)) / 2}
              y={H - PAD.bottom + 14}
              textAnchor="middle"
              className="fill-ink-soft text-[10px]"
            >
              {b.open}
            </text>
          ) : null,
        )}
        {ticks.map((t) => (
          <text
            key={t}
            x={x(t)}
            y={H - PAD.bottom + 14}
            textAnchor="middle"
            className="fill-ink-soft text-[10px]"
          >
            {formatNumber(t * 100)} %
          </text>
        ))}
        {yTicks.map((t) => (
          <text key={t} x={PAD.left - 6} y={y(t) + 3} textAnchor="end" className="fill-ink-soft text-[10px]">
            {formatNumber(t * 100)} %
          </text>
        ))}
        <text
          x={(PAD.left + W - PAD.right) / 2}
          y={H - 4}
          textAnchor="middle"
          className="fill-ink-soft text-[10px]"
        >
          Applied as a share of target
        </text>
      </svg>
      <figcaption className="mt-1 text-xs text-ink-soft">
        Share of the planted area in each bin. The shaded strip is the band of ±
        {formatNumber(bandFraction * 100)} %; the dashed line is the target.
      </figcaption>
    </figure>
  );
}
