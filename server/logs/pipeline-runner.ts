import { Worker } from 'node:worker_threads';
import { DomainError } from '../errors';
import type { PipelineInput, PipelineOutput, PipelineStage, StoredPoints } from './pipeline';

/** A log that needs longer than this to read, clean and audit is stopped (5 M points take well under it). */
const TIMEOUT_MS = 10 * 60_000;

export type WorkerMessage =
  | { type: 'warm' }
  | { type: 'progress'; stage: PipelineStage; fraction: number }
  | { type: 'points'; points: StoredPoints }
  | { type: 'done'; output: PipelineOutput }
  | {
      type: 'error';
      error: { name: string; message: string; code?: string; line?: number; column?: string | null };
    };

/** A failure of reading a log, with the line that broke when there is one. */
export class LogReadError extends DomainError {
  constructor(
    message: string,
    readonly line: number | null,
  ) {
    super('unreadable_file', message);
  }
}

const newWorker = () => {
  const worker = new Worker(new URL('./pipeline.worker.mjs', import.meta.url), {
    resourceLimits: { maxOldGenerationSizeMb: 2048, maxYoungGenerationSizeMb: 64, stackSizeMb: 4 },
  });
  worker.unref();
  return worker;
};

type Kept = { worker: Worker; busy: boolean; dead: boolean; warm: boolean };

/**
 * The pipeline worker is started ahead (`warmPipelineWorker`) and kept for the next log, so an import does
 * not wait for a thread to start and load the code, and finds its code compiled and its memory already
 * mapped (on these machines the first touch of fresh memory costs about 3 ms a megabyte). A worker that
 * failed, timed out or died is dropped and the next log gets a new one; a second log while one is read gets
 * a worker of its own for that run.
 */
let kept: Kept | null = null;

const keep = (): Kept => {
  const entry: Kept = { worker: newWorker(), busy: false, dead: false, warm: false };
  const onWarm = (m: WorkerMessage) => {
    if (m.type !== 'warm') return;
    entry.warm = true;
    entry.worker.off('message', onWarm);
  };
  entry.worker.on('message', onWarm);
  entry.worker.on('error', () => {
    entry.dead = true;
  });
  entry.worker.once('exit', () => {
    entry.dead = true;
  });
  return entry;
};

export function warmPipelineWorker() {
  if (!kept || kept.dead) kept = keep();
}

/** `starting` until the kept worker has loaded its code and run its warm-up; `/api/health` says it. */
export const pipelineWorkerState = (): 'ready' | 'starting' =>
  kept && !kept.dead && kept.warm ? 'ready' : 'starting';

export async function stopPipelineWorker() {
  const k = kept;
  kept = null;
  if (k && !k.dead) await k.worker.terminate();
}

function takeWorker(): { entry: Kept; reusable: boolean } {
  warmPipelineWorker();
  if (!kept!.busy) return { entry: kept!, reusable: true };
  return { entry: keep(), reusable: false };
}

/**
 * Runs the pipeline in a worker thread bounded in heap and time, so a large log never stalls the API and a
 * hostile one cannot exhaust it. Typed arrays come back by transfer, not copy; `onPoints` is told the points
 * to store while the worker goes on with the diagnostics.
 */
export function runPipelineInWorker(
  input: PipelineInput,
  progress: (stage: PipelineStage, fraction: number) => void,
  onPoints?: (points: StoredPoints) => void,
): Promise<PipelineOutput> {
  return new Promise((resolve, reject) => {
    const { entry, reusable } = takeWorker();
    const worker = entry.worker;
    entry.busy = true;
    worker.ref();
    let settled = false;
    const finish = (drop: boolean) => {
      settled = true;
      clearTimeout(timer);
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
      entry.busy = false;
      worker.unref();
      if (drop || !reusable) {
        entry.dead = true;
        void worker.terminate();
      }
    };
    const timer = setTimeout(() => {
      finish(true);
      reject(new LogReadError('Reading the log took too long and was stopped', null));
    }, TIMEOUT_MS);
    const onMessage = (m: WorkerMessage) => {
      if (settled || m.type === 'warm') return;
      if (m.type === 'progress') progress(m.stage, m.fraction);
      else if (m.type === 'points') onPoints?.(m.points);
      else if (m.type === 'done') {
        finish(false);
        resolve(m.output);
      } else {
        // The file could not be read: the worker itself is sound and stays.
        finish(false);
        const e = m.error;
        reject(new LogReadError(e.message, e.line ?? null));
      }
    };
    const onError = (err: Error) => {
      if (settled) return;
      finish(true);
      reject(
        /heap|memory/i.test(err.message)
          ? new LogReadError('The log needs more memory than allowed to read', null)
          : new LogReadError(`The log could not be read: ${err.message}`, null),
      );
    };
    const onExit = () => {
      if (settled) return;
      finish(true);
      reject(new LogReadError('Reading the log stopped unexpectedly', null));
    };
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    // Shared bytes (FileStore.readShared) are shared with the worker; others are handed over.
    const shared = input.bytes.buffer instanceof SharedArrayBuffer;
    worker.postMessage(input, shared ? [] : [input.bytes.buffer as ArrayBuffer]);
  });
}
