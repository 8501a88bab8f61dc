import type { QueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunction } from 'react-router-dom';
import { CROP_LABELS } from '@shared/schemas/crops';
import type { Prescription } from '@shared/schemas/prescription.schema';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { prescriptionQueryOptions, usePrescription } from '@/features/prescriptions/api/get-prescription';
import { usePrescriptions } from '@/features/prescriptions/api/get-prescriptions';
import { PrescriptionEditor } from '@/features/prescriptions/components/prescription-editor';
import { StatusBadge } from '@/features/prescriptions/components/status-badge';
import { canEditRegister } from '@/lib/permissions';
import { useUnitSystem, useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ params }) => {
    void qc.prefetchQuery(prescriptionQueryOptions(params.id ?? ''));
    return null;
  };

/** Every version of the same prescription (same lineage), oldest first, with its state. */
function Versions({ p }: { p: Prescription }) {
  const all = usePrescriptions({ fieldId: p.fieldId, seasonId: p.seasonId });
  const versions = (all.data ?? [])
    .filter((v) => v.lineageId === p.lineageId)
    .sort((a, b) => a.versionNo - b.versionNo);
  if (versions.length < 2) return null;
  return (
    <nav aria-label="Versions" className="text-sm text-ink-soft">
      <ol className="flex flex-wrap items-center gap-x-3 gap-y-1">
        {versions.map((v) => (
          <li key={v.id} className="flex items-center gap-1.5">
            {v.id === p.id ? (
              <span aria-current="page" className="font-mono font-medium text-ink">
                v{v.versionNo}
              </span>
            ) : (
              <Link
                to={`/prescriptions/${v.id}`}
                className="font-mono underline underline-offset-2 hover:text-clay-700"
              >
                v{v.versionNo}
              </Link>
            )}
            <StatusBadge status={v.status} />
          </li>
        ))}
      </ol>
    </nav>
  );
}

function PrescriptionPage({ p }: { p: Prescription }) {
  const me = useViewer();
  const system = useUnitSystem();
  const canWrite = canEditRegister(me);
  const canExport = me.role !== 'consultant';
  return (
    <>
      <PageHeader
        title={
          <>
            {p.name}
            <StatusBadge status={p.status} />
          </>
        }
        crumbs={[
          { label: 'Prescriptions', to: '/prescriptions' },
          { label: p.growerName, to: `/growers/${p.growerId}` },
          { label: p.fieldName, to: `/fields/${p.fieldId}` },
          { label: p.seasonLabel },
        ]}
        description={
          <>
            {p.fieldName} ({p.farmName}), {p.seasonLabel}, {CROP_LABELS[p.crop].toLowerCase()}.{' '}
            {p.product.name}
            {p.planter ? ` with ${p.planter.name}` : ''}; zones from{' '}
            <Link
              to={`/zone-maps/${p.zoneMapId}`}
              className="underline-offset-2 hover:text-clay-700 hover:underline"
            >
              {p.zoneMapName} v{p.zoneMapVersionNo}
            </Link>
            .{canWrite || p.status !== 'draft' ? '' : ' The agronomist is still working on it.'}
            {canWrite ? '' : ' You can read the rates; the agronomist changes them.'}
          </>
        }
        meta={<Versions p={p} />}
      />
      <PrescriptionEditor
        key={p.id}
        prescription={p}
        system={system}
        canWrite={canWrite}
        canExport={canExport}
      />
    </>
  );
}

export function Component() {
  const { id = '' } = useParams();
  const query = usePrescription(id);
  return <QueryState query={query}>{(p) => <PrescriptionPage p={p} />}</QueryState>;
}
