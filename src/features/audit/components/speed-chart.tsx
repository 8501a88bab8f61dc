import type { AuditResult } from '@shared/schemas/as-applied.schema';
import { speedToDisplay, speedUnitLabel, type UnitSystem } from '@shared/units';
import { formatNumber } from '@/lib/format';

const W = 720;
const H = 210;
const PAD = { left: 40, right: 12, top: 12, bottom: 32 };
const LINES = [
  { key: 'wheelMps', label: 'Wheel or radar', colour: '#9e4624', dash: undefined },
  { key: 'gnssMps', label: 'GNSS', colour: '#2c3a4a', dash: '4 3' },
] as const;

/** Wheel (or radar) and GNSS speed over the time of planting, as two lines: where they part, the wheel slipped. */
export function SpeedChart({ series, system }: { series: AuditResult['speedSeries']; system: UnitSystem }) {
  const shown = LINES.filter((l) => series.some((s) => s[l.key] != null));
  if (series.length < 2 || shown.length === 0)
    return <p className="text-sm text-ink-soft">The log holds no speeds to draw.</p>;
  const t0 = series[0].t;
  const t1 = series[series.length - 1].t;
  const values = series.flatMap((s) => shown.map((l) => s[l.key])).filter((v): v is number => v != null);
  const vmax = speedToDisplay(Math.max(...values), system) * 1.08 || 1;
  const x = (t: number) => PAD.left + ((t - t0) / (t1 - t0 || 1)) * (W - PAD.left - PAD.right);
  const y = (mps: number) =>
    H - PAD.bottom - (speedToDisplay(mps, system) / vmax) * (H - PAD.top - PAD.bottom);
  const pathOf = (key: (typeof LINES)[number]['key']) => {
    let d = '';
    let pen = false;
    for (const s of series) {
      const v = s[key];
      if (v == null) {
        pen = false;
        continue;
      }
      d += `${pen ? 'L' : 'M'}${x(s.t).toFixed(1)},${y(v).toFixed(1)}`;
      pen = true;
    }
    return d;
  };
  const minutes = (t1 - t0) / 60;
  const step = [1, 2, 5, 10, 15, 30, 60, 120, 240].find((m) => minutes / m <= 8) ?? 480;
  const xTicks = Array.from({ length: Math.floor(minutes / step) + 1 }, (_, i) => i * step);
  const unit = speedUnitLabel(system);
  const yStep = vmax > 12 ? 5 : vmax > 5 ? 2 : 1;
  const yTicks = Array.from({ length: Math.floor(vmax / yStep) + 1 }, (_, i) => i * yStep);
  const toMps = (v: number) => v / speedToDisplay(1, system);
  return (
    <figure className="keep-together">
      <svg
        viewBox={`0 0 ${W} ${H}`}
        className="w-full"
        role="img"
        aria-label={`${shown.map((l) => l.label).join(' and ')} speed over ${formatNumber(minutes)} minutes of planting`}
      >
        {yTicks.map((v) => (
          <g key={v}>
            <line x1={PAD.left} x2={W - PAD.right} y1={y(toMps(v))} y2={y(toMps(v))} stroke="#e2ddd0" />
            <text x={PAD.left - 6} y={y(toMps(v)) + 3} textAnchor="end" className="fill-ink-soft text-[10px]">
              {v}
            </text>
          </g>
        ))}
        {xTicks.map((m) => (
          <text
            key={m}
            x={x(t0 + m * 60)}
            y={H - PAD.bottom + 14}
            textAnchor="middle"
            className="fill-ink-soft text-[10px]"
          >
            {m}
          </text>
        ))}
        {shown.map((l) => (
          <path
            key={l.key}
            d={pathOf(l.key)}
            fill="none"
            stroke={l.colour}
            strokeWidth={1.25}
            strokeDasharray={l.dash}
            strokeLinejoin="round"
          />
        ))}
        <text
          x={(PAD.left + W - PAD.right) / 2}
          y={H - 4}
          textAnchor="middle"
          className="fill-ink-soft text-[10px]"
        >
          Minutes from the first point ({unit} up the side)
        </text>
      </svg>
      <figcaption className="mt-1 flex flex-wrap gap-x-4 text-xs text-ink-soft">
        {shown.map((l) => (
          <span key={l.key} className="inline-flex items-center gap-1.5">
            <svg width="22" height="6" aria-hidden>
              <line x1="0" x2="22" y1="3" y2="3" stroke={l.colour} strokeWidth="2" strokeDasharray={l.dash} />
            </svg>
            {l.label} speed
          </span>
        ))}
      </figcaption>
    </figure>
  );
}
