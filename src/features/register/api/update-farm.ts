import type { z } from 'zod';
import { farmSchema, type farmUpdateSchema } from '@shared/schemas/farm.schema';
import { api } from '@/lib/api-client';
import { farmKeys, useRegisterMutation } from './keys';

export type UpdateFarmInput = z.output<typeof farmUpdateSchema>;

/** PUT /api/farms/:id with the `version` it was read at; a stale version answers 409 `conflict`. */
export const updateFarm = async ({ id, input }: { id: string; input: UpdateFarmInput }) =>
  farmSchema.parse(await api.put(`/api/farms/${encodeURIComponent(id)}`, input));

export const useUpdateFarm = () => useRegisterMutation(updateFarm, farmKeys.detail);
