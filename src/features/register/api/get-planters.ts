import { queryOptions, useQuery } from '@tanstack/react-query';
import { planterListSchema } from '@shared/schemas/planter.schema';
import { api } from '@/lib/api-client';
import { planterKeys, type ArchivedFilter } from './keys';

export type PlanterListParams = { archived?: ArchivedFilter; growerId?: string };

/** GET /api/planters: the planters the user may see. Filters: `?archived=`, `?growerId=`. */
export const getPlanters = async (params: PlanterListParams = {}) =>
  planterListSchema.parse(await api.get('/api/planters', params)).items;

export const plantersQueryOptions = (params: PlanterListParams = {}) =>
  queryOptions({ queryKey: planterKeys.list(params), queryFn: () => getPlanters(params) });

export const usePlanters = (params: PlanterListParams = {}) => useQuery(plantersQueryOptions(params));
