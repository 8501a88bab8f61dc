import type { ReactNode } from 'react';

export type Tone = 'neutral' | 'ok' | 'caution' | 'danger' | 'accent';

const tones: Record<Tone, string> = {
  neutral: 'bg-paper-sunk text-ink-soft border-ink-line',
  ok: 'bg-ok-soft text-ok border-ok/30',
  caution: 'bg-caution-soft text-caution border-caution/30',
  danger: 'bg-danger-soft text-danger border-danger/30',
  accent: 'bg-clay-50 text-clay-700 border-clay-300',
};

/** A short state word in a small box. The word carries the meaning; the colour only repeats it. */
export function Badge({ tone = 'neutral', children }: { tone?: Tone; children: ReactNode }) {
  return (
    <span
      className={`inline-flex items-center rounded-sm border px-1.5 py-px text-xs font-medium ${tones[tone]}`}
    >
      {children}
    </span>
  );
}
