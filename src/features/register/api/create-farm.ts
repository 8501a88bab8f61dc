import type { z } from 'zod';
import { farmSchema, type farmInputSchema } from '@shared/schemas/farm.schema';
import { api } from '@/lib/api-client';
import { farmKeys, useRegisterMutation } from './keys';

export type CreateFarmInput = z.output<typeof farmInputSchema>;

/** POST /api/farms: answers the new farm. */
export const createFarm = async (input: CreateFarmInput) =>
  farmSchema.parse(await api.post('/api/farms', input));

export const useCreateFarm = () => useRegisterMutation(createFarm, farmKeys.detail);
