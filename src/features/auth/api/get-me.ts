import { queryOptions, useQuery } from '@tanstack/react-query';
import { sessionSchema, type Me } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';

export const authKeys = {
  all: ['auth'] as const,
  me: () => ['auth', 'me'] as const,
  invitation: (token: string) => ['auth', 'invitation', token] as const,
};

/**
 * The signed-in user, or null. Asks GET /api/auth/session, which answers 200 either way, so a signed-out
 * visit leaves no error in the console.
 */
export async function getMe(): Promise<Me | null> {
  return sessionSchema.parse(await api.get('/api/auth/session')).me;
}

export const meQueryOptions = () =>
  queryOptions({
    queryKey: authKeys.me(),
    queryFn: getMe,
    staleTime: 5 * 60_000,
  });

export const useMe = () => useQuery(meQueryOptions());
