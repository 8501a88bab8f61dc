import type { z } from 'zod';
import { growerSchema, type growerUpdateSchema } from '@shared/schemas/grower.schema';
import { api } from '@/lib/api-client';
import { growerKeys, useRegisterMutation } from './keys';

export type UpdateGrowerInput = z.output<typeof growerUpdateSchema>;

/** PUT /api/growers/:id with the `version` it was read at; a stale version answers 409 `conflict`. */
export const updateGrower = async ({ id, input }: { id: string; input: UpdateGrowerInput }) =>
  growerSchema.parse(await api.put(`/api/growers/${encodeURIComponent(id)}`, input));

export const useUpdateGrower = () => useRegisterMutation(updateGrower, growerKeys.detail);
