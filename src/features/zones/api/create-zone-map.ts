import type { z } from 'zod';
import { zoneMapSchema, type createZoneMapSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

/** POST /api/zone-maps: a new zone map with one default zone covering the boundary. */
export const createZoneMap = async (input: z.input<typeof createZoneMapSchema>) =>
  zoneMapSchema.parse(await api.post('/api/zone-maps', input));

export const useCreateZoneMap = () => useZoneMapMutation(createZoneMap);
