import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { logSchema, type createLogSchema } from '@shared/schemas/as-applied.schema';
import { api } from '@/lib/api-client';
import { logKeys } from './keys';

export type CreateLogInput = z.input<typeof createLogSchema>;

/** POST /api/logs: a queued log from the kept file and its column mapping (the same file again: that log). */
export const createLog = async (input: CreateLogInput) => logSchema.parse(await api.post('/api/logs', input));

export function useCreateLog() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createLog,
    onSuccess: async (log) => {
      qc.setQueryData(logKeys.detail(log.id), log);
      await qc.invalidateQueries({ queryKey: logKeys.lists() });
    },
  });
}
