import type { z } from 'zod';
import { zoneMapSchema, type zoneMapFromImportSchema } from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';
import { useZoneMapMutation } from './keys';

export type ZoneMapFromImportInput = z.input<typeof zoneMapFromImportSchema>;

/** POST /api/zone-maps/from-import: zones from chosen features of an imported file, clipped to the boundary. */
export const createZoneMapFromImport = async (input: ZoneMapFromImportInput) =>
  zoneMapSchema.parse(await api.post('/api/zone-maps/from-import', input));

export const useCreateZoneMapFromImport = () => useZoneMapMutation(createZoneMapFromImport);
