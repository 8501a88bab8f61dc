import { queryOptions, useQuery } from '@tanstack/react-query';
import { planterSchema } from '@shared/schemas/planter.schema';
import { api } from '@/lib/api-client';
import { planterKeys } from './keys';

/** GET /api/planters/:id: one planter, archived or not; 404 when outside the user's scope. */
export const getPlanter = async (id: string) =>
  planterSchema.parse(await api.get(`/api/planters/${encodeURIComponent(id)}`));

export const planterQueryOptions = (id: string) =>
  queryOptions({ queryKey: planterKeys.detail(id), queryFn: () => getPlanter(id) });

export const usePlanter = (id: string) => useQuery(planterQueryOptions(id));
