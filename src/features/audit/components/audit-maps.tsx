import { Component, lazy, Suspense, useMemo, useState, type ReactNode } from 'react';
import type { Audit, Log } from '@shared/schemas/as-applied.schema';
import type { Prescription } from '@shared/schemas/prescription.schema';
import { RATE_UNIT_DEFS, rateFromSi } from '@shared/rates/rate-units';
import { speedToDisplay, speedUnitLabel, type UnitSystem } from '@shared/units';
import { Checkbox } from '@/components/ui/input';
import { Segmented } from '@/components/ui/segmented';
import { formatNumber } from '@/lib/format';
import type { AuditMapCanvasProps, PointValues } from './audit-map-canvas';
import { errorStops, NO_VALUE, sequentialStops } from './map-colours';
import { DotSwatch, RampKey, ZoneSwatch } from './ramp-key';

const AuditMapCanvas = lazy(() => import('./audit-map-canvas'));

/** Says so when a map could not start (no WebGL) instead of a blank box; the tables still hold every figure. */
class MapBoundary extends Component<{ children: ReactNode }, { error: Error | null }> {
  state = { error: null as Error | null };
  static getDerivedStateFromError(error: Error) {
    return { error };
  }
  render() {
    if (!this.state.error) return this.props.children;
    return (
      <div role="alert" className="rounded-card border border-danger/40 bg-danger-soft p-4 text-sm text-ink">
        The map could not be drawn here ({this.state.error.message}). The tables below hold every figure.
      </div>
    );
  }
}

const signed = (v: number, decimals = 0) =>
  `${v > 0 ? '+' : v < 0 ? '−' : '±'}${formatNumber(Math.abs(v), decimals)}`;

type Second = 'applied' | 'speed';

/**
 * The audit's maps: the error of every kept point (applied against target, or corrected for the speed
 * error when the log had both speeds) beside the applied rate or the speed, each over the prescription's
 * zone outlines, with legends.
 */
