import { useQuery } from '@tanstack/react-query';
import { useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { fieldQueryOptions } from '@/features/register/api/get-field';
import { FieldForm } from '@/features/register/components/field-form';
import { canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { RecordEditPage } from './record-edit-page';

export function Component() {
  const { id } = useParams();
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const query = useQuery({ ...fieldQueryOptions(id ?? ''), enabled: !!id });
  return (
    <RecordEditPage
      allowed={canEditRegister(useViewer())}
      query={id ? query : null}
      title={(f) => (f ? `Edit ${f.name}` : 'Add a field')}
      crumbs={(f) => [
        { label: 'Fields', to: '/fields' },
        ...(f ? [{ label: f.name, to: `/fields/${f.id}` }] : []),
      ]}
    >
      {(f) => (
        <FieldForm
          key={f?.id ?? 'new'}
          field={f}
          growerId={search.get('growerId') ?? ''}
          farmId={search.get('farmId') ?? ''}
          cancelTo={f ? `/fields/${f.id}` : '/fields'}
          onSaved={(saved) => navigate(`/fields/${saved.id}`)}
        />
      )}
    </RecordEditPage>
  );
}
