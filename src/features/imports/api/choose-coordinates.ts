import { useMutation } from '@tanstack/react-query';
import { importPreviewSchema } from '@shared/schemas/import.schema';
import { api } from '@/lib/api-client';

/** POST /api/imports/:id/coordinates: the preview again, reprojected from the coordinate system chosen. */
export const chooseCoordinates = async ({ importId, code }: { importId: string; code: string }) =>
  importPreviewSchema.parse(
    await api.post(`/api/imports/${encodeURIComponent(importId)}/coordinates`, { code }),
  );

export const useChooseCoordinates = () => useMutation({ mutationFn: chooseCoordinates });
