import { queryOptions, useQuery } from '@tanstack/react-query';
import { userListSchema } from '@shared/schemas/user.schema';
import { api } from '@/lib/api-client';
import { userKeys } from './keys';

/** GET /api/users (admin): everyone in the workspace, invited, active or disabled. */
export const getUsers = async () => userListSchema.parse(await api.get('/api/users')).items;

export const usersQueryOptions = () => queryOptions({ queryKey: userKeys.list({}), queryFn: getUsers });

export const useUsers = () => useQuery(usersQueryOptions());
