import { useForm, type DefaultValues, type FieldValues, type Resolver } from 'react-hook-form';
import { useSaveErrors } from '@/components/form/use-save-errors';

/**
 * The form of one register record (new when `record` is absent), with the save-error handling every
 * record form shares: errors beside fields, and on a stale version the latest record fetched again with
 * `fetchRecord` while what was typed stays listed.
 */
export function useRecordForm<V extends FieldValues, O, R extends { id: string }>(opts: {
  record?: R;
  resolver: Resolver<V, unknown, O>;
  toValues: (record?: R) => V;
  fetchRecord: (id: string) => Promise<R>;
  labels: Record<string, string>;
  format?: (key: string, value: unknown) => string;
}) {
  const { record, toValues, fetchRecord } = opts;
  const form = useForm<V, unknown, O>({
    resolver: opts.resolver,
    defaultValues: toValues(record) as DefaultValues<V>,
  });
  const save = useSaveErrors(form, {
    labels: opts.labels,
    format: opts.format,
    reload: record ? async () => toValues(await fetchRecord(record.id)) : undefined,
  });
  return { form, save };
}
