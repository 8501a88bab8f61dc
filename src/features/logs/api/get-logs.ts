import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { logSchema } from '@shared/schemas/as-applied.schema';
import { api } from '@/lib/api-client';
import { isRunning, logKeys } from './keys';

export type LogFilter = { growerId?: string; fieldId?: string; seasonId?: string };

const logListSchema = z.object({ items: z.array(logSchema) });

/** GET /api/logs: the as-applied logs the user may see, newest first. */
export const getLogs = async (filter: LogFilter = {}) =>
  logListSchema.parse(await api.get('/api/logs', filter)).items;

export const logsQueryOptions = (filter: LogFilter = {}) =>
  queryOptions({ queryKey: logKeys.list(filter), queryFn: () => getLogs(filter) });

/** The list asks again every two seconds while any of its logs is being read. */
export const useLogs = (filter: LogFilter = {}) =>
  useQuery({
    ...logsQueryOptions(filter),
    refetchInterval: (q) => (q.state.data?.some((l) => isRunning(l.status)) ? 2000 : false),
  });
