import type { z } from 'zod';
import { zoneMapSchema, type splitZoneSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

/** POST /api/zone-maps/:id/split: one zone cut in two by a line drawn across it. */
export const splitZone = async ({
  mapId,
  input,
}: {
  mapId: string;
  input: z.input<typeof splitZoneSchema>;
}) => zoneMapSchema.parse(await api.post(`/api/zone-maps/${encodeURIComponent(mapId)}/split`, input));

export const useSplitZone = (mapId: string) => useZoneMapMutation(splitZone, mapId);
