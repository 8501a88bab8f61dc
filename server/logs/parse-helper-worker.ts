import { parentPort } from 'node:worker_threads';
import { LogParseError, parseLogCsvRange, type CsvRangeJob } from '../../shared/audit/csv-log';
import { collectGarbage } from './collect-garbage';

/** The second parsing thread: reads the ranges it is sent into the shared columns, one at a time. */
parentPort!.on('message', (job: CsvRangeJob & { id: number }) => {
  try {
    parentPort!.postMessage({ id: job.id, ok: true, result: parseLogCsvRange(job) });
  } catch (err) {
    const e = err as Error;
    parentPort!.postMessage({
      id: job.id,
      ok: false,
      error:
        err instanceof LogParseError
          ? { line: err.line, column: err.column, detail: err.detail }
          : { line: null, column: null, detail: e.message },
    });
  }
  // Let go of the job's shared bytes and columns now, not at the next job (collect-garbage.ts).
  setImmediate(collectGarbage);
});
