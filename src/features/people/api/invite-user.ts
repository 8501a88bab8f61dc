import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { userSchema, type inviteUserSchema } from '@shared/schemas/user.schema';
import { api } from '@/lib/api-client';
import { invalidatePeople } from './keys';

export type InviteUserInput = z.output<typeof inviteUserSchema>;

/** POST /api/users (admin): creates the person as invited and e-mails them a link. */
export const inviteUser = async (input: InviteUserInput) =>
  userSchema.parse(await api.post('/api/users', input));

export function useInviteUser() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: inviteUser, onSuccess: () => invalidatePeople(qc) });
}
