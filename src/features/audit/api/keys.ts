import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Audit } from '@shared/schemas/as-applied.schema';
import { isApiError } from '@/lib/api-client';
import { resourceKeys } from '@/lib/query-keys';

export const auditKeys = resourceKeys('audits');
/** The logs' own keys (same shape as the logs feature's), to refresh a log after its cleaning changes. */
export const logKeys = resourceKeys('logs');

/** A mutation answering the whole audit: the answer replaces the cached one; a 409 reloads it. */
export function useAuditMutation<V>(logId: string, mutationFn: (variables: V) => Promise<Audit>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: (audit) => qc.setQueryData(auditKeys.detail(logId), audit),
    onError: async (error) => {
      // Stale, or signed off meanwhile: show what is saved now.
      if (isApiError(error) && error.status === 409)
        await qc.invalidateQueries({ queryKey: auditKeys.detail(logId) });
    },
  });
}
