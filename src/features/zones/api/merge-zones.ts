import type { z } from 'zod';
import { zoneMapSchema, type mergeZonesSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

/** POST /api/zone-maps/:id/merge: two zones become one (the first keeps its name and values). */
export const mergeZones = async ({
  mapId,
  input,
}: {
  mapId: string;
  input: z.input<typeof mergeZonesSchema>;
}) => zoneMapSchema.parse(await api.post(`/api/zone-maps/${encodeURIComponent(mapId)}/merge`, input));

export const useMergeZones = (mapId: string) => useZoneMapMutation(mergeZones, mapId);
