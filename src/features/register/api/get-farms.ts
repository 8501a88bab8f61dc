import { queryOptions, useQuery } from '@tanstack/react-query';
import { farmListSchema } from '@shared/schemas/farm.schema';
import { api } from '@/lib/api-client';
import { farmKeys, type ArchivedFilter } from './keys';

export type FarmListParams = { archived?: ArchivedFilter; growerId?: string };

/** GET /api/farms: the farms the user may see. Filters: `?archived=`, `?growerId=`. */
export const getFarms = async (params: FarmListParams = {}) =>
  farmListSchema.parse(await api.get('/api/farms', params)).items;

export const farmsQueryOptions = (params: FarmListParams = {}) =>
  queryOptions({ queryKey: farmKeys.list(params), queryFn: () => getFarms(params) });

export const useFarms = (params: FarmListParams = {}, enabled = true) =>
  useQuery({ ...farmsQueryOptions(params), enabled });
