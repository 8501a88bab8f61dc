import { Worker } from 'node:worker_threads';
import { DomainError } from '../errors';
import type { PipelineInput, PipelineOutput, PipelineStage, StoredPoints } from './pipeline';

/** A log that needs longer than this to read, clean and audit is stopped (5 M points take well under it). */
const TIMEOUT_MS = 10 * 60_000;

export type WorkerMessage =
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
  // A spare that dies while idle is noticed when it is taken (its exit code is set).
  worker.on('error', () => {});
  return worker;
};

/**
 * One worker started ahead (`warmPipelineWorker`), so an import does not wait for a thread to start and load
 * the pipeline's code (about half a second); each run takes it and leaves a fresh one behind.
 */
let spare: { worker: Worker; exited: boolean } | null = null;

export function warmPipelineWorker() {
  if (spare && !spare.exited) return;
  const worker = newWorker();
  const entry = { worker, exited: false };
  worker.once('exit', () => {
    entry.exited = true;
  });
  spare = entry;
}

export async function stopPipelineWorker() {
  const s = spare;
  spare = null;
  if (s && !s.exited) await s.worker.terminate();
}

function takeWorker(): Worker {
  const s = spare;
  spare = null;
  if (s && !s.exited) {
    warmPipelineWorker();
    return s.worker;
  }
  return newWorker();
}

/**
 * Runs the pipeline in a worker thread bounded in heap and time, so a large log never stalls the API and a
 * hostile one cannot exhaust it. Typed arrays come back by transfer, not copy; `onPoints` is told the points
 * to store (a copy) while the worker goes on with the diagnostics.
 */
export function runPipelineInWorker(
  input: PipelineInput,
  progress: (stage: PipelineStage, fraction: number) => void,
  onPoints?: (points: StoredPoints) => void,
): Promise<PipelineOutput> {
  return new Promise((resolve, reject) => {
    const worker = takeWorker();
    worker.ref();
    const timer = setTimeout(() => {
      void worker.terminate();
      reject(new LogReadError('Reading the log took too long and was stopped', null));
    }, TIMEOUT_MS);
    worker.on('message', (m: WorkerMessage) => {
      if (m.type === 'progress') progress(m.stage, m.fraction);
      else if (m.type === 'points') onPoints?.(m.points);
      else if (m.type === 'done') {
        clearTimeout(timer);
        resolve(m.output);
        void worker.terminate();
      } else {
        clearTimeout(timer);
        const e = m.error;
        reject(new LogReadError(e.message, e.line ?? null));
        void worker.terminate();
      }
    });
    worker.on('error', (err) => {
      clearTimeout(timer);
      reject(
        /heap|memory/i.test(err.message)
          ? new LogReadError('The log needs more memory than allowed to read', null)
          : new LogReadError(`The log could not be read: ${err.message}`, null),
      );
    });
    worker.on('exit', (code) => {
      clearTimeout(timer);
      if (code !== 0) reject(new LogReadError('Reading the log stopped unexpectedly', null));
    });
    // Shared bytes (FileStore.readShared) are shared with the worker; others are handed over.
    const shared = input.bytes.buffer instanceof SharedArrayBuffer;
    worker.postMessage(input, shared ? [] : [input.bytes.buffer as ArrayBuffer]);
  });
}
