import { zoneMapSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

/** DELETE /api/zone-maps/:id/zones/:zoneId?version=: what it covered becomes a gap. */
export const deleteZone = async ({
  mapId,
  zoneId,
  version,
}: {
  mapId: string;
  zoneId: string;
  version: number;
}) =>
  zoneMapSchema.parse(
    await api.delete(`/api/zone-maps/${encodeURIComponent(mapId)}/zones/${encodeURIComponent(zoneId)}`, {
      version,
    }),
  );

export const useDeleteZone = (mapId: string) => useZoneMapMutation(deleteZone, mapId);
