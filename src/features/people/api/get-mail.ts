import { queryOptions, useQuery } from '@tanstack/react-query';
import { mailListSchema } from '@shared/schemas/user.schema';
import { api } from '@/lib/api-client';
import { mailKeys } from './keys';

/** GET /api/mail (admin): what the local mail catcher caught for people of this workspace. */
export const getMail = async () => mailListSchema.parse(await api.get('/api/mail')).items;

export const mailQueryOptions = () =>
  queryOptions({ queryKey: mailKeys.list({}), queryFn: getMail, refetchInterval: 10_000 });

export const useMail = () => useQuery(mailQueryOptions());
