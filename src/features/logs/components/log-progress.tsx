import type { Log } from '@shared/schemas/as-applied.schema';
import { ButtonLink } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { formatNumber } from '@/lib/format';
import { overallProgress, ProgressBar, STATUS_WORDS } from './log-status';

/** Where to go to map the columns of a log again. */
export const fixMappingPath = (log: Log) =>
  `/logs/new?${new URLSearchParams({ prescriptionId: log.prescriptionId, planterId: log.planterId })}`;

/**
 * How far the reading of a log has come, in words and a bar. The caller keeps asking for the log; the person
 * may leave and come back (the list of logs shows the same). A failed log shows its error with the line.
 */
export function LogProgress({ log }: { log: Log }) {
  if (log.status === 'failed') {
    return (
      <Notice tone="danger" title={`${log.fileName} could not be read`}>
        <p>
          {log.error?.line != null ? (
            <span className="font-medium text-ink">Line {formatNumber(log.error.line)}: </span>
          ) : null}
          {log.error?.message ?? 'The server gave no reason.'}
        </p>
        <p className="mt-2">
          Nothing of it was kept for the audit. Check which column holds what, and its unit, then send it
          again.
        </p>
        <div className="mt-3">
          <ButtonLink size="sm" to={fixMappingPath(log)}>
            Fix the column mapping
          </ButtonLink>
        </div>
      </Notice>
    );
  }
  const value = overallProgress(log);
  return (
    <section
      aria-label="Reading the log"
      className="max-w-2xl rounded-card border border-ink-line bg-paper-raised px-4 py-3"
    >
      <p className="flex flex-wrap items-baseline justify-between gap-2">
        <span className="font-medium text-ink" role="status">
          {STATUS_WORDS[log.status]}
          {log.status === 'ready' ? '' : '…'}
        </span>
        <span className="text-sm text-ink-soft">{log.fileName}</span>
      </p>
      <div className="mt-2">
        <ProgressBar value={value} label={`Progress of ${log.fileName}`} large />
      </div>
      <p className="mt-2 text-xs text-ink-soft">
        {log.status === 'ready'
          ? `${formatNumber(log.pointsRead ?? 0)} points read, ${formatNumber(log.pointsKept ?? 0)} kept.`
          : 'A large log takes a few minutes. You may leave this page: the list of logs shows how far it is, and the audit opens here when it is done.'}
      </p>
    </section>
  );
}
