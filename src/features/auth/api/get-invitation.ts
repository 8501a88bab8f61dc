import { queryOptions, useQuery } from '@tanstack/react-query';
import { invitationSchema } from '@shared/schemas/auth.schema';
import { api } from '@/lib/api-client';
import { authKeys } from './get-me';

/** GET /api/auth/invitation/:token: who is invited where, or 404 when the link is unknown, used or expired. */
export { invitationSchema, type Invitation } from '@shared/schemas/auth.schema';

export const getInvitation = async (token: string) =>
  invitationSchema.parse(await api.get(`/api/auth/invitation/${encodeURIComponent(token)}`));

export const invitationQueryOptions = (token: string) =>
  queryOptions({
    queryKey: authKeys.invitation(token),
    queryFn: () => getInvitation(token),
    staleTime: Infinity,
  });

export const useInvitation = (token: string) =>
  useQuery({ ...invitationQueryOptions(token), enabled: token.length > 0 });
