import { useMutation, useQueryClient } from '@tanstack/react-query';
import { meSchema } from '@shared/schemas/auth.schema';
import type { UnitSystem } from '@shared/units';
import { api } from '@/lib/api-client';
import { authKeys } from './get-me';

/** PUT /api/auth/preferences: the unit system every page shows. Answers `me`. */
export const updatePreferences = async (input: { unitSystem: UnitSystem }) =>
  meSchema.parse(await api.put('/api/auth/preferences', input));

export function useUpdatePreferences() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: updatePreferences,
    onSuccess: (me) => qc.setQueryData(authKeys.me(), me),
  });
}
