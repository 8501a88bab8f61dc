import { queryOptions, useQuery } from '@tanstack/react-query';
import { auditSchema } from '@shared/schemas/as-applied.schema';
import { api } from '@/lib/api-client';
import { auditKeys } from './keys';

/** GET /api/logs/:id/audit: findings, statistics, charts' data, comments and sign-off (404 while reading). */
export const getAudit = async (logId: string) =>
  auditSchema.parse(await api.get(`/api/logs/${encodeURIComponent(logId)}/audit`));

export const auditQueryOptions = (logId: string) =>
  queryOptions({ queryKey: auditKeys.detail(logId), queryFn: () => getAudit(logId) });

export const useAudit = (logId: string, enabled = true) =>
  useQuery({ ...auditQueryOptions(logId), enabled: enabled && !!logId });
