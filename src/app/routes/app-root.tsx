import { Link, Navigate, Outlet, useLocation, useNavigate, useNavigation } from 'react-router-dom';
import { ROLE_LABELS } from '@shared/schemas/auth.schema';
import { AppShell, type NavGroup } from '@/components/layouts/app-shell';
import { Button } from '@/components/ui/button';
import { Loading } from '@/components/ui/loading';
import { ErrorNotice } from '@/components/ui/query-state';
import { useMe } from '@/features/auth/api/get-me';
import { useSignOut } from '@/features/auth/api/sign-out';
import { UnitSystemSwitch } from '@/features/auth/components/unit-system-switch';
import { canManagePeople } from '@/lib/permissions';
import { ViewerProvider } from '@/lib/viewer';

const REGISTER: NavGroup = {
  items: [
    { to: '/', label: 'Overview', end: true },
    { to: '/growers', label: 'Growers' },
    { to: '/farms', label: 'Farms' },
    { to: '/fields', label: 'Fields' },
    { to: '/seasons', label: 'Crop seasons' },
    { to: '/zone-maps', label: 'Zone maps' },
    { to: '/planters', label: 'Planters' },
  ],
};
const PRESCRIBING: NavGroup = {
  label: 'Prescribing',
  items: [
    { to: '/prescriptions', label: 'Prescriptions' },
    { to: '/products', label: 'Products' },
    { to: '/seed-orders', label: 'Seed orders' },
  ],
};
const AFTER_PLANTING: NavGroup = {
  label: 'After planting',
  items: [{ to: '/logs', label: 'Logs and audits' }],
};
const WORKSPACE: NavGroup = {
  label: 'Workspace',
  items: [
    { to: '/people', label: 'People' },
    { to: '/mail', label: 'Mail outbox' },
  ],
};

/** Everything behind sign-in: checks the session, then draws the shell around the page. */
export function AppRoot() {
  const me = useMe();
  const location = useLocation();
  const navigation = useNavigation();
  const navigate = useNavigate();
  const signOut = useSignOut();

  if (me.isPending) return <Loading label="Opening Sowright…" />;
  if (me.isError) {
    return (
      <div className="mx-auto max-w-xl py-10">
        <ErrorNotice error={me.error} onRetry={() => void me.refetch()} />
      </div>
    );
  }
  if (!me.data) {
    if (signOut.isPending || signOut.isSuccess) return <Navigate to="/sign-in" replace />;
    return (
      <Navigate to={`/sign-in?next=${encodeURIComponent(location.pathname + location.search)}`} replace />
    );
  }
  const user = me.data;
  return (
    <ViewerProvider me={user}>
      <AppShell
        nav={
          canManagePeople(user)
            ? [REGISTER, PRESCRIBING, AFTER_PLANTING, WORKSPACE]
            : [REGISTER, PRESCRIBING, AFTER_PLANTING]
        }
        user={{ name: user.name, role: ROLE_LABELS[user.role], workspace: user.workspace.name }}
        busy={navigation.state === 'loading'}
        footer={
          <>
            <UnitSystemSwitch value={user.unitSystem} compact />
            <div className="flex items-center gap-3 text-sm">
              <Link to="/account" className="text-ink-soft underline-offset-2 hover:text-ink hover:underline">
                Account
              </Link>
              <Button
                size="sm"
                variant="ghost"
                busy={signOut.isPending}
                onClick={() =>
                  signOut.mutate(undefined, { onSettled: () => navigate('/sign-in', { replace: true }) })
                }
              >
                Sign out
              </Button>
            </div>
          </>
        }
      >
        <Outlet />
      </AppShell>
    </ViewerProvider>
  );
}
