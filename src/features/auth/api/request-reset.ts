import { useMutation } from '@tanstack/react-query';
import { api } from '@/lib/api-client';

/** POST /api/auth/reset-request: always 202; a link goes out only when the account exists. */
export const requestReset = async (input: { email: string }) => {
  await api.post('/api/auth/reset-request', input);
};

export const useRequestReset = () => useMutation({ mutationFn: requestReset });
