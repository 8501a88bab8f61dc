import { useQuery } from '@tanstack/react-query';
import { useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { farmQueryOptions } from '@/features/register/api/get-farm';
import { FarmForm } from '@/features/register/components/farm-form';
import { canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { RecordEditPage } from './record-edit-page';

export function Component() {
  const { id } = useParams();
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const query = useQuery({ ...farmQueryOptions(id ?? ''), enabled: !!id });
  const growerId = search.get('growerId') ?? '';
  return (
    <RecordEditPage
      allowed={canEditRegister(useViewer())}
      query={id ? query : null}
      title={(f) => (f ? `Edit ${f.name}` : 'Add a farm')}
      crumbs={(f) => [
        { label: 'Farms', to: '/farms' },
        ...(f ? [{ label: f.growerName, to: `/growers/${f.growerId}` }] : []),
      ]}
    >
      {(f) => (
        <FarmForm
          key={f?.id ?? 'new'}
          farm={f}
          growerId={growerId}
          cancelTo={growerId ? `/growers/${growerId}` : '/farms'}
          onSaved={(saved) => navigate(`/growers/${saved.growerId}`)}
        />
      )}
    </RecordEditPage>
  );
}
