import { queryOptions, useQuery } from '@tanstack/react-query';
import { growerListSchema } from '@shared/schemas/grower.schema';
import { api } from '@/lib/api-client';
import { growerKeys, type ArchivedFilter } from './keys';

export type GrowerListParams = { archived?: ArchivedFilter };

/** GET /api/growers: the growers the user may see. Filters: `?archived=`. */
export const getGrowers = async (params: GrowerListParams = {}) =>
  growerListSchema.parse(await api.get('/api/growers', params)).items;

export const growersQueryOptions = (params: GrowerListParams = {}) =>
  queryOptions({ queryKey: growerKeys.list(params), queryFn: () => getGrowers(params) });

export const useGrowers = (params: GrowerListParams = {}) => useQuery(growersQueryOptions(params));
