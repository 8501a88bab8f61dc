import type { z } from 'zod';
import { fieldSchema, type fieldInputSchema } from '@shared/schemas/field.schema';
import { api } from '@/lib/api-client';
import { fieldKeys, useRegisterMutation } from './keys';

export type CreateFieldInput = z.output<typeof fieldInputSchema>;

/** POST /api/fields: answers the new field. */
export const createField = async (input: CreateFieldInput) =>
  fieldSchema.parse(await api.post('/api/fields', input));

export const useCreateField = () => useRegisterMutation(createField, fieldKeys.detail);
