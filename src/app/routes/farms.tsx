import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { useFarms } from '@/features/register/api/get-farms';
import { FarmTable } from '@/features/register/components/farm-table';
import { useRegisterFilters } from '@/features/register/components/list-filters';
import { canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { withQuery } from './with-query';

export function Component() {
  const canEdit = canEditRegister(useViewer());
  const filters = useRegisterFilters(['growerId']);
  const farms = useFarms({ archived: filters.params.archived, growerId: filters.params.growerId });
  const newTo = withQuery('/farms/new', { growerId: filters.params.growerId });
  return (
    <>
      <PageHeader
        title="Farms"
        description="A farm groups a grower's fields. Open a farm to see its fields."
        actions={
          canEdit ? (
            <ButtonLink variant="primary" to={newTo}>
              Add farm
            </ButtonLink>
          ) : null
        }
      />
      {filters.bar}
      <QueryState query={farms}>{(data) => <FarmTable farms={data} canEdit={canEdit} />}</QueryState>
    </>
  );
}
