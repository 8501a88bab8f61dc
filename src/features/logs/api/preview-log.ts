import { useMutation } from '@tanstack/react-query';
import { logPreviewSchema } from '@shared/schemas/as-applied.schema';
import { api } from '@/lib/api-client';

export type PreviewLogInput = { file: File; prescriptionId: string; planterId: string };

/**
 * POST /api/logs/preview (multipart): the server keeps the file and answers its columns, a few rows, the
 * mapping it suggests from the header and the one last used with this planter.
 */
export const previewLog = async ({ file, prescriptionId, planterId }: PreviewLogInput) => {
  const form = new FormData();
  form.set('prescriptionId', prescriptionId);
  if (planterId) form.set('planterId', planterId);
  form.set('file', file, file.name);
  return logPreviewSchema.parse(await api.upload('/api/logs/preview', form));
};

export const usePreviewLog = () => useMutation({ mutationFn: previewLog });
