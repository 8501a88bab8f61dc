import { useMutation, useQueryClient } from '@tanstack/react-query';
import { meSchema } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';
import { authKeys } from './get-me';

/** POST /api/auth/accept-invitation: sets the password, signs in and answers `me`. */
export const acceptInvitation = async (input: { token: string; password: string; name?: string }) =>
  meSchema.parse(await api.post('/api/auth/accept-invitation', input));

export function useAcceptInvitation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: acceptInvitation,
    onSuccess: (me) => {
      qc.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
      qc.setQueryData(authKeys.me(), me);
    },
  });
}
