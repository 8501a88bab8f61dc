import type { ReactNode } from 'react';

type NoticeTone = 'info' | 'ok' | 'caution' | 'danger';

const tones: Record<NoticeTone, string> = {
  info: 'border-slate-700/25 bg-paper-raised text-ink',
  ok: 'border-ok/40 bg-ok-soft text-ink',
  caution: 'border-caution/40 bg-caution-soft text-ink',
  danger: 'border-danger/40 bg-danger-soft text-ink',
};
const marks: Record<NoticeTone, string> = {
  info: 'bg-slate-700',
  ok: 'bg-ok',
  caution: 'bg-caution',
  danger: 'bg-danger',
};

/**
 * A boxed message. Danger and caution notices are announced (`role="alert"`); the others are polite.
 */
export function Notice({
  tone = 'info',
  title,
  children,
  className = '',
}: {
  tone?: NoticeTone;
  title?: ReactNode;
  children?: ReactNode;
  className?: string;
}) {
  const urgent = tone === 'danger' || tone === 'caution';
  return (
    <div
      role={urgent ? 'alert' : 'status'}
      className={`relative overflow-hidden rounded-card border py-2.5 pr-3 pl-4 text-sm ${tones[tone]} ${className}`}
    >
      <span className={`absolute inset-y-0 left-0 w-1 ${marks[tone]}`} aria-hidden />
      {title ? <p className="font-medium">{title}</p> : null}
      {children ? <div className={title ? 'mt-0.5 text-ink-soft' : ''}>{children}</div> : null}
    </div>
  );
}
