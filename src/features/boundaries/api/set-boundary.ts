import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { fieldSchema } from '@shared/schemas/field.schema';
import type { setBoundarySchema } from '@shared/schemas/import.schema';
import { api } from '@/lib/api-client';
import { resourceKeys } from '@/lib/query-keys';

export type SetBoundaryInput = z.input<typeof setBoundarySchema>;

const fieldKeys = resourceKeys('fields');

/**
 * PUT /api/fields/:id/boundary, from chosen features of an import or from a drawn geometry, with the
 * field's `version`. An invalid outline without `repair: true` answers 422 `invalid_geometry` naming the
 * reason and the place; a stale version answers 409.
 */
export const setBoundary = async ({ fieldId, input }: { fieldId: string; input: SetBoundaryInput }) =>
  fieldSchema.parse(await api.put(`/api/fields/${encodeURIComponent(fieldId)}/boundary`, input));

export function useSetBoundary() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: setBoundary,
    onSuccess: async (field) => {
      qc.setQueryData(fieldKeys.detail(field.id), field);
      // Register lists carry the field's area (farms and growers sum it); zone maps carry its boundary.
      await Promise.all(
        ['fields', 'farms', 'growers', 'zone-maps'].map((k) => qc.invalidateQueries({ queryKey: [k] })),
      );
    },
  });
}
