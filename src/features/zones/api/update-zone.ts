import type { z } from 'zod';
import { zoneMapSchema, type updateZoneSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

/** PUT /api/zone-maps/:id/zones/:zoneId: name, class, productivity index, and optionally a new outline. */
export const updateZone = async ({
  mapId,
  zoneId,
  input,
}: {
  mapId: string;
  zoneId: string;
  input: z.input<typeof updateZoneSchema>;
}) =>
  zoneMapSchema.parse(
    await api.put(`/api/zone-maps/${encodeURIComponent(mapId)}/zones/${encodeURIComponent(zoneId)}`, input),
  );

export const useUpdateZone = (mapId: string) => useZoneMapMutation(updateZone, mapId);
