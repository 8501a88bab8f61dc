import { useMutation } from '@tanstack/react-query';
import type { z } from 'zod';
import {
  zonesFromPointsPreviewSchema,
  type zonesFromPointsPreviewRequestSchema,
} from '@shared/schemas/zone-map.schema';
import { api } from '@/lib/api-client';

export type ZonesFromPointsChoices = z.input<typeof zonesFromPointsPreviewRequestSchema>;

/** POST /api/zone-maps/from-points/preview: the classing (breaks, histogram) and the zones it gives; nothing saved. */
export const previewZonesFromPoints = async (input: ZonesFromPointsChoices) =>
  zonesFromPointsPreviewSchema.parse(await api.post('/api/zone-maps/from-points/preview', input));

export const usePreviewZonesFromPoints = () => useMutation({ mutationFn: previewZonesFromPoints });
