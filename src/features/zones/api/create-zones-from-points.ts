import type { z } from 'zod';
import { zoneMapSchema, type zonesFromPointsSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

/** POST /api/zone-maps/from-points: the zone map the preview showed, saved as a draft with each zone's mean. */
export const createZonesFromPoints = async (input: z.input<typeof zonesFromPointsSchema>) =>
  zoneMapSchema.parse(await api.post('/api/zone-maps/from-points', input));

export const useCreateZonesFromPoints = () => useZoneMapMutation(createZonesFromPoints);
