import type { z } from 'zod';
import { planterSchema, type planterInputSchema } from '@shared/schemas/planter.schema';
import { api } from '@/lib/api-client';
import { planterKeys, useRegisterMutation } from './keys';

export type CreatePlanterInput = z.output<typeof planterInputSchema>;

/** POST /api/planters: answers the new planter. */
export const createPlanter = async (input: CreatePlanterInput) =>
  planterSchema.parse(await api.post('/api/planters', input));

export const useCreatePlanter = () => useRegisterMutation(createPlanter, planterKeys.detail);
