import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { invalidatePeople } from './keys';

/** POST /api/users/:id/resend-invitation (admin): a fresh link; the old one stops working. */
export const resendInvitation = async (id: string) => {
  await api.post(`/api/users/${encodeURIComponent(id)}/resend-invitation`);
};

export function useResendInvitation() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: resendInvitation, onSuccess: () => invalidatePeople(qc) });
}
