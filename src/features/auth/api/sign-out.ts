import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { authKeys } from './get-me';

/** POST /api/auth/sign-out: ends every session of the user. */
export const signOut = async () => {
  await api.post('/api/auth/sign-out');
};

export function useSignOut() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSettled: () => {
      qc.clear();
      qc.setQueryData(authKeys.me(), null);
    },
  });
}
