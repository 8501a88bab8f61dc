import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { useSeasons } from '@/features/register/api/get-seasons';
import { useRegisterFilters } from '@/features/register/components/list-filters';
import { SeasonTable } from '@/features/register/components/season-table';
import { canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { withQuery } from './with-query';

export function Component() {
  const canEdit = canEditRegister(useViewer());
  const filters = useRegisterFilters(['growerId', 'fieldId']);
  const { archived, growerId, fieldId } = filters.params;
  const seasons = useSeasons({ archived, growerId, fieldId });
  return (
    <>
      <PageHeader
        title="Crop seasons"
        description="What is planted in each field, year by year."
        actions={
          canEdit ? (
            <ButtonLink variant="primary" to={withQuery('/seasons/new', { growerId, fieldId })}>
              Add crop season
            </ButtonLink>
          ) : null
        }
      />
      {filters.bar}
      <QueryState query={seasons}>{(data) => <SeasonTable seasons={data} canEdit={canEdit} />}</QueryState>
    </>
  );
}
