import type { Audit, Log } from '@shared/schemas/as-applied.schema';
import type { Prescription } from '@shared/schemas/prescription.schema';
import type { Role } from '@shared/schemas/auth.schema';
import type { UnitSystem } from '@shared/units';
import { Notice } from '@/components/ui/notice';
import { Section } from '@/components/ui/section';
import { AuditMaps } from './audit-maps';
import { CleaningPanel } from './cleaning-panel';
import { CommentsPanel } from './comments-panel';
import { DiagnosticsSection } from './diagnostics/diagnostics-section';
import { FindingsList } from './findings-list';
import { RatioHistogram } from './ratio-histogram';
import { SignedOffBanner } from './sign-off';
import { SpeedChart } from './speed-chart';
import { FieldFacts, moneyFormat, ZoneStatsTable } from './zone-stats-table';
import './audit-print.css';

/** Who may clean a log again (DEVELOPERS.md, as-applied routes). */
const CLEANERS: Role[] = ['admin', 'agronomist', 'farmer'];

/**
 * The audit of one log: findings first, then the maps, why it happened (the diagnostics), the charts, the zone table, what cleaning removed,
 * comments and the caution. Prints as a report (audit-print.css).
 */
export function AuditReport({
  log,
  audit,
  prescription: rx,
  system,
  role,
}: {
  log: Log;
  audit: Audit;
  prescription: Prescription;
  system: UnitSystem;
  role: Role;
}) {
  const r = audit.result;
  const money = moneyFormat(rx.product.currency);
  const frozen = audit.status === 'signed-off';
  return (
    <div className="audit-report space-y-7">
      <SignedOffBanner audit={audit} />
      <Section title="What the audit found" className="">
        <FindingsList findings={r.findings} />
      </Section>
      <Section title="The whole field" className="keep-together">
        <FieldFacts
          stats={r.field}
          statsTrue={r.fieldTrue}
          unit={rx.rateUnit}
          system={system}
          unitName={rx.product.unitName}
          money={money}
        />
      </Section>
      <Section title="Maps" className="audit-maps">
        <AuditMaps log={log} audit={audit} prescription={rx} system={system} />
      </Section>
      <DiagnosticsSection log={log} audit={audit} prescription={rx} system={system} />
      <div className="grid gap-x-6 gap-y-7 xl:grid-cols-2">
        <Section title="Applied ÷ target" className="">
          <RatioHistogram bins={r.histogram} bandFraction={audit.bandFraction} />
        </Section>
        <Section title="Speed over time" className="">
          <SpeedChart series={r.speedSeries} system={system} />
        </Section>
      </div>
      <Section
        title="Zones"
        className="audit-zones"
        actions={
          <a
            href={`/api/logs/${encodeURIComponent(log.id)}/audit/zones.csv`}
            download
            className="inline-flex h-7 items-center rounded-card border border-ink-line bg-paper-raised px-2.5 text-sm font-medium text-ink hover:bg-paper print:hidden"
          >
            Download CSV
          </a>
        }
      >
        <ZoneStatsTable
          zones={r.zones}
          unit={rx.rateUnit}
          system={system}
          unitName={rx.product.unitName}
          money={money}
        />
      </Section>
      <Section title="Cleaning" className="">
        <CleaningPanel
          log={log}
          bandFraction={audit.bandFraction}
          system={system}
          canAdjust={CLEANERS.includes(role)}
          frozen={frozen}
        />
      </Section>
      <Section title="Comments" className="">
        <CommentsPanel audit={audit} />
      </Section>
      <Notice tone="info" title="Read with care">
        The audit reads the log as recorded; check surprising findings in the field before acting on them.
        Treated seed is a pesticide: follow the label.
      </Notice>
    </div>
  );
}
