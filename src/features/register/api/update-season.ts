import type { z } from 'zod';
import { seasonSchema, type seasonUpdateSchema } from '@shared/schemas/season.schema';
import { api } from '@/lib/api-client';
import { seasonKeys, useRegisterMutation } from './keys';

export type UpdateSeasonInput = z.output<typeof seasonUpdateSchema>;

/** PUT /api/seasons/:id with the `version` it was read at; a stale version answers 409 `conflict`. */
export const updateSeason = async ({ id, input }: { id: string; input: UpdateSeasonInput }) =>
  seasonSchema.parse(await api.put(`/api/seasons/${encodeURIComponent(id)}`, input));

export const useUpdateSeason = () => useRegisterMutation(updateSeason, seasonKeys.detail);
