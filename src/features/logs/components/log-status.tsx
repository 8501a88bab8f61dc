import type { Log, LogStatus } from '@shared/schemas/as-applied.schema';
import { Badge, type Tone } from '@/components/ui/badge';

/** The status of a log in plain words. */
export const STATUS_WORDS: Record<LogStatus, string> = {
  queued: 'Waiting its turn',
  reading: 'Reading the file',
  cleaning: 'Cleaning the points',
  auditing: 'Comparing with the prescription',
  storing: 'Saving the points',
  ready: 'Ready',
  failed: 'Could not be read',
};

const TONES: Record<LogStatus, Tone> = {
  queued: 'neutral',
  reading: 'accent',
  cleaning: 'accent',
  auditing: 'accent',
  storing: 'accent',
  ready: 'ok',
  failed: 'danger',
};

/** The order the import goes through (server/logs/import-log.ts), and each stage's share of the bar. */
const STAGES: { status: LogStatus; share: number }[] = [
  { status: 'queued', share: 0.05 },
  { status: 'reading', share: 0.45 },
  { status: 'cleaning', share: 0.15 },
  { status: 'auditing', share: 0.15 },
  { status: 'storing', share: 0.2 },
];

/** How far the whole import is, 0–1, from the stage and the progress within it. */
export function overallProgress(log: Pick<Log, 'status' | 'progress'>): number {
  if (log.status === 'ready') return 1;
  if (log.status === 'failed') return 0;
  let done = 0;
  for (const s of STAGES) {
    if (s.status === log.status) return done + s.share * Math.max(0, Math.min(1, log.progress));
    done += s.share;
  }
  return done;
}

export function LogStatusBadge({ status }: { status: LogStatus }) {
  return <Badge tone={TONES[status]}>{STATUS_WORDS[status]}</Badge>;
}

/** A thin bar with the share done written beside it; `label` names it for assistive technology. */
export function ProgressBar({ value, label, large }: { value: number; label: string; large?: boolean }) {
  const pct = Math.round(value * 100);
  return (
    <span className="inline-flex w-full items-center gap-2">
      <span
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
        className={`relative block min-w-16 flex-1 overflow-hidden rounded-full bg-paper-sunk ring-1 ring-ink-line ${large ? 'h-2.5' : 'h-1.5'}`}
      >
        <span
          className="absolute inset-y-0 left-0 bg-clay-500 transition-[width] duration-700"
          style={{ width: `${pct}%` }}
        />
      </span>
      <span className="w-9 text-right font-mono text-xs text-ink-soft tabular-nums">{pct}%</span>
    </span>
  );
}

/** The status word, and while the log is being read, its progress bar. */
export function LogStatusCell({ log }: { log: Log }) {
  const running = log.status !== 'ready' && log.status !== 'failed';
  return (
    <span className={`flex flex-col gap-1 ${running ? 'min-w-40' : ''}`}>
      <span>
        <LogStatusBadge status={log.status} />
      </span>
      {running ? <ProgressBar value={overallProgress(log)} label={`Progress of ${log.fileName}`} /> : null}
      {log.status === 'failed' && log.error ? (
        <span className="text-xs text-danger">
          {log.error.line != null ? `Line ${log.error.line.toLocaleString('en-US')}: ` : ''}
          {log.error.message}
        </span>
      ) : null}
    </span>
  );
}
