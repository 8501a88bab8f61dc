import { queryOptions, useQuery } from '@tanstack/react-query';
import { growerSchema } from '@shared/schemas/grower.schema';
import { api } from '@/lib/api-client';
import { growerKeys } from './keys';

/** GET /api/growers/:id: one grower, archived or not; 404 when outside the user's scope. */
export const getGrower = async (id: string) =>
  growerSchema.parse(await api.get(`/api/growers/${encodeURIComponent(id)}`));

export const growerQueryOptions = (id: string) =>
  queryOptions({ queryKey: growerKeys.detail(id), queryFn: () => getGrower(id) });

export const useGrower = (id: string) => useQuery(growerQueryOptions(id));
