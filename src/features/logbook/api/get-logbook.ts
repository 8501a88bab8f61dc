import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { idSchema } from '@shared/schemas/common.schema';
import { api } from '@/lib/api-client';
import { resourceKeys } from '@/lib/query-keys';

/** The planters' keys (the same the register uses). */
const planterKeys = resourceKeys('planters');

/** Lifetime sums: planted area m², quantity (seeds), distance m, hours. */
const sumsSchema = z.object({
  areaM2: z.number(),
  quantity: z.number(),
  distanceM: z.number(),
  hours: z.number(),
});

export const LOGBOOK_ENTRY_KINDS = ['log', 'rerun', 'deleted'] as const;

/** GET /api/planters/:id/logbook (server/routes/planters/logbook.ts): a ledger the server sums from the logs. */
export const logbookSchema = z.object({
  planterId: idSchema,
  planterName: z.string(),
  total: sumsSchema,
  seasons: z.array(sumsSchema.extend({ year: z.number().int() })),
  entries: z.array(
    sumsSchema.extend({
      id: z.string(),
      seasonId: idSchema,
      year: z.number().int(),
      crop: z.string(),
      logId: idSchema,
      kind: z.enum(LOGBOOK_ENTRY_KINDS),
      note: z.string(),
      createdAt: z.string(),
    }),
  ),
});
export type Logbook = z.infer<typeof logbookSchema>;
export type LogbookEntry = Logbook['entries'][number];

export const getLogbook = async (planterId: string) =>
  logbookSchema.parse(await api.get(`/api/planters/${encodeURIComponent(planterId)}/logbook`));

/** Under the planter's own key, so whatever refreshes the planter refreshes its logbook too. */
export const logbookQueryOptions = (planterId: string) =>
  queryOptions({
    queryKey: [...planterKeys.detail(planterId), 'logbook'] as const,
    queryFn: () => getLogbook(planterId),
  });

export const useLogbook = (planterId: string) => useQuery(logbookQueryOptions(planterId));