export function AuditMaps({
  log,
  audit,
  prescription: rx,
  system,
}: {
  log: Log;
  audit: Audit;
  prescription: Prescription;
  system: UnitSystem;
}) {
  const [corrected, setCorrected] = useState(false);
  const [second, setSecond] = useState<Second>('applied');
  const hasTrue = audit.result.fieldTrue != null;
  const bandPct = audit.bandFraction * 100;
  const limit = 2 * bandPct;
  const unit = rx.rateUnit;
  const unitLabel = RATE_UNIT_DEFS[unit].label;
  const rate = (si: number) => formatNumber(rateFromSi(si, unit), RATE_UNIT_DEFS[unit].decimals);
  const speedLabel = speedUnitLabel(system);

  const errStops = useMemo(() => errorStops(limit), [limit]);
  const rateStops = useMemo(() => {
    const rates = [rx.defaultRateSi, ...rx.zones.map((z) => z.rateSi)];
    return sequentialStops(
      Math.min(...rates) * (1 - audit.bandFraction * 2),
      Math.max(...rates) * (1 + audit.bandFraction * 2),
      'cividis',
    );
  }, [rx, audit.bandFraction]);
  const speedStops = useMemo(() => {
    const v = audit.result.speedSeries
      .flatMap((s) => [s.gnssMps, s.wheelMps])
      .filter((x): x is number => x != null)
      .sort((a, b) => a - b);
    const lo = v.length ? v[Math.floor(v.length * 0.02)] : (rx.planter?.speedMinMps ?? 1);
    const hi = v.length ? v[Math.floor(v.length * 0.98)] : (rx.planter?.speedMaxMps ?? 4);
    return sequentialStops(lo, hi > lo ? hi : lo + 1, 'viridis');
  }, [audit.result.speedSeries, rx.planter]);

  const zones = useMemo(() => rx.zones.map((z) => ({ id: z.id, geometry: z.geometry })), [rx.zones]);
  const errorProperty = corrected && hasTrue ? 'true_err' : 'err';

  const describe = (v: PointValues) => (
    <>
      {v.applied != null ? (
        <span className="block font-mono">
          Applied {rate(v.applied)} {unitLabel}
        </span>
      ) : null}
      {v.target != null ? <span className="block font-mono">Target {rate(v.target)}</span> : null}
      {v.err != null ? <span className="block font-mono">{signed(v.err, 1)} % as logged</span> : null}
      {v.true_err != null ? (
        <span className="block font-mono">{signed(v.true_err, 1)} % corrected</span>
      ) : null}
      {v.speed != null ? (
        <span className="block font-mono">
          {formatNumber(speedToDisplay(v.speed, system), 1)} {speedLabel}
        </span>
      ) : null}
      {v.n != null && v.n > 1 ? <span className="block text-ink-soft">mean of {v.n} points</span> : null}
    </>
  );

  const swathM = rx.planter ? rx.planter.rowCount * rx.planter.rowSpacingM : 9;
  const base = {
    unitSystem: system,
    logId: log.id,
    tileVersion: log.version,
    boundary: rx.boundary,
    zones,
    swathM,
  };
  const zoneMark = { key: 'zones', swatch: <ZoneSwatch />, label: 'Prescription zones' };

  const errLegend = (
    <RampKey
      title={corrected && hasTrue ? 'Corrected applied against target' : 'Applied against target'}
      stops={errStops}
      ticks={[-limit, -bandPct, 0, bandPct, limit].map((v) => ({
        value: v,
        label: v === 0 ? 'on target' : `${signed(v)} %`,
      }))}
      marks={[zoneMark]}
      note={`Blue: less than the target; red: more. Band ±${formatNumber(bandPct)} %; colours stop at twice the band.`}
    />
  );
  const secondStops = second === 'applied' ? rateStops : speedStops;
  const lo = secondStops[0][0];
  const hi = secondStops[secondStops.length - 1][0];
  const secondLegend = (
    <RampKey
      title={second === 'applied' ? `Applied (${unitLabel})` : `Speed (${speedLabel})`}
      stops={secondStops}
      ticks={[lo, (lo + hi) / 2, hi].map((v) => ({
        value: v,
        label: second === 'applied' ? rate(v) : formatNumber(speedToDisplay(v, system), 1),
      }))}
      marks={[{ key: 'none', swatch: <DotSwatch colour={NO_VALUE} />, label: 'No value' }, zoneMark]}
    />
  );

  return (
    <div className="grid gap-4 xl:grid-cols-2">
      <MapPanel
        title="Where it was off"
        control={
          hasTrue ? (
            <Checkbox
              label="Corrected for the speed error"
              checked={corrected}
              onChange={(e) => setCorrected(e.target.checked)}
            />
          ) : null
        }
        map={{
          ...base,
          label: `Error map of ${log.fieldName}`,
          property: errorProperty,
          stops: errStops,
          describePoint: describe,
          legend: errLegend,
        }}
      />
      <MapPanel
        title={second === 'applied' ? 'Applied rate' : 'Ground speed'}
        control={
          <Segmented<Second>
            label="Second map"
            value={second}
            options={[
              { value: 'applied', label: 'Applied rate' },
              { value: 'speed', label: 'Speed' },
            ]}
            onChange={setSecond}
          />
        }
        map={{
          ...base,
          label: `${second === 'applied' ? 'Applied rate' : 'Speed'} map of ${log.fieldName}`,
          property: second,
          stops: secondStops,
          describePoint: describe,
          legend: secondLegend,
        }}
      />
    </div>
  );
}

/** One map with its title and its control (not printed) above it. */
export function MapPanel({
  title,
  control,
  map,
}: {
  title: string;
  control: ReactNode;
  map: AuditMapCanvasProps;
}) {
  return (
    <div className="min-w-0 space-y-2">
      <div className="flex min-h-9 flex-wrap items-center justify-between gap-2">
        <h3 className="font-medium text-ink">{title}</h3>
        <span className="print:hidden">{control}</span>
      </div>
      <MapBoundary>
        <Suspense fallback={<MapLoading />}>
          <AuditMapCanvas {...map} />
        </Suspense>
      </MapBoundary>
    </div>
  );
}

function MapLoading() {
  return (
    <div className="grid h-[440px] place-items-center rounded-card border border-ink-line bg-paper-sunk text-sm text-ink-soft">
      Loading the map…
    </div>
  );
}
