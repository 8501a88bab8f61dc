import { useNavigate } from 'react-router-dom';
import { Loading } from '@/components/ui/loading';
import { NotAllowed } from '@/components/ui/not-allowed';
import { PageHeader } from '@/components/ui/page-header';
import { InviteForm } from '@/features/people/components/invite-form';
import { canManagePeople } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { useGrowerOptions } from './grower-options';

function InvitePage() {
  const navigate = useNavigate();
  const growers = useGrowerOptions();
  return (
    <>
      <PageHeader
        crumbs={[{ label: 'People', to: '/people' }, { label: 'Invite' }]}
        title="Invite someone"
        description="They get an e-mail with a link to choose a password. The link works once."
      />
      {growers.isPending ? (
        <Loading />
      ) : (
        <InviteForm growers={growers.options} cancelTo="/people" onInvited={() => navigate('/people')} />
      )}
    </>
  );
}

export function Component() {
  return canManagePeople(useViewer()) ? <InvitePage /> : <NotAllowed what="inviting people" />;
}
