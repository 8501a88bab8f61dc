import type { ReactNode } from 'react';
import { Brand } from './brand';

/** The frame of the pages used before signing in: a single card on paper. */
export function AuthLayout({
  title,
  intro,
  children,
}: {
  title: string;
  intro?: ReactNode;
  children: ReactNode;
}) {
  return (
    <div className="flex min-h-screen flex-col items-center justify-center px-4 py-10">
      <main className="w-full max-w-sm">
        <div className="mb-6 flex justify-center">
          <Brand />
        </div>
        <div className="rounded-card border border-ink-line bg-paper-raised px-6 py-6 shadow-card">
          <h1 className="text-xl font-semibold">{title}</h1>
          {intro ? <div className="mt-1 mb-4 text-sm text-ink-soft">{intro}</div> : <div className="mb-4" />}
          {children}
        </div>
        <p className="mt-6 text-center text-xs text-ink-faint">
          Seeding plans, checked against what the planter did.
        </p>
      </main>
    </div>
  );
}
