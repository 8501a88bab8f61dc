import { Worker } from 'node:worker_threads';
import { FileReadError } from '../routes/imports/import-errors';
import { DomainError } from '../errors';
import type { ParseJob, ParseOutcome, WorkerReply } from '../routes/imports/parsers/types';

export type ParseLimits = { timeoutMs: number; maxOldGenerationSizeMb: number; maxYoungGenerationSizeMb: number };

/** A file that takes longer or needs more heap than this to read is refused (RELIABILITY.md "Uploads"). */
export const DEFAULT_PARSE_LIMITS: ParseLimits = { timeoutMs: 20_000, maxOldGenerationSizeMb: 512, maxYoungGenerationSizeMb: 64 };

/** At most this many parse workers at once in this process (the machine has two cores); others wait. */
const MAX_WORKERS = 2;
let running = 0;
const waiting: (() => void)[] = [];

async function slot<T>(fn: () => Promise<T>): Promise<T> {
  if (running >= MAX_WORKERS) await new Promise<void>((resolve) => waiting.push(resolve));
  running++;
  try {
    return await fn();
  } finally {
    running--;
    waiting.shift()?.();
  }
}

/**
 * Reads an uploaded file in a worker thread bounded in time and heap: a file that takes too long is
 * terminated and refused, one that needs too much memory likewise. The job's bytes are copied, so the
 * caller's buffer stays usable.
 */
export function parseInWorker(job: ParseJob, limits: ParseLimits = DEFAULT_PARSE_LIMITS): Promise<ParseOutcome> {
  return slot(
    () =>
      new Promise<ParseOutcome>((resolve, reject) => {
        const worker = new Worker(new URL('./parse-worker.mjs', import.meta.url), {
          resourceLimits: {
            maxOldGenerationSizeMb: limits.maxOldGenerationSizeMb,
            maxYoungGenerationSizeMb: limits.maxYoungGenerationSizeMb,
            stackSizeMb: 4,
          },
          stdout: false,
          stderr: false,
        });
        let settled = false;
        const finish = (fn: () => void) => {
          if (settled) return;
          settled = true;
          clearTimeout(timer);
          void worker.terminate();
          fn();
        };
        const timer = setTimeout(
          () => finish(() => reject(new FileReadError(`The file took too long to read (more than ${limits.timeoutMs / 1000} s)`))),
          limits.timeoutMs,
        );
        worker.once('message', (reply: WorkerReply) =>
          finish(() => (reply.ok ? resolve(reply.outcome) : reject(new DomainError(reply.code, reply.message, reply.details)))),
        );
        worker.once('error', (err: Error & { code?: string }) =>
          finish(() =>
            reject(
              new FileReadError(
                err.code === 'ERR_WORKER_OUT_OF_MEMORY' ? 'The file needs too much memory to read' : 'The file could not be read',
              ),
            ),
          ),
        );
        worker.once('exit', () => finish(() => reject(new FileReadError('The file could not be read'))));
        const bytes = new Uint8Array(job.bytes);
        worker.postMessage({ ...job, bytes }, [bytes.buffer]);
      }),
  );
}
