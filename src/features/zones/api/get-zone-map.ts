import { queryOptions, useQuery } from '@tanstack/react-query';
import { zoneMapSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { zoneMapKeys } from './keys';

/** GET /api/zone-maps/:id: the zone map with its zones, the field's boundary and the overlap and gap analysis. */
export const getZoneMap = async (id: string) =>
  zoneMapSchema.parse(await api.get(`/api/zone-maps/${encodeURIComponent(id)}`));

export const zoneMapQueryOptions = (id: string) =>
  queryOptions({ queryKey: zoneMapKeys.detail(id), queryFn: () => getZoneMap(id) });

export const useZoneMap = (id: string) => useQuery(zoneMapQueryOptions(id));
