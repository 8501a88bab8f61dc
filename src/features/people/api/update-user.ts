import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { userSchema, type updateUserSchema } from '@shared/schemas/user.schema';
import { api } from '@/lib/api-client';
import { invalidatePeople } from './keys';

export type UpdateUserInput = z.output<typeof updateUserSchema>;

/** PUT /api/users/:id (admin): name, role, status and growers, with the `version` read; 409 when stale. */
export const updateUser = async ({ id, input }: { id: string; input: UpdateUserInput }) =>
  userSchema.parse(await api.put(`/api/users/${encodeURIComponent(id)}`, input));

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: updateUser, onSuccess: () => invalidatePeople(qc) });
}
