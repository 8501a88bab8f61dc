import { parentPort } from 'node:worker_threads';
import {
  LogParseError,
  parseLogCsvRange,
  parseLogCsvSourceRange,
  type CsvRangeJob,
  type CsvSourceRangeJob,
} from '../../shared/audit/csv-log';
import { openFileSource } from './file-source';
import { collectGarbage } from './collect-garbage';

/** The second parsing thread: reads the ranges it is sent (of bytes in shared memory, or of a file) into the shared columns, one at a time. */
/** A range of a file read a piece at a time, from its own handle on the file. */
function readFileRange(job: CsvSourceRangeJob) {
  const src = openFileSource(job.file);
  try {
    return parseLogCsvSourceRange(job, src);
  } finally {
    src.close();
  }
}

parentPort!.on('message', (job: (CsvRangeJob | CsvSourceRangeJob) & { id: number }) => {
  try {
    const result = 'file' in job ? readFileRange(job) : parseLogCsvRange(job);
    parentPort!.postMessage({ id: job.id, ok: true, result });
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
