import type { ControllerLag } from '@shared/schemas/as-applied.schema';
import type { RateKind } from '@shared/rates/rate-units';
import type { UnitSystem } from '@shared/units';
import { Facts } from '@/components/ui/facts';
import { formatArea, formatNumber } from '@/lib/format';
import { ChartFigure, DiagnosticPanel, MedianLine } from './panel';
import { formatLength, formatQuantity, MARK } from './units';

/** A latency under this is within the log's own timing; nothing to correct (diagnostic-findings.ts uses the same). */
const NOTICEABLE_S = 0.75;

const W = 560;
const H = 170;
const PAD = { left: 40, right: 12, top: 10, bottom: 30 };

/** Each rate change's latency against the time into the log, with the median as a dashed line. */
function LatencyDots({ lag }: { lag: ControllerLag }) {
  const pts = lag.perTransition;
  const t0 = Math.min(...pts.map((p) => p.t));
  const t1 = Math.max(...pts.map((p) => p.t));
  const lo = Math.min(0, ...pts.map((p) => p.latencyS));
  const hi = Math.max(1, ...pts.map((p) => p.latencyS)) * 1.1;
  const x = (t: number) => PAD.left + ((t - t0) / (t1 - t0 || 1)) * (W - PAD.left - PAD.right);
  const y = (s: number) => H - PAD.bottom - ((s - lo) / (hi - lo)) * (H - PAD.top - PAD.bottom);
  const step = hi - lo > 8 ? 2 : hi - lo > 3 ? 1 : 0.5;
  const ticks: number[] = [];
  for (let v = Math.ceil(lo / step) * step || 0; v <= hi; v += step) ticks.push(v);
  const minutes = (t1 - t0) / 60;
  return (
    <ChartFigure
      label={`Latency of each of ${pts.length} rate changes; median ${formatNumber(lag.latencyS ?? 0, 1)} s`}
      width={W}
      height={H}
      caption="A dot per change of target rate: how many seconds the applied rate took to follow it. The dashed line is the median."
    >
      {ticks.map((v) => (
        <g key={v}>
          <line x1={PAD.left} x2={W - PAD.right} y1={y(v)} y2={y(v)} stroke="#e2ddd0" />
          <text x={PAD.left - 6} y={y(v) + 3} textAnchor="end" className="fill-ink-soft text-[10px]">
            {formatNumber(v, step < 1 ? 1 : 0)} s
          </text>
        </g>
      ))}
      {pts.map((p, i) => (
        <circle key={i} cx={x(p.t)} cy={y(p.latencyS)} r={2.6} fill={MARK.blue} fillOpacity={0.7}>
          <title>{`${formatNumber(p.latencyS, 2)} s, ${formatNumber((p.t - t0) / 60, 1)} min into the log`}</title>
        </circle>
      ))}
      {lag.latencyS != null ? <MedianLine x1={PAD.left} x2={W - PAD.right} y={y(lag.latencyS)} /> : null}
      <text x={PAD.left} y={H - 8} className="fill-ink-soft text-[10px]">
        start
      </text>
      <text x={W - PAD.right} y={H - 8} textAnchor="end" className="fill-ink-soft text-[10px]">
        {formatNumber(minutes)} min into the log
      </text>
    </ChartFigure>
  );
}

/**
 * How late the controller followed changes of target rate: the median latency and its spread, what it
 * means on the ground at each zone edge, and how far ahead a controller would have to act.
 */
export function LagPanel({
  lag,
  rateKind,
  system,
}: {
  lag: ControllerLag;
  rateKind: RateKind;
  system: UnitSystem;
}) {
  const late = lag.latencyS;
  const verdict =
    late == null
      ? 'No change of target rate was long and clear enough to time the controller.'
      : late < NOTICEABLE_S
        ? 'The controller followed rate changes within a second: nothing worth correcting.'
        : `The controller took about ${formatNumber(late, 1)} s to follow a change of rate, so about ${formatLength(lag.metresAtOldRate ?? 0, system)} past each zone edge went in at the old rate.`;
  return (
    <DiagnosticPanel title="Controller lag" verdict={verdict}>
      <Facts
        columns={3}
        items={[
          {
            label: 'Latency (median)',
            value: late == null ? '—' : `${formatNumber(late, 1)} s`,
            numeric: true,
          },
          {
            label: 'Spread (middle half of the changes)',
            value: lag.spreadS == null ? '—' : `${formatNumber(lag.spreadS, 1)} s`,
            numeric: true,
          },
          { label: 'Rate changes timed', value: formatNumber(lag.transitions), numeric: true },
          {
            label: 'At the old rate past each zone edge',
            value: lag.metresAtOldRate == null ? '—' : formatLength(Math.max(0, lag.metresAtOldRate), system),
            numeric: true,
          },
          {
            label: 'Planted at the old rate, in all',
            value: `${formatArea(lag.areaAffectedM2, system)}, ${formatQuantity(lag.quantityAffected, rateKind, system)}`,
            numeric: true,
          },
          {
            label: 'A controller would need to act ahead by',
            value: lag.leadS == null ? '—' : `${formatNumber(Math.max(0, lag.leadS), 1)} s`,
            numeric: true,
          },
        ]}
      />
      {lag.perTransition.length > 0 ? <LatencyDots lag={lag} /> : null}
    </DiagnosticPanel>
  );
}
