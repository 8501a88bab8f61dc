import type { z } from 'zod';
import { planterSchema, type planterUpdateSchema } from '@shared/schemas/planter.schema';
import { api } from '@/lib/api-client';
import { planterKeys, useRegisterMutation } from './keys';

export type UpdatePlanterInput = z.output<typeof planterUpdateSchema>;

/** PUT /api/planters/:id with the `version` it was read at; a stale version answers 409 `conflict`. */
export const updatePlanter = async ({ id, input }: { id: string; input: UpdatePlanterInput }) =>
  planterSchema.parse(await api.put(`/api/planters/${encodeURIComponent(id)}`, input));

export const useUpdatePlanter = () => useRegisterMutation(updatePlanter, planterKeys.detail);
