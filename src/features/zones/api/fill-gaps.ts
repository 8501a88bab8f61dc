import { zoneMapSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

/** POST /api/zone-maps/:id/fill-gaps: what no zone covers inside the boundary becomes the default zone. */
export const fillGaps = async ({ mapId, version }: { mapId: string; version: number }) =>
  zoneMapSchema.parse(await api.post(`/api/zone-maps/${encodeURIComponent(mapId)}/fill-gaps`, { version }));

export const useFillGaps = (mapId: string) => useZoneMapMutation(fillGaps, mapId);
