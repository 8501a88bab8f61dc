import { useQuery } from '@tanstack/react-query';
import { useNavigate, useParams } from 'react-router-dom';
import { growerQueryOptions } from '@/features/register/api/get-grower';
import { GrowerForm } from '@/features/register/components/grower-form';
import { canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { RecordEditPage } from './record-edit-page';

export function Component() {
  const { id } = useParams();
  const navigate = useNavigate();
  const query = useQuery({ ...growerQueryOptions(id ?? ''), enabled: !!id });
  return (
    <RecordEditPage
      allowed={canEditRegister(useViewer())}
      query={id ? query : null}
      title={(g) => (g ? `Edit ${g.name}` : 'Add a grower')}
      crumbs={(g) => [
        { label: 'Growers', to: '/growers' },
        ...(g ? [{ label: g.name, to: `/growers/${g.id}` }] : []),
      ]}
    >
      {(g) => (
        <GrowerForm
          key={g?.id ?? 'new'}
          grower={g}
          cancelTo={g ? `/growers/${g.id}` : '/growers'}
          onSaved={(saved) => navigate(`/growers/${saved.id}`)}
        />
      )}
    </RecordEditPage>
  );
}
