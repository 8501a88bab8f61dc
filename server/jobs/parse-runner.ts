import { Worker } from 'node:worker_threads';
import { FileReadError } from '../routes/imports/import-errors';
import { DomainError } from '../errors';
import type { ParseJob, ParseOutcome, WorkerReply } from '../routes/imports/parsers/types';

export type ParseLimits = {
  timeoutMs: number;
  maxOldGenerationSizeMb: number;
  maxYoungGenerationSizeMb: number;
};

/** A file that takes longer or needs more heap than this to read is refused (RELIABILITY.md "Uploads"). */
export const DEFAULT_PARSE_LIMITS: ParseLimits = {
  timeoutMs: 20_000,
  maxOldGenerationSizeMb: 512,
  maxYoungGenerationSizeMb: 64,
};

/** At most this many parse workers in this process (the machine has two cores); other jobs wait. */
const MAX_WORKERS = 2;
/** An idle worker is kept this long for the next job (starting one costs about a second), then ended. */
const IDLE_MS = 30_000;

type Pooled = { worker: Worker; limits: ParseLimits; idleTimer: NodeJS.Timeout | null };
const idle: Pooled[] = [];
let alive = 0;
const waiting: (() => void)[] = [];

function spawn(limits: ParseLimits): Pooled {
  const worker = new Worker(new URL('./parse-worker.mjs', import.meta.url), {
    resourceLimits: {
      maxOldGenerationSizeMb: limits.maxOldGenerationSizeMb,
      maxYoungGenerationSizeMb: limits.maxYoungGenerationSizeMb,
      stackSizeMb: 4,
    },
    stdout: false,
    stderr: false,
  });
  alive++;
  worker.once('exit', () => {
    alive--;
    const i = idle.findIndex((p) => p.worker === worker);
    if (i >= 0) idle.splice(i, 1);
    waiting.shift()?.();
  });
  return { worker, limits, idleTimer: null };
}

async function acquire(limits: ParseLimits): Promise<Pooled> {
  for (;;) {
    const i = idle.findIndex((p) => sameLimits(p.limits, limits));
    if (i >= 0) {
      const [p] = idle.splice(i, 1);
      if (p.idleTimer) clearTimeout(p.idleTimer);
      p.worker.ref();
      return p;
    }
    if (alive < MAX_WORKERS) return spawn(limits);
    // Make room: end an idle worker of other limits, or wait for one to come back.
    const other = idle.shift();
    if (other) await other.worker.terminate();
    else await new Promise<void>((resolve) => waiting.push(resolve));
  }
}

const sameLimits = (a: ParseLimits, b: ParseLimits) =>
  a.timeoutMs === b.timeoutMs &&
  a.maxOldGenerationSizeMb === b.maxOldGenerationSizeMb &&
  a.maxYoungGenerationSizeMb === b.maxYoungGenerationSizeMb;

function release(p: Pooled) {
  p.worker.unref();
  p.idleTimer = setTimeout(() => void p.worker.terminate(), IDLE_MS);
  p.idleTimer.unref();
  idle.push(p);
  waiting.shift()?.();
}

/**
 * Reads an uploaded file in a worker thread bounded in heap (resourceLimits) and time: a file that takes too
 * long has its worker terminated and is refused, one that needs too much memory likewise. Workers are kept
 * warm for the next job. The job's bytes are copied, so the caller's buffer stays usable.
 */
export async function parseInWorker(
  job: ParseJob,
  limits: ParseLimits = DEFAULT_PARSE_LIMITS,
): Promise<ParseOutcome> {
  const p = await acquire(limits);
  const { worker } = p;
  return new Promise<ParseOutcome>((resolve, reject) => {
    let settled = false;
    const finish = (ok: boolean, fn: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
      if (ok) release(p);
      else void worker.terminate();
      fn();
    };
    const timer = setTimeout(
      () =>
        finish(false, () =>
          reject(
            new FileReadError(`The file took too long to read (more than ${limits.timeoutMs / 1000} s)`),
          ),
        ),
      limits.timeoutMs,
    );
    const onMessage = (reply: WorkerReply) =>
      finish(true, () =>
        reply.ok ? resolve(reply.outcome) : reject(new DomainError(reply.code, reply.message, reply.details)),
      );
    const onError = (err: Error & { code?: string }) =>
      finish(false, () =>
        reject(
          new FileReadError(
            err.code === 'ERR_WORKER_OUT_OF_MEMORY'
              ? 'The file needs too much memory to read'
              : 'The file could not be read',
          ),
        ),
      );
    const onExit = () => finish(false, () => reject(new FileReadError('The file could not be read')));
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    const bytes = new Uint8Array(job.bytes);
    worker.postMessage({ ...job, bytes }, [bytes.buffer]);
  });
}
