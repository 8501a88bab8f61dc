import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { usePlanters } from '@/features/register/api/get-planters';
import { useRegisterFilters } from '@/features/register/components/list-filters';
import { PlanterTable } from '@/features/register/components/planter-table';
import { canEditPlanter } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { withQuery } from './with-query';

export function Component() {
  const me = useViewer();
  const filters = useRegisterFilters(['growerId']);
  const { archived, growerId } = filters.params;
  const planters = usePlanters({ archived, growerId });
  return (
    <>
      <PageHeader
        title="Planters"
        description="Machine profiles: rows, sections, seed discs and the speeds the grower plants at."
        actions={
          canEditPlanter(me) ? (
            <ButtonLink variant="primary" to={withQuery('/planters/new', { growerId })}>
              Add planter
            </ButtonLink>
          ) : null
        }
      />
      {filters.bar}
      <QueryState query={planters}>
        {(data) => <PlanterTable planters={data} canEdit={(p) => canEditPlanter(me, p.growerId)} />}
      </QueryState>
    </>
  );
}
