import { useMutation } from '@tanstack/react-query';
import { importPreviewSchema, type ImportPurpose } from '@shared/schemas/import.schema';
import { api } from '@/lib/api-client';

export type CreateImportInput = { file: File; purpose: ImportPurpose; fieldId: string };

/**
 * POST /api/imports (multipart): the server keeps the file as sent, reads it off the request thread and
 * answers what it found (features with area and validity, or points with their numeric properties).
 */
export const createImport = async ({ file, purpose, fieldId }: CreateImportInput) => {
  const form = new FormData();
  form.set('purpose', purpose);
  form.set('fieldId', fieldId);
  form.set('file', file, file.name);
  return importPreviewSchema.parse(await api.upload('/api/imports', form));
};

export const useCreateImport = () => useMutation({ mutationFn: createImport });
