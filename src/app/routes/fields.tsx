import { ButtonLink } from '@/components/ui/button';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { useFields } from '@/features/register/api/get-fields';
import { FieldTable } from '@/features/register/components/field-table';
import { useRegisterFilters } from '@/features/register/components/list-filters';
import { canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { withQuery } from './with-query';

export function Component() {
  const canEdit = canEditRegister(useViewer());
  const filters = useRegisterFilters(['growerId', 'farmId']);
  const { archived, growerId, farmId } = filters.params;
  const fields = useFields({ archived, growerId, farmId });
  return (
    <>
      <PageHeader
        title="Fields"
        description="Areas are measured from each field's boundary."
        actions={
          canEdit ? (
            <ButtonLink variant="primary" to={withQuery('/fields/new', { growerId, farmId })}>
              Add field
            </ButtonLink>
          ) : null
        }
      />
      {filters.bar}
      <QueryState query={fields}>{(data) => <FieldTable fields={data} canEdit={canEdit} />}</QueryState>
    </>
  );
}
