import type { z } from 'zod';
import { zoneMapSchema, type addZoneSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

/** POST /api/zone-maps/:id/zones: a drawn zone, clipped to the boundary. */
export const addZone = async ({ mapId, input }: { mapId: string; input: z.input<typeof addZoneSchema> }) =>
  zoneMapSchema.parse(await api.post(`/api/zone-maps/${encodeURIComponent(mapId)}/zones`, input));

export const useAddZone = (mapId: string) => useZoneMapMutation(addZone, mapId);
