import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunction } from 'react-router-dom';
import { useParams } from 'react-router-dom';
import type { Grower } from '@shared/schemas/grower.schema';
import { ButtonLink } from '@/components/ui/button';
import { Facts } from '@/components/ui/facts';
import { QueryState } from '@/components/ui/query-state';
import { Section } from '@/components/ui/section';
import { farmsQueryOptions, useFarms } from '@/features/register/api/get-farms';
import { fieldsQueryOptions, useFields } from '@/features/register/api/get-fields';
import { growerQueryOptions, useGrower } from '@/features/register/api/get-grower';
import { plantersQueryOptions, usePlanters } from '@/features/register/api/get-planters';
import { FarmTable } from '@/features/register/components/farm-table';
import { FieldTable } from '@/features/register/components/field-table';
import { PlanterTable } from '@/features/register/components/planter-table';
import { RecordHeader } from '@/features/register/components/record-header';
import { canEditPlanter, canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';

/** Starts loading the grower and its lists while the page's code arrives. */
export const loader =
  (qc: QueryClient): LoaderFunction =>
  ({ params }) => {
    const growerId = params.id ?? '';
    void qc.prefetchQuery(growerQueryOptions(growerId));
    void qc.prefetchQuery(farmsQueryOptions({ growerId }));
    void qc.prefetchQuery(fieldsQueryOptions({ growerId }));
    void qc.prefetchQuery(plantersQueryOptions({ growerId }));
    return null;
  };

function GrowerPage({ grower }: { grower: Grower }) {
  const me = useViewer();
  const canEdit = canEditRegister(me);
  const growerId = grower.id;
  const farms = useFarms({ growerId });
  const fields = useFields({ growerId });
  const planters = usePlanters({ growerId });
  const hide = ['grower'];
  return (
    <>
      <RecordHeader
        resource="growers"
        record={grower}
        canEdit={canEdit}
        crumbs={[{ label: 'Growers', to: '/growers' }]}
      />
      <Facts
        columns={4}
        items={[
          { label: 'Contact person', value: grower.contactName ?? '—' },
          {
            label: 'E-mail',
            value: grower.email ? (
              <a className="text-clay-700 underline" href={`mailto:${grower.email}`}>
                {grower.email}
              </a>
            ) : (
              '—'
            ),
          },
          { label: 'Phone', value: grower.phone ?? '—' },
          {
            label: 'Farms · fields · planters',
            value: `${grower.farmCount} · ${grower.fieldCount} · ${grower.planterCount}`,
            numeric: true,
          },
        ]}
      />
      {grower.notes ? (
        <p className="mt-3 max-w-3xl text-sm whitespace-pre-line text-ink-soft">{grower.notes}</p>
      ) : null}

      <Section
        title="Farms"
        actions={
          canEdit ? (
            <ButtonLink size="sm" to={`/farms/new?growerId=${growerId}`}>
              Add farm
            </ButtonLink>
          ) : null
        }
      >
        <QueryState query={farms}>
          {(data) => <FarmTable farms={data} canEdit={canEdit} hiddenColumns={hide} />}
        </QueryState>
      </Section>
      <Section
        title="Fields"
        actions={
          canEdit ? (
            <ButtonLink size="sm" to={`/fields/new?growerId=${growerId}`}>
              Add field
            </ButtonLink>
          ) : null
        }
      >
        <QueryState query={fields}>
          {(data) => <FieldTable fields={data} canEdit={canEdit} hiddenColumns={hide} />}
        </QueryState>
      </Section>
      <Section
        title="Planters"
        actions={
          canEditPlanter(me, growerId) ? (
            <ButtonLink size="sm" to={`/planters/new?growerId=${growerId}`}>
              Add planter
            </ButtonLink>
          ) : null
        }
      >
        <QueryState query={planters}>
          {(data) => (
            <PlanterTable
              planters={data}
              canEdit={(p) => canEditPlanter(me, p.growerId)}
              hiddenColumns={hide}
            />
          )}
        </QueryState>
      </Section>
    </>
  );
}

export function Component() {
  const { id = '' } = useParams();
  const grower = useGrower(id);
  return <QueryState query={grower}>{(g) => <GrowerPage grower={g} />}</QueryState>;
}
