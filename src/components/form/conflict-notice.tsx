import { useState } from 'react';
import type { FieldValues, Path, PathValue, UseFormReturn } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { describeError } from '@/components/ui/query-state';

type Difference = { key: string; label: string; typed: unknown; saved: unknown };

type ConflictState =
  | { kind: 'none' }
  | { kind: 'stale' }
  | { kind: 'loading' }
  | { kind: 'failed'; message: string }
  | { kind: 'reloaded'; differences: Difference[] };

const show = (v: unknown): string => {
  if (v === null || v === undefined || v === '' || (typeof v === 'number' && Number.isNaN(v)))
    return '(empty)';
  if (Array.isArray(v)) return v.map(show).join(', ') || '(none)';
  if (typeof v === 'object')
    return Object.values(v as Record<string, unknown>)
      .map(show)
      .join(' ');
  return String(v);
};

/**
 * What to do when a save answers 409 (someone else saved the record first): say so, load the latest
 * version into the form on request, and keep what the user had typed listed beside it, field by field,
 * with a button to put each entry back.
 */
export function useConflictRecovery<T extends FieldValues, C, O>(
  form: UseFormReturn<T, C, O>,
  opts: {
    reload: () => Promise<T>;
    labels: Partial<Record<string, string>>;
    format?: (key: string, value: unknown) => string;
  },
) {
  const [state, setState] = useState<ConflictState>({ kind: 'none' });

  const reload = async () => {
    const typed = form.getValues();
    const opened = (form.formState.defaultValues ?? {}) as Record<string, unknown>;
    const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);
    setState({ kind: 'loading' });
    try {
      const fresh = await opts.reload();
      form.reset(fresh);
      // Only what the user changed since opening the form, and where the latest version says otherwise.
      const differences = Object.keys(opts.labels)
        .filter((key) => !same(typed[key], opened[key]) && !same(typed[key], fresh[key]))
        .map((key) => ({ key, label: opts.labels[key] ?? key, typed: typed[key], saved: fresh[key] }));
      setState({ kind: 'reloaded', differences });
    } catch (e) {
      setState({ kind: 'failed', message: describeError(e) });
    }
  };

  const putBack = (d: Difference) => {
    form.setValue(d.key as Path<T>, d.typed as PathValue<T, Path<T>>, {
      shouldDirty: true,
      shouldValidate: true,
    });
    setState((s) =>
      s.kind === 'reloaded'
        ? { kind: 'reloaded', differences: s.differences.filter((x) => x.key !== d.key) }
        : s,
    );
  };

  const fmt = (key: string, v: unknown) => opts.format?.(key, v) ?? show(v);

  const notice =
    state.kind === 'none' ? null : state.kind === 'reloaded' ? (
      <Notice tone="info" title="The latest version is loaded">
        {state.differences.length === 0 ? (
          <p>Your changes match it, or you had changed nothing. Check the form and save again.</p>
        ) : (
          <>
            <p>What you had typed is kept below. Put back the entries you want, then save again.</p>
            <ul className="mt-2 divide-y divide-ink-line rounded-card border border-ink-line bg-paper-raised">
              {state.differences.map((d) => (
                <li
                  key={d.key}
                  className="flex flex-wrap items-center justify-between gap-2 px-3 py-1.5 text-ink"
                >
                  <span>
                    <span className="font-medium">{d.label}</span>: you typed{' '}
                    <span className="font-mono">{fmt(d.key, d.typed)}</span>; saved now{' '}
                    <span className="font-mono">{fmt(d.key, d.saved)}</span>
                  </span>
                  <Button size="sm" onClick={() => putBack(d)}>
                    Use what I typed
                  </Button>
                </li>
              ))}
            </ul>
          </>
        )}
      </Notice>
    ) : (
      <Notice tone="caution" title="Someone else changed this record">
        <p>
          It was saved by another person after you opened it, so your changes were not saved. Load their
          version: what you typed stays listed here so you can put it back.
        </p>
        {state.kind === 'failed' ? <p className="mt-1 text-danger">{state.message}</p> : null}
        <Button
          className="mt-2"
          size="sm"
          variant="primary"
          busy={state.kind === 'loading'}
          onClick={() => void reload()}
        >
          Load the latest version
        </Button>
      </Notice>
    );

  return {
    /** Call when a save answered 409. */
    flag: () => setState({ kind: 'stale' }),
    clear: () => setState({ kind: 'none' }),
    notice,
  };
}
