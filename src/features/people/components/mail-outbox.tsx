import { useState } from 'react';
import type { MailMessage } from '@shared/schemas/user.schema';
import { EmptyState } from '@/components/ui/empty-state';
import { formatDateTime } from '@/lib/format';

const URL_PATTERN = /(https?:\/\/[^\s<>"')]+)/g;

/** Plain text with every web address made a link. */
function LinkedText({ text }: { text: string }) {
  const parts = text.split(URL_PATTERN);
  return (
    <pre className="font-sans text-sm leading-relaxed break-words whitespace-pre-wrap text-ink">
      {parts.map((part, i) =>
        i % 2 === 1 ? (
          <a
            key={i}
            href={part}
            className="break-all text-clay-700 underline underline-offset-2 hover:text-clay-600"
          >
            {part}
          </a>
        ) : (
          part
        ),
      )}
    </pre>
  );
}

/** Caught messages on the left, the chosen one's text on the right. */
export function MailOutbox({ messages }: { messages: MailMessage[] }) {
  const [chosenId, setChosenId] = useState<string | null>(null);
  if (messages.length === 0) {
    return (
      <EmptyState title="No messages yet">
        Invitations and password links sent from this workspace appear here.
      </EmptyState>
    );
  }
  const sorted = [...messages].sort((a, b) => b.receivedAt.localeCompare(a.receivedAt));
  const chosen = sorted.find((m) => m.id === chosenId) ?? sorted[0];
  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(0,22rem)_1fr]">
      <ul
        aria-label="Messages"
        className="self-start divide-y divide-ink-line overflow-hidden rounded-card border border-ink-line bg-paper-raised"
      >
        {sorted.map((m) => {
          const active = m.id === chosen.id;
          return (
            <li key={m.id}>
              <button
                type="button"
                onClick={() => setChosenId(m.id)}
                aria-current={active || undefined}
                className={`block w-full cursor-pointer px-3 py-2 text-left ${active ? 'bg-clay-50 shadow-[inset_3px_0_0_var(--color-clay-600,#9e4624)]' : 'hover:bg-paper'}`}
              >
                <span className="block truncate text-sm font-medium text-ink">{m.subject}</span>
                <span className="flex justify-between gap-2 text-xs text-ink-soft">
                  <span className="truncate">To {m.to.join(', ')}</span>
                  <span className="shrink-0 font-mono">{formatDateTime(m.receivedAt)}</span>
                </span>
              </button>
            </li>
          );
        })}
      </ul>
      <article aria-label="Message" className="rounded-card border border-ink-line bg-paper-raised">
        <header className="border-b border-ink-line px-4 py-3">
          <h2 className="text-lg font-semibold">{chosen.subject}</h2>
          <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 text-sm">
            <dt className="text-ink-soft">From</dt>
            <dd className="break-all">{chosen.from}</dd>
            <dt className="text-ink-soft">To</dt>
            <dd className="break-all">{chosen.to.join(', ')}</dd>
            <dt className="text-ink-soft">Caught</dt>
            <dd className="font-mono">{formatDateTime(chosen.receivedAt)}</dd>
          </dl>
        </header>
        <div className="px-4 py-3">
          <LinkedText text={chosen.text} />
        </div>
      </article>
    </div>
  );
}
