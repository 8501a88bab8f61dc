import { useMutation, useQueryClient } from '@tanstack/react-query';
import { auditSchema, logSchema, type CleaningSettings } from '@shared/schemas/as-applied.schema';
import { api } from '@/lib/api-client';
import { auditKeys, logKeys, useAuditMutation } from './keys';

const path = (logId: string, action: string) => `/api/logs/${encodeURIComponent(logId)}${action}`;

/** POST /api/logs/:id/audit/comments: anyone who may read the audit. */
export const addComment = async ({ logId, body }: { logId: string; body: string }) =>
  auditSchema.parse(await api.post(path(logId, '/audit/comments'), { body }));
export const useAddComment = (logId: string) => useAuditMutation(logId, addComment);

/** POST /api/logs/:id/audit/sign-off: the consultant (or an admin) freezes the audit. */
export const signOffAudit = async ({ logId, version }: { logId: string; version: number }) =>
  auditSchema.parse(await api.post(path(logId, '/audit/sign-off'), { version }));
export const useSignOffAudit = (logId: string) => useAuditMutation(logId, signOffAudit);

export type RecleanInput = {
  logId: string;
  version: number;
  cleaning: CleaningSettings;
  bandFraction: number;
};

/** POST /api/logs/:id/clean: the import runs again with these settings; answers the queued log. */
export const recleanLog = async ({ logId, ...body }: RecleanInput) =>
  logSchema.parse(await api.post(path(logId, '/clean'), body));

export function useRecleanLog(logId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: recleanLog,
    onSuccess: async (log) => {
      // The audit is worked out anew: nothing of the old one is kept to show meanwhile.
      qc.removeQueries({ queryKey: auditKeys.detail(logId) });
      qc.setQueryData(logKeys.detail(logId), log);
      await qc.invalidateQueries({ queryKey: logKeys.lists() });
    },
  });
}
