import { useState } from 'react';
import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { ROLE_LABELS } from '@shared/schemas/auth.schema';
import type { User } from '@shared/schemas/user.schema';
import { Badge, type Tone } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { DataTable } from '@/components/ui/data-table';
import { describeError } from '@/components/ui/query-state';
import { formatDateTime } from '@/lib/format';
import { useResendInvitation } from '../api/resend-invitation';

const STATUS: Record<User['status'], { label: string; tone: Tone }> = {
  invited: { label: 'Invited', tone: 'accent' },
  active: { label: 'Active', tone: 'ok' },
  disabled: { label: 'Disabled', tone: 'neutral' },
};

export function ResendButton({ user }: { user: User }) {
  const resend = useResendInvitation();
  const [sent, setSent] = useState(false);
  return (
    <span className="inline-flex items-center gap-2">
      <Button
        size="sm"
        variant="ghost"
        busy={resend.isPending}
        onClick={() => resend.mutate(user.id, { onSuccess: () => setSent(true) })}
        aria-label={`Send the invitation to ${user.name} again`}
      >
        {sent ? 'Sent again' : 'Send again'}
      </Button>
      {resend.isError ? (
        <span role="alert" className="text-xs text-danger">
          {describeError(resend.error)}
        </span>
      ) : null}
    </span>
  );
}

/** The people of the workspace. `growerName` turns a grower id into its name. */
export function UserTable({ users, growerName }: { users: User[]; growerName: (id: string) => string }) {
  const growersOf = (u: User) =>
    u.role === 'farmer' ? (u.growerId ? [u.growerId] : []) : u.role === 'consultant' ? u.growerIds : [];
  const columns: ColumnDef<User, unknown>[] = [
    {
      id: 'name',
      header: 'Name',
      accessorFn: (u) => u.name,
      cell: ({ row }) => (
        <Link
          to={`/people/${row.original.id}`}
          className="font-medium underline-offset-2 hover:text-clay-700 hover:underline"
        >
          {row.original.name}
        </Link>
      ),
    },
    {
      id: 'email',
      header: 'E-mail',
      accessorFn: (u) => u.email,
      cell: ({ getValue }) => <span className="break-all">{getValue() as string}</span>,
    },
    { id: 'role', header: 'Role', accessorFn: (u) => ROLE_LABELS[u.role] },
    {
      id: 'status',
      header: 'Status',
      accessorFn: (u) => STATUS[u.status].label,
      cell: ({ row }) => (
        <Badge tone={STATUS[row.original.status].tone}>{STATUS[row.original.status].label}</Badge>
      ),
    },
    {
      id: 'growers',
      header: 'Growers',
      accessorFn: (u) => {
        const ids = growersOf(u);
        return u.role === 'admin' || u.role === 'agronomist' ? 'All' : ids.map(growerName).join(', ');
      },
      cell: ({ getValue }) => (getValue() as string) || <span className="text-ink-faint">None</span>,
    },
    {
      id: 'lastSignIn',
      header: 'Last sign-in',
      accessorFn: (u) => u.lastSignInAt ?? undefined,
      sortUndefined: 'last',
      cell: ({ row }) => (
        <span className="text-ink-soft">
          {row.original.lastSignInAt ? formatDateTime(row.original.lastSignInAt) : 'Never'}
        </span>
      ),
    },
    {
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      enableSorting: false,
      meta: { shrink: true },
      cell: ({ row }) => (
        <span className="flex justify-end gap-1">
          {row.original.status === 'invited' ? <ResendButton user={row.original} /> : null}
          <Link
            to={`/people/${row.original.id}`}
            className="inline-flex h-7 items-center rounded-card px-2.5 text-sm text-ink-soft hover:bg-paper-sunk hover:text-ink"
            aria-label={`Edit ${row.original.name}`}
          >
            Edit
          </Link>
        </span>
      ),
    },
  ];
  return (
    <DataTable
      label="People"
      data={users}
      columns={columns}
      initialSort={[{ id: 'name', desc: false }]}
      getRowId={(u) => u.id}
    />
  );
}
