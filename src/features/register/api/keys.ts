import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { resourceKeys } from '@/lib/query-keys';

export const growerKeys = resourceKeys('growers');
export const farmKeys = resourceKeys('farms');
export const fieldKeys = resourceKeys('fields');
export const seasonKeys = resourceKeys('seasons');
export const planterKeys = resourceKeys('planters');

/** Which archived records a list shows: none (default), all, or only the archived ones. */
export type ArchivedFilter = 'false' | 'true' | 'only';

export type RegisterResource = 'growers' | 'farms' | 'fields' | 'seasons' | 'planters';

/**
 * After any change to the register. Lists carry each other's names and counts (a farm's field count and
 * area, a field's farm name, a grower's planter count), so a change to one invalidates every prefix.
 */
export const invalidateRegister = (qc: QueryClient) =>
  Promise.all(
    [growerKeys, farmKeys, fieldKeys, seasonKeys, planterKeys].map((k) =>
      qc.invalidateQueries({ queryKey: k.all }),
    ),
  );

/**
 * A register mutation: afterwards every register list reloads, and when the answer is a record its detail
 * entry is replaced by the answer (`detailKey`), so an open page shows what was saved at once.
 */
export function useRegisterMutation<V, R extends { id: string }>(
  mutationFn: (variables: V) => Promise<R>,
  detailKey?: (id: string) => readonly unknown[],
) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: (saved) => {
      if (detailKey) qc.setQueryData(detailKey(saved.id), saved);
      return invalidateRegister(qc);
    },
  });
}
