import { useQuery } from '@tanstack/react-query';
import { useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { seasonQueryOptions } from '@/features/register/api/get-season';
import { SeasonForm } from '@/features/register/components/season-form';
import { canEditRegister } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { RecordEditPage } from './record-edit-page';

export function Component() {
  const { id } = useParams();
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const query = useQuery({ ...seasonQueryOptions(id ?? ''), enabled: !!id });
  return (
    <RecordEditPage
      allowed={canEditRegister(useViewer())}
      query={id ? query : null}
      title={(s) => (s ? `Edit the ${s.year} season on ${s.fieldName}` : 'Add a crop season')}
      crumbs={(s) => [
        { label: 'Crop seasons', to: '/seasons' },
        ...(s ? [{ label: s.fieldName, to: `/fields/${s.fieldId}` }] : []),
      ]}
    >
      {(s) => (
        <SeasonForm
          key={s?.id ?? 'new'}
          season={s}
          growerId={search.get('growerId') ?? ''}
          fieldId={search.get('fieldId') ?? ''}
          cancelTo={s ? `/fields/${s.fieldId}` : '/seasons'}
          onSaved={(saved) => navigate(`/fields/${saved.fieldId}`)}
        />
      )}
    </RecordEditPage>
  );
}
