import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

/** POST /api/auth/reset: sets a new password from an e-mailed link. 204. */
export const resetPassword = async (input: { token: string; password: string }) => {
  await api.post('/api/auth/reset', input);
};

export const useResetPassword = () => useMutation({ mutationFn: resetPassword });
