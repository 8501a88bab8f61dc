import { Section } from '@/components/ui/section';
import type { AuditMaps } from '../audit-maps';
import { AlarmPanel } from './alarm-panel';
import { CoveragePanel } from './coverage-panel';
import { DiscLimitPanel } from './disc-limit-panel';
import { LagPanel } from './lag-panel';
import { RowsPanel } from './rows-panel';

/**
 * "Why it happened": a panel per diagnostic the audit holds (alarm replay, controller lag, the disc at its
 * limit, rows, coverage). Audits made before the diagnostics existed have none, and show nothing.
 */
export function DiagnosticsSection({
  log,
  audit,
  prescription: rx,
  system,
}: Parameters<typeof AuditMaps>[0]) {
  const d = audit.result.diagnostics;
  if (!d) return null;
  const panels = [
    d.alarms.length ? (
      <AlarmPanel key="alarms" replays={d.alarms} log={log} prescription={rx} system={system} />
    ) : null,
    d.lag && d.lag.transitions > 0 ? (
      <LagPanel key="lag" lag={d.lag} rateKind={rx.product.rateKind} system={system} />
    ) : null,
    d.discLimit && d.discLimit.zones.length ? (
      <DiscLimitPanel key="disc" disc={d.discLimit} rateUnit={rx.rateUnit} system={system} />
    ) : null,
    d.rows.length ? <RowsPanel key="rows" rows={d.rows} rateUnit={rx.rateUnit} system={system} /> : null,
    d.coverage ? (
      <CoveragePanel key="coverage" coverage={d.coverage} log={log} prescription={rx} system={system} />
    ) : null,
  ].filter(Boolean);
  if (!panels.length) return null;
  return (
    <Section title="Why it happened" className="audit-diagnostics">
      <p className="mb-3 max-w-3xl text-sm text-ink-soft">
        What the log tells about the causes: the monitor&apos;s alarms replayed, how quickly the controller
        followed the rate, the seed disc&apos;s limit, each row, and ground skipped or planted twice.
      </p>
      <div className="space-y-4">{panels}</div>
    </Section>
  );
}
