import type { z } from 'zod';
import { growerSchema, type growerInputSchema } from '@shared/schemas/grower.schema';
import { api } from '@/lib/api-client';
import { growerKeys, useRegisterMutation } from './keys';

export type CreateGrowerInput = z.output<typeof growerInputSchema>;

/** POST /api/growers: answers the new grower. */
export const createGrower = async (input: CreateGrowerInput) =>
  growerSchema.parse(await api.post('/api/growers', input));

export const useCreateGrower = () => useRegisterMutation(createGrower, growerKeys.detail);
