import { zoneMapSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

/** POST /api/zone-maps/:id/new-version: a copy with the next version number for the same field and season. */
export const newZoneMapVersion = async ({ id, name }: { id: string; name?: string }) =>
  zoneMapSchema.parse(
    await api.post(`/api/zone-maps/${encodeURIComponent(id)}/new-version`, name ? { name } : {}),
  );

export const useNewZoneMapVersion = () => useZoneMapMutation(newZoneMapVersion);
