import { useState } from 'react';
import type { FieldValues, UseFormReturn } from 'react-hook-form';
import { isApiError } from '@/lib/api-client';
import { applyApiError } from '@/lib/form-errors';
import { useConflictRecovery } from './conflict-notice';

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
      if (opts.reload && isApiError(error) && error.status === 409 && error.code === 'conflict') {
        setFormError(null);
        conflict.flag();
        return;
      }
      setFormError(applyApiError(error, form.setError, fieldNames));
    },
  };
}
