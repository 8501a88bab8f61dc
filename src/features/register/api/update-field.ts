import type { z } from 'zod';
import { fieldSchema, type fieldUpdateSchema } from '@shared/schemas/field.schema';
import { api } from '@/lib/api-client';
import { fieldKeys, useRegisterMutation } from './keys';

export type UpdateFieldInput = z.output<typeof fieldUpdateSchema>;

/** PUT /api/fields/:id with the `version` it was read at; a stale version answers 409 `conflict`. */
export const updateField = async ({ id, input }: { id: string; input: UpdateFieldInput }) =>
  fieldSchema.parse(await api.put(`/api/fields/${encodeURIComponent(id)}`, input));

export const useUpdateField = () => useRegisterMutation(updateField, fieldKeys.detail);
