import { useState } from 'react';
import type { Audit } from '@shared/schemas/as-applied.schema';
import { ROLE_LABELS, type Role } from '@shared/schemas/auth.schema';
import { ProblemList } from '@/components/form/problem-list';
import { Button } from '@/components/ui/button';
import { FormField } from '@/components/ui/form-field';
import { Textarea } from '@/components/ui/input';
import { isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { useAddComment } from '../api/audit-actions';

const roleWord = (role: string) => ROLE_LABELS[role as Role] ?? role;

/** The audit's comments, oldest first, and a box to add one: open to everyone who may read the audit. */
export function CommentsPanel({ audit }: { audit: Audit }) {
  const [body, setBody] = useState('');
  const add = useAddComment(audit.logId);
  const fieldError =
    isApiError(add.error) && add.error.details.some((d) => d.path[0] === 'body')
      ? add.error.details.find((d) => d.path[0] === 'body')?.message
      : undefined;
  return (
    <div className="space-y-4">
      {audit.comments.length ? (
        <ol aria-label="Comments" className="space-y-3">
          {audit.comments.map((c) => (
            <li key={c.id} className="rounded-card border border-ink-line bg-paper-raised px-3 py-2">
              <p className="text-xs text-ink-soft">
                <span className="font-medium text-ink">{c.author.name}</span>, {roleWord(c.author.role)} ·{' '}
                {formatDateTime(c.createdAt)}
              </p>
              <p className="mt-1 whitespace-pre-line text-ink">{c.body}</p>
            </li>
          ))}
        </ol>
      ) : (
        <p className="text-sm text-ink-soft">No comments yet.</p>
      )}
      <form
        className="max-w-2xl space-y-2 print:hidden"
        onSubmit={(e) => {
          e.preventDefault();
          if (!body.trim()) return;
          add.mutate({ logId: audit.logId, body: body.trim() }, { onSuccess: () => setBody('') });
        }}
      >
        <FormField label="Your comment" error={fieldError}>
          <Textarea value={body} maxLength={4000} onChange={(e) => setBody(e.target.value)} />
        </FormField>
        {add.isError && !fieldError ? (
          <div role="alert" className="text-sm text-danger">
            <ProblemList error={add.error} />
          </div>
        ) : null}
        <Button type="submit" busy={add.isPending} disabled={!body.trim()}>
          Add the comment
        </Button>
      </form>
    </div>
  );
}
