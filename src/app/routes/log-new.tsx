import { useMemo } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import { useNavigate, useSearchParams, type LoaderFunction } from 'react-router-dom';
import { NotAllowed } from '@/components/ui/not-allowed';
import { PageHeader } from '@/components/ui/page-header';
import { ErrorNotice } from '@/components/ui/query-state';
import { Loading } from '@/components/ui/loading';
import {
  NewLogWizard,
  type PlanterChoice,
  type PrescriptionChoice,
} from '@/features/logs/components/new-log-wizard';
import { usePrescription } from '@/features/prescriptions/api/get-prescription';
import { prescriptionsQueryOptions, usePrescriptions } from '@/features/prescriptions/api/get-prescriptions';
import { usePlanters } from '@/features/register/api/get-planters';
import { useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  () => {
    void qc.prefetchQuery(prescriptionsQueryOptions({ status: 'approved' }));
    void qc.prefetchQuery(prescriptionsQueryOptions({ status: 'superseded' }));
    return null;
  };

/**
 * Upload a log: the approved (or since replaced) prescriptions the user may see, the planters of the chosen
 * one's grower (its own planter first), then the steps of the logs feature. The choice is kept in the
 * address (`?prescriptionId=&planterId=`), so "fix the column mapping" can come back to it.
 */
export function Component() {
  const me = useViewer();
  const navigate = useNavigate();
  const [search, setSearch] = useSearchParams();
  const prescriptionId = search.get('prescriptionId') ?? '';
  const approved = usePrescriptions({ status: 'approved' });
  const replaced = usePrescriptions({ status: 'superseded' });
  const chosen = usePrescription(prescriptionId);
  const growerId = chosen.data?.growerId;
  const planters = usePlanters({ growerId });

  const choices = useMemo<PrescriptionChoice[]>(
    () =>
      [...(approved.data ?? []), ...(replaced.data ?? [])].map((p) => ({
        id: p.id,
        label: `${p.fieldName} (${p.growerName}), ${p.seasonLabel}: ${p.name} v${p.versionNo}`,
        replaced: p.status === 'superseded',
      })),
    [approved.data, replaced.data],
  );
  const planterChoices = useMemo<PlanterChoice[] | null>(
    () =>
      growerId && planters.data
        ? planters.data
            .filter((p) => p.growerId === growerId && (!p.archivedAt || p.id === chosen.data?.planter?.id))
            .map((p) => ({ id: p.id, name: p.name, groundSpeedSource: p.groundSpeedSource }))
        : null,
    [growerId, planters.data, chosen.data],
  );

  if (me.role === 'consultant') return <NotAllowed what="uploading logs" />;
  const failed = [approved, replaced].find((q) => q.isError);
  const fromAddress = search.get('planterId');
  const defaultPlanterId =
    (fromAddress && planterChoices?.some((p) => p.id === fromAddress) ? fromAddress : null) ??
    chosen.data?.planter?.id ??
    null;

  return (
    <>
      <PageHeader
        title="Upload a log"
        crumbs={[{ label: 'Logs and audits', to: '/logs' }, { label: 'Upload' }]}
        description="The as-applied log of one field, as the planter’s display wrote it. It is read in the background and checked against the prescription it was planted with."
      />
      {failed ? <ErrorNotice error={failed.error} onRetry={() => void failed.refetch()} /> : null}
      {approved.isPending || replaced.isPending ? (
        <Loading />
      ) : (
        <NewLogWizard
          key={prescriptionId}
          prescriptions={choices}
          prescriptionId={prescriptionId}
          onPrescription={(id) =>
            setSearch(() => (id ? new URLSearchParams({ prescriptionId: id }) : new URLSearchParams()), {
              replace: true,
            })
          }
          planters={planterChoices}
          defaultPlanterId={defaultPlanterId}
          onReady={(log) => navigate(`/logs/${log.id}/audit`)}
        />
      )}
    </>
  );
}
