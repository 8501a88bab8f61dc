import type { z } from 'zod';
import { zoneMapSchema, type resolveOverlapSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

/** POST /api/zone-maps/:id/resolve-overlap: the overlap of two zones stays with the one chosen. */
export const resolveOverlap = async ({
  mapId,
  input,
}: {
  mapId: string;
  input: z.input<typeof resolveOverlapSchema>;
}) =>
  zoneMapSchema.parse(await api.post(`/api/zone-maps/${encodeURIComponent(mapId)}/resolve-overlap`, input));

export const useResolveOverlap = (mapId: string) => useZoneMapMutation(resolveOverlap, mapId);
