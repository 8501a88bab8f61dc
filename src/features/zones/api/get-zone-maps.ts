import { queryOptions, useQuery } from '@tanstack/react-query';
import { zoneMapListSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { zoneMapKeys } from './keys';

export type ZoneMapFilter = { fieldId?: string; seasonId?: string };

/** GET /api/zone-maps?fieldId=&seasonId=: zone maps in the user's scope, every version. */
export const getZoneMaps = async (filter: ZoneMapFilter) =>
  zoneMapListSchema.parse(await api.get('/api/zone-maps', filter)).items;

export const zoneMapsQueryOptions = (filter: ZoneMapFilter = {}) =>
  queryOptions({ queryKey: zoneMapKeys.list(filter), queryFn: () => getZoneMaps(filter) });

export const useZoneMaps = (filter: ZoneMapFilter = {}) => useQuery(zoneMapsQueryOptions(filter));
