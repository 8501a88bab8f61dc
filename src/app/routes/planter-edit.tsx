import { useQuery } from '@tanstack/react-query';
import { useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { planterQueryOptions } from '@/features/register/api/get-planter';
import { PlanterForm } from '@/features/register/components/planter-form';
import { canEditPlanter } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { RecordEditPage } from './record-edit-page';

export function Component() {
  const { id } = useParams();
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const me = useViewer();
  const query = useQuery({ ...planterQueryOptions(id ?? ''), enabled: !!id });
  return (
    <RecordEditPage
      allowed={(p) => canEditPlanter(me, p?.growerId)}
      query={id ? query : null}
      title={(p) => (p ? `Edit ${p.name}` : 'Add a planter')}
      crumbs={(p) => [
        { label: 'Planters', to: '/planters' },
        ...(p ? [{ label: p.name, to: `/planters/${p.id}` }] : []),
      ]}
      description="Row spacing and speeds are in your units; switch units in the left rail."
    >
      {(p) => (
        <PlanterForm
          key={p?.id ?? 'new'}
          planter={p}
          growerId={search.get('growerId') ?? ''}
          cancelTo={p ? `/planters/${p.id}` : '/planters'}
          onSaved={(saved) => navigate(`/planters/${saved.id}`)}
        />
      )}
    </RecordEditPage>
  );
}
