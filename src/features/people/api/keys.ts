import type { QueryClient } from '@tanstack/react-query';
import { resourceKeys } from '@/lib/query-keys';

export const userKeys = resourceKeys('users');
export const mailKeys = resourceKeys('mail');

/** Inviting or changing people sends mail, so both prefixes reload. */
export const invalidatePeople = (qc: QueryClient) =>
  Promise.all([
    qc.invalidateQueries({ queryKey: userKeys.all }),
    qc.invalidateQueries({ queryKey: mailKeys.all }),
  ]);
