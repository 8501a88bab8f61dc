import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { isApiError } from './api-client';

/**
 * Puts an API error on a form: each validation detail whose `path[0]` names a field of the form goes beside
 * that field (nested paths such as `holesPerDisc.1.holes` are kept); whatever is left is returned as one
 * message for the top of the form. Returns null when every detail found its field.
 */
export function applyApiError<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  fieldNames: readonly string[],
): string | null {
  if (!isApiError(error)) return error instanceof Error ? error.message : 'Something went wrong.';
  const left: string[] = [];
  let placed = 0;
  for (const d of error.details) {
    const head = d.path[0];
    if (typeof head === 'string' && fieldNames.includes(head)) {
      setError(
        d.path.join('.') as Path<T>,
        { type: 'server', message: d.message },
        { shouldFocus: placed === 0 },
      );
      placed += 1;
    } else {
      left.push(d.path.length ? `${d.path.join('.')}: ${d.message}` : d.message);
    }
  }
  if (placed > 0 && left.length === 0) return null;
  if (left.length) return `${error.message} ${left.join('; ')}`;
  return error.message;
}
