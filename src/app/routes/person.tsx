import { useNavigate, useParams } from 'react-router-dom';
import { ROLE_LABELS } from '@shared/schemas/auth.schema';
import { Badge } from '@/components/ui/badge';
import { EmptyState } from '@/components/ui/empty-state';
import { Loading } from '@/components/ui/loading';
import { NotAllowed } from '@/components/ui/not-allowed';
import { PageHeader } from '@/components/ui/page-header';
import { QueryState } from '@/components/ui/query-state';
import { useUsers } from '@/features/people/api/get-users';
import { UserEditForm } from '@/features/people/components/user-edit-form';
import { ResendButton } from '@/features/people/components/user-table';
import { formatDateTime } from '@/lib/format';
import { canManagePeople } from '@/lib/permissions';
import { useViewer } from '@/lib/viewer';
import { useGrowerOptions } from './grower-options';

function PersonPage({ id }: { id: string }) {
  const navigate = useNavigate();
  const users = useUsers();
  const growers = useGrowerOptions();
  return (
    <QueryState query={users}>
      {(list) => {
        const user = list.find((u) => u.id === id);
        if (!user)
          return (
            <EmptyState title="No such person">They may have been removed from this workspace.</EmptyState>
          );
        return (
          <>
            <PageHeader
              crumbs={[{ label: 'People', to: '/people' }, { label: user.name }]}
              title={
                <>
                  {user.name}
                  {user.status === 'invited' ? <Badge tone="accent">Invited</Badge> : null}
                  {user.status === 'disabled' ? <Badge>Disabled</Badge> : null}
                </>
              }
              description={`${ROLE_LABELS[user.role]} · ${user.email} · last signed in ${user.lastSignInAt ? formatDateTime(user.lastSignInAt) : 'never'}`}
              actions={user.status === 'invited' ? <ResendButton user={user} /> : null}
            />
            {growers.isPending ? (
              <Loading />
            ) : (
              <UserEditForm
                key={user.id}
                user={user}
                growers={growers.options}
                cancelTo="/people"
                onSaved={() => navigate('/people')}
              />
            )}
          </>
        );
      }}
    </QueryState>
  );
}

export function Component() {
  const { id = '' } = useParams();
  return canManagePeople(useViewer()) ? <PersonPage id={id} /> : <NotAllowed what="managing people" />;
}
