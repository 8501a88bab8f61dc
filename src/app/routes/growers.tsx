import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { useGrowers } from '@/features/register/api/get-growers';
import { GrowerTable } from '@/features/register/components/grower-table';
import { useRegisterFilters } from '@/features/register/components/list-filters';
import { canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';

export function Component() {
  const me = useViewer();
  const canEdit = canEditRegister(me);
  const filters = useRegisterFilters([]);
  const growers = useGrowers({ archived: filters.params.archived });
  return (
    <>
      <PageHeader
        title="Growers"
        description={
          me.role === 'consultant'
            ? 'The growers assigned to you.'
            : 'The farm businesses this practice plans for.'
        }
        actions={
          canEdit ? (
            <ButtonLink variant="primary" to="/growers/new">
              Add grower
            </ButtonLink>
          ) : null
        }
      />
      {filters.bar}
      <QueryState query={growers}>{(data) => <GrowerTable growers={data} canEdit={canEdit} />}</QueryState>
    </>
  );
}
