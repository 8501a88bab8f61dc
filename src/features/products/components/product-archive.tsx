import { useState } from 'react';
import type { Product } from '@shared/schemas/product.schema';
import { Button } from '@/components/ui/button';
import { ConfirmDialog } from '@/components/ui/dialog';
import { describeError } from '@/components/ui/query-state';
import { useSetProductArchived } from '../api/save-product';

/**
 * Archive a product (it leaves the lists and pickers; prescriptions that use it keep it) or restore it,
 * after asking. Nothing is deleted.
 */
export function ProductArchiveButton({ product }: { product: Product }) {
  const [open, setOpen] = useState(false);
  const mutation = useSetProductArchived();
  const archived = !!product.archivedAt;
  const verb = archived ? 'Restore' : 'Archive';
  const close = () => {
    setOpen(false);
    mutation.reset();
  };
  return (
    <>
      <Button onClick={() => setOpen(true)} aria-label={`${verb} product ${product.name}`}>
        {verb}
      </Button>
      <ConfirmDialog
        open={open}
        onClose={close}
        title={`${verb} product “${product.name}”?`}
        confirmLabel={verb}
        busy={mutation.isPending}
        error={mutation.isError ? describeError(mutation.error) : null}
        onConfirm={() =>
          mutation.mutate({ id: product.id, action: archived ? 'restore' : 'archive' }, { onSuccess: close })
        }
      >
        <p>
          {archived
            ? 'It comes back into the lists and can be chosen for prescriptions again.'
            : 'It leaves the lists and cannot be chosen for new prescriptions; prescriptions that use it keep it.'}
        </p>
      </ConfirmDialog>
    </>
  );
}
