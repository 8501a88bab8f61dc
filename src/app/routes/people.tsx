import { ButtonLink } from '@/components/ui/button';
import { NotAllowed } from '@/components/ui/not-allowed';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { useUsers } from '@/features/people/api/get-users';
import { UserTable } from '@/features/people/components/user-table';
import { canManagePeople } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { useGrowerOptions } from './grower-options';

function PeoplePage() {
  const users = useUsers();
  const growers = useGrowerOptions();
  return (
    <>
      <PageHeader
        title="People"
        description="Who works in this workspace, their role, and which growers farmers and consultants see."
        actions={
          <ButtonLink variant="primary" to="/people/invite">
            Invite someone
          </ButtonLink>
        }
      />
      <QueryState query={users}>
        {(data) => <UserTable users={data} growerName={growers.nameOf} />}
      </QueryState>
    </>
  );
}

export function Component() {
  return canManagePeople(useViewer()) ? <PeoplePage /> : <NotAllowed what="managing people" />;
}
