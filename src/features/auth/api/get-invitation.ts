import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { authKeys } from './get-me';

/**
 * GET /api/auth/invitation/:token answers `{ email, name, workspaceName }`, or 404 when the link is
 * unknown, used or expired. (shared/schemas has no schema for this answer yet: this one mirrors the contract.)
 */
export const invitationSchema = z.object({ email: z.string(), name: z.string(), workspaceName: z.string() });
export type Invitation = z.infer<typeof invitationSchema>;

export const getInvitation = async (token: string) =>
  invitationSchema.parse(await api.get(`/api/auth/invitation/${encodeURIComponent(token)}`));

export const invitationQueryOptions = (token: string) =>
  queryOptions({ queryKey: authKeys.invitation(token), queryFn: () => getInvitation(token), staleTime: Infinity });

export const useInvitation = (token: string) => useQuery({ ...invitationQueryOptions(token), enabled: token.length > 0 });
