import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { invalidateRegister, type RegisterResource } from './keys';

export type ArchiveAction = 'archive' | 'restore';

/**
 * POST /api/{resource}/:id/archive and /restore, the same pair for growers, farms, fields, seasons and
 * planters. The answer is the record, which every list then reloads, so it is not parsed here.
 */
export const setArchived = async ({
  resource,
  id,
  action,
}: {
  resource: RegisterResource;
  id: string;
  action: ArchiveAction;
}) => {
  await api.post(`/api/${resource}/${encodeURIComponent(id)}/${action}`);
};

export function useSetArchived() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: setArchived, onSuccess: () => invalidateRegister(qc) });
}
