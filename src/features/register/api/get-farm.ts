import { queryOptions, useQuery } from '@tanstack/react-query';
import { farmSchema } from '@shared/schemas/farm.schema';
import { api } from '@/lib/api-client';
import { farmKeys } from './keys';

/** GET /api/farms/:id: one farm, archived or not; 404 when outside the user's scope. */
export const getFarm = async (id: string) =>
  farmSchema.parse(await api.get(`/api/farms/${encodeURIComponent(id)}`));

export const farmQueryOptions = (id: string) =>
  queryOptions({ queryKey: farmKeys.detail(id), queryFn: () => getFarm(id) });

export const useFarm = (id: string) => useQuery(farmQueryOptions(id));
