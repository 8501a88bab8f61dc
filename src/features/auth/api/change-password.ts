import { useMutation } from '@tanstack/react-query';
import type { z } from 'zod';
import type { changePasswordSchema } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';

export type ChangePasswordInput = z.output<typeof changePasswordSchema>;

/** POST /api/auth/password: ends the user's other sessions and keeps this one. */
export const changePassword = async (input: ChangePasswordInput) => {
  await api.post('/api/auth/password', input);
};

export const useChangePassword = () => useMutation({ mutationFn: changePassword });
