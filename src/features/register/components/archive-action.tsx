import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { describeError } from '@/components/ui/query-state';
import { useSetArchived } from '../api/archive-record';
import type { RegisterResource } from '../api/keys';

const NOUN: Record<RegisterResource, string> = {
  growers: 'grower',
  farms: 'farm',
  fields: 'field',
  seasons: 'crop season',
  planters: 'planter',
};

const EFFECT: Record<RegisterResource, string> = {
  growers: 'It leaves the lists and pickers; its farms, fields and planters are kept as they are.',
  farms: 'It leaves the lists and pickers; its fields are kept as they are.',
  fields: 'It leaves the lists and pickers; its boundary and crop seasons are kept.',
  seasons: 'It leaves the lists; nothing else changes.',
  planters: 'It leaves the lists and pickers; its settings are kept.',
};

/** Archive or restore one record of the register, after asking. Nothing is deleted. */
export function ArchiveAction({
  resource,
  id,
  name,
  archived,
  size = 'sm',
  onDone,
}: {
  resource: RegisterResource;
  id: string;
  name: string;
  archived: boolean;
  size?: 'sm' | 'md';
  onDone?: () => void;
}) {
  const [open, setOpen] = useState(false);
  const mutation = useSetArchived();
  const action = archived ? 'restore' : 'archive';
  const noun = NOUN[resource];
  const close = () => {
    setOpen(false);
    mutation.reset();
  };
  return (
    <>
      <Button
        size={size}
        variant="ghost"
        onClick={() => setOpen(true)}
        aria-label={`${archived ? 'Restore' : 'Archive'} ${noun} ${name}`}
      >
        {archived ? 'Restore' : 'Archive'}
      </Button>
      <ConfirmDialog
        open={open}
        onClose={close}
        title={archived ? `Restore ${noun} “${name}”?` : `Archive ${noun} “${name}”?`}
        confirmLabel={archived ? 'Restore' : 'Archive'}
        busy={mutation.isPending}
        error={mutation.isError ? describeError(mutation.error) : null}
        onConfirm={() =>
          mutation.mutate(
            { resource, id, action },
            {
              onSuccess: () => {
                close();
                onDone?.();
              },
            },
          )
        }
      >
        <p>{archived ? 'It comes back into the lists and pickers.' : EFFECT[resource]}</p>
        {archived ? null : (
          <p className="text-sm text-ink-soft">
            You can restore it at any time from the list with archived records shown.
          </p>
        )}
      </ConfirmDialog>
    </>
  );
}
