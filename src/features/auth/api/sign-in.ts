import { useMutation, useQueryClient } from '@tanstack/react-query';
import { meSchema, type SignInInput } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';
import { authKeys } from './get-me';

/** POST /api/auth/sign-in: sets the session cookie and answers `me`. 401 `invalid_credentials`; 429 with Retry-After. */
export const signIn = async (input: SignInInput) =>
  meSchema.parse(await api.post('/api/auth/sign-in', input));

export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (me) => {
      qc.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
      qc.setQueryData(authKeys.me(), me);
    },
  });
}
