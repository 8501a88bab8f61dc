import type { z } from 'zod';
import { seasonSchema, type seasonInputSchema } from '@shared/schemas/season.schema';
import { api } from '@/lib/api-client';
import { seasonKeys, useRegisterMutation } from './keys';

export type CreateSeasonInput = z.output<typeof seasonInputSchema>;

/** POST /api/seasons: answers the new season. */
export const createSeason = async (input: CreateSeasonInput) =>
  seasonSchema.parse(await api.post('/api/seasons', input));

export const useCreateSeason = () => useRegisterMutation(createSeason, seasonKeys.detail);
