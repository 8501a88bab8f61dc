import { useState } from 'react';
import type { FieldValues, UseFormReturn } from 'react-hook-form';
import { isApiError } from '@/lib/api-client';
import { applyApiError } from '@/lib/form-errors';
import { useConflictRecovery } from './conflict-notice';

/**
 * A save refused because the record changed since it was read: 409 without field details. DEVELOPERS.md
 * names the code `conflict`; the server sends `stale`; both are taken. A 409 with details is a refusal
 * about particular fields and goes beside them instead.
 */
export const isStaleVersion = (error: unknown) =>
  isApiError(error) &&
  error.status === 409 &&
  (error.code === 'stale' || error.code === 'conflict') &&
  error.details.length === 0;

/**
 * Everything a record form does when a save fails: a stale version (409 `conflict`) offers to load the
 * latest while keeping what was typed; validation details go beside their fields; the rest goes on top.
 * `labels` names the form's fields (their keys are the API's keys).
 */
export function useSaveErrors<T extends FieldValues, C, O>(
  form: UseFormReturn<T, C, O>,
  opts: {
    labels: Record<string, string>;
    reload?: () => Promise<T>;
    format?: (key: string, value: unknown) => string;
  },
) {
  const [formError, setFormError] = useState<string | null>(null);
  const conflict = useConflictRecovery(form, {
    reload: opts.reload ?? (() => Promise.resolve(form.getValues())),
    labels: opts.labels,
    format: opts.format,
  });
  const fieldNames = Object.keys(opts.labels);

  return {
    formError,
    conflictNotice: conflict.notice,
    /** Before a save: clear what the last attempt said. */
    begin: () => {
      setFormError(null);
      conflict.clear();
    },
    onError: (error: unknown) => {
      if (opts.reload && isStaleVersion(error)) {
        setFormError(null);
        conflict.flag();
        return;
      }
      setFormError(applyApiError(error, form.setError, fieldNames));
    },
  };
}
