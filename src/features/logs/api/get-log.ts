import { queryOptions, useQuery } from '@tanstack/react-query';
import { logSchema } from '@shared/schemas/as-applied.schema';
import { api } from '@/lib/api-client';
import { isRunning, logKeys } from './keys';

/** GET /api/logs/:id: the log with its status and progress. */
export const getLog = async (id: string) =>
  logSchema.parse(await api.get(`/api/logs/${encodeURIComponent(id)}`));

export const logQueryOptions = (id: string) =>
  queryOptions({ queryKey: logKeys.detail(id), queryFn: () => getLog(id) });

/** The log, asked for every second while it is being read (queued, reading, cleaning, auditing, storing). */
export const useLog = (id: string) =>
  useQuery({
    ...logQueryOptions(id),
    enabled: !!id,
    refetchInterval: (q) => (q.state.data && isRunning(q.state.data.status) ? 1000 : false),
  });
