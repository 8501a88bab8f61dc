import { Worker } from 'node:worker_threads';
import {
  LogParseError,
  type CsvRangeJob,
  type CsvRangeResult,
  type CsvSourceRangeJob,
} from '../../shared/audit/csv-log';

type Reply = {
  id: number;
  ok: boolean;
  result?: CsvRangeResult;
  error?: { line: number | null; column: string | null; detail: string };
};

/**
 * The second thread that reads half of a large CSV log (shared/audit/csv-log.ts parseLogCsvParallel): one
 * per thread that asks, started once (`startParseHelper`, ahead of the first log) and kept, unreferenced, so
 * it never holds a process open. Ranges go one at a time; the bytes and columns are shared memory, so a
 * message carries no data. A helper that dies is started again on the next request.
 */
let helper: { worker: Worker; dead: boolean; waiting: Map<number, (r: Reply) => void> } | null = null;
let nextId = 1;

export function startParseHelper() {
  if (helper && !helper.dead) return helper;
  const worker = new Worker(new URL('./parse-helper.worker.mjs', import.meta.url), {
    resourceLimits: { maxOldGenerationSizeMb: 256, maxYoungGenerationSizeMb: 32, stackSizeMb: 4 },
  });
  worker.unref();
  const h = { worker, dead: false, waiting: new Map<number, (r: Reply) => void>() };
  const fail = (detail: string) => {
    h.dead = true;
    for (const [id, settle] of h.waiting)
      settle({ id, ok: false, error: { line: null, column: null, detail } });
    h.waiting.clear();
  };
  worker.on('message', (r: Reply) => {
    h.waiting.get(r.id)?.(r);
    h.waiting.delete(r.id);
  });
  worker.on('error', (err) => fail(err.message));
  worker.on('exit', () => fail('the parsing thread stopped'));
  helper = h;
  return h;
}

/** Reads a range in the helper thread; rejects with LogParseError for the file, Error for the thread. */
export function parseRangeInHelper(job: CsvRangeJob | CsvSourceRangeJob): Promise<CsvRangeResult> {
  const h = startParseHelper();
  const id = nextId++;
  return new Promise((resolve, reject) => {
    h.waiting.set(id, (r) => {
      if (r.ok && r.result) resolve(r.result);
      else if (r.error?.line != null) reject(new LogParseError(r.error.line, r.error.column, r.error.detail));
      else reject(new Error(r.error?.detail ?? 'the parsing thread failed'));
    });
    h.worker.ref();
    h.worker.postMessage({ ...job, id });
  }).finally(() => {
    if (h.waiting.size === 0) h.worker.unref();
  }) as Promise<CsvRangeResult>;
}

export async function stopParseHelper() {
  const h = helper;
  helper = null;
  if (h && !h.dead) await h.worker.terminate();
}
