import type { ReactNode } from 'react';
import { Button, ButtonLink } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';

/** Save and cancel under a form, and the form-level error when the server refused it as a whole. */
export function FormActions({
  submitLabel,
  busy,
  cancelTo,
  error,
  extra,
}: {
  submitLabel: string;
  busy: boolean;
  cancelTo?: string;
  error?: string | null;
  extra?: ReactNode;
}) {
  return (
    <div className="space-y-3 border-t border-ink-line pt-4">
      {error ? (
        <Notice tone="danger" title="Not saved">
          {error}
        </Notice>
      ) : null}
      <div className="flex flex-wrap items-center gap-2">
        <Button type="submit" variant="primary" busy={busy}>
          {submitLabel}
        </Button>
        {cancelTo ? <ButtonLink to={cancelTo}>Cancel</ButtonLink> : null}
        {extra}
      </div>
    </div>
  );
}

/** A titled group of inputs inside a form. */
export function FormSection({
  title,
  description,
  children,
}: {
  title: string;
  description?: ReactNode;
  children: ReactNode;
}) {
  return (
    <fieldset className="space-y-3 rounded-card border border-ink-line bg-paper-raised px-4 pt-2 pb-4">
      <legend className="px-1 text-sm font-semibold text-ink">{title}</legend>
      {description ? <p className="-mt-1 text-sm text-ink-soft">{description}</p> : null}
      {children}
    </fieldset>
  );
}
