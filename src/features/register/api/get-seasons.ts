import { queryOptions, useQuery } from '@tanstack/react-query';
import { seasonListSchema } from '@shared/schemas/season.schema';
import { api } from '@/lib/api-client';
import { seasonKeys, type ArchivedFilter } from './keys';

export type SeasonListParams = { archived?: ArchivedFilter; growerId?: string; fieldId?: string };

/** GET /api/seasons: the seasons the user may see. Filters: `?archived=`, `?growerId=`, `?fieldId=`. */
export const getSeasons = async (params: SeasonListParams = {}) =>
  seasonListSchema.parse(await api.get('/api/seasons', params)).items;

export const seasonsQueryOptions = (params: SeasonListParams = {}) =>
  queryOptions({ queryKey: seasonKeys.list(params), queryFn: () => getSeasons(params) });

export const useSeasons = (params: SeasonListParams = {}) => useQuery(seasonsQueryOptions(params));
