import { useEffect, useRef } from 'react';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunction } from 'react-router-dom';
import type { Log } from '@shared/schemas/as-applied.schema';
import { Button } from '@/components/ui/button';
import { Loading } from '@/components/ui/loading';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorNotice, QueryState } from '@/components/ui/query-state';
import { useAudit } from '@/features/audit/api/get-audit';
import { auditKeys } from '@/features/audit/api/keys';
import { AuditReport } from '@/features/audit/components/audit-report';
import { SignOffButton } from '@/features/audit/components/sign-off';
import { logQueryOptions, useLog } from '@/features/logs/api/get-log';
import { LogProgress } from '@/features/logs/components/log-progress';
import { LogStatusBadge } from '@/features/logs/components/log-status';
import { usePrescription } from '@/features/prescriptions/api/get-prescription';
import { useUnitSystem, useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ params }) => {
    // The audit itself is asked for once the log is known to be read (it answers 404 before).
    void qc.prefetchQuery(logQueryOptions(params.id ?? ''));
    return null;
  };

/** The audit of a read log; while the log is being read (first time or cleaned again), its progress. */
function AuditPage({ log }: { log: Log }) {
  const me = useViewer();
  const system = useUnitSystem();
  const qc = useQueryClient();
  const ready = log.status === 'ready';
  const audit = useAudit(log.id, ready);
  const rx = usePrescription(log.prescriptionId);

  // Read anew (after "Adjust cleaning"): the audit changed too. Its old figures are dropped, not shown while
  // the new ones load (the server changes the band at once, the figures only when the reading is done).
  const lastStatus = useRef(log.status);
  useEffect(() => {
    if (lastStatus.current !== 'ready' && ready) void qc.resetQueries({ queryKey: auditKeys.detail(log.id) });
    lastStatus.current = log.status;
  }, [ready, log.status, log.id, qc]);

  const signs = me.role === 'consultant' || me.role === 'admin';
  return (
    <>
      <PageHeader
        title={
          <>
            Audit of {log.fieldName}
            {ready ? null : <LogStatusBadge status={log.status} />}
          </>
        }
        crumbs={[
          { label: 'Logs and audits', to: '/logs' },
          { label: log.fieldName, to: `/fields/${log.fieldId}` },
          { label: log.seasonLabel },
        ]}
        description={
          <>
            {log.seasonLabel}, planted with {log.planterName} on{' '}
            <Link
              to={`/prescriptions/${log.prescriptionId}`}
              className="underline-offset-2 hover:text-clay-700 hover:underline"
            >
              {log.prescriptionLabel}
            </Link>
            . Log file {log.fileName}.
          </>
        }
        actions={
          ready && audit.data ? (
            <>
              <Button className="print:hidden" onClick={() => window.print()}>
                Print report
              </Button>
              {signs ? <SignOffButton audit={audit.data} /> : null}
            </>
          ) : null
        }
      />
      {!ready ? (
        <LogProgress log={log} />
      ) : audit.isError ? (
        <ErrorNotice error={audit.error} onRetry={() => void audit.refetch()} />
      ) : rx.isError ? (
        <ErrorNotice error={rx.error} onRetry={() => void rx.refetch()} />
      ) : audit.data && rx.data ? (
        <AuditReport log={log} audit={audit.data} prescription={rx.data} system={system} role={me.role} />
      ) : (
        <Loading label="Opening the audit…" />
      )}
    </>
  );
}

export function Component() {
  const { id = '' } = useParams();
  const query = useLog(id);
  return <QueryState query={query}>{(log) => <AuditPage log={log} />}</QueryState>;
}
