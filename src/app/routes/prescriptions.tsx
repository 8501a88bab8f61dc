import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunction } from 'react-router-dom';
import {
  PRESCRIPTION_STATUS_LABELS,
  PRESCRIPTION_STATUSES,
  type PrescriptionStatus,
} from '@shared/schemas/prescription.schema';
import { ButtonLink } from '@/components/ui/button';
import { FilterBar, FilterSelect } from '@/components/ui/filter-bar';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { prescriptionsQueryOptions, usePrescriptions } from '@/features/prescriptions/api/get-prescriptions';
import { PrescriptionTable } from '@/features/prescriptions/components/prescription-table';
import { useGrowers } from '@/features/register/api/get-growers';
import { canEditRegister } from '@/lib/permissions';
import { useFilterParams } from '@/lib/use-filter-params';
import { useViewer } from '@/lib/viewer';

export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ request }) => {
    const q = new URL(request.url).searchParams;
    void qc.prefetchQuery(
      prescriptionsQueryOptions({
        growerId: q.get('growerId') || undefined,
        status: (q.get('status') || undefined) as PrescriptionStatus | undefined,
      }),
    );
    return null;
  };

const isStatus = (s: string): s is PrescriptionStatus =>
  (PRESCRIPTION_STATUSES as readonly string[]).includes(s);

export function Component() {
  const me = useViewer();
  const canEdit = canEditRegister(me);
  const [values, set] = useFilterParams(['growerId', 'status'] as const);
  const growers = useGrowers();
  const status = isStatus(values.status) ? values.status : undefined;
  const list = usePrescriptions({ growerId: values.growerId || undefined, status });
  const manyGrowers = (growers.data?.length ?? 0) > 1;
  return (
    <>
      <PageHeader
        title="Prescriptions"
        description="Target rates per zone for a field's crop season, checked against the planter, with every version kept."
        actions={
          canEdit ? (
            <ButtonLink variant="primary" to="/prescriptions/new">
              New prescription
            </ButtonLink>
          ) : null
        }
      />
      <FilterBar>
        {manyGrowers ? (
          <FilterSelect
            label="Grower"
            allLabel="All growers"
            value={values.growerId}
            options={growers.data ?? []}
            onChange={(v) => set('growerId', v)}
          />
        ) : null}
        <FilterSelect
          label="State"
          allLabel="Any state"
          value={status ?? ''}
          options={PRESCRIPTION_STATUSES.map((s) => ({ id: s, name: PRESCRIPTION_STATUS_LABELS[s] }))}
          onChange={(v) => set('status', v)}
        />
      </FilterBar>
      <QueryState query={list}>
        {(items) => (
          <PrescriptionTable
            items={items}
            hiddenColumns={manyGrowers ? [] : ['grower']}
            empty={
              values.growerId || status
                ? { title: 'None match', text: 'No prescription matches these filters.' }
                : canEdit
                  ? {
                      title: 'No prescriptions yet',
                      text: 'Choose "New prescription" to set rates for a field that has a zone map.',
                    }
                  : { title: 'No prescriptions yet', text: 'None has been written for your fields yet.' }
            }
          />
        )}
      </QueryState>
    </>
  );
}
