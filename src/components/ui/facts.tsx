import type { ReactNode } from 'react';

export type Fact = { label: string; value: ReactNode; numeric?: boolean };

/** Label–value pairs in a ruled box, for a record's page. */
export function Facts({ items, columns = 3 }: { items: Fact[]; columns?: 2 | 3 | 4 }) {
  const cols = { 2: 'sm:grid-cols-2', 3: 'sm:grid-cols-3', 4: 'sm:grid-cols-2 lg:grid-cols-4' }[columns];
  return (
    <dl
      className={`grid grid-cols-1 gap-px overflow-hidden rounded-card border border-ink-line bg-ink-line ${cols}`}
    >
      {items.map((f) => (
        <div key={f.label} className="bg-paper-raised px-3 py-2">
          <dt className="text-xs text-ink-soft">{f.label}</dt>
          <dd className={`mt-0.5 text-base text-ink ${f.numeric ? 'font-mono tabular-nums' : ''}`}>
            {f.value ?? '—'}
          </dd>
        </div>
      ))}
    </dl>
  );
}
