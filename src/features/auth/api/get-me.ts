import { queryOptions, useQuery } from '@tanstack/react-query';
import { meSchema, type Me } from '@shared/schemas/auth.schema';
import { api, isApiError } from '@/lib/api-client';

export const authKeys = {
  all: ['auth'] as const,
  me: () => ['auth', 'me'] as const,
  invitation: (token: string) => ['auth', 'invitation', token] as const,
};

/** The signed-in user, or null when no session is open (401). */
export async function getMe(): Promise<Me | null> {
  try {
    return meSchema.parse(await api.get('/api/auth/me'));
  } catch (e) {
    if (isApiError(e) && e.status === 401) return null;
    throw e;
  }
}

export const meQueryOptions = () =>
  queryOptions({
    queryKey: authKeys.me(),
    queryFn: getMe,
    staleTime: 5 * 60_000,
  });

export const useMe = () => useQuery(meQueryOptions());
