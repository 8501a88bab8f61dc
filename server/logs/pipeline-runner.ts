import { Worker } from 'node:worker_threads';
import { DomainError } from '../errors';
import type { PipelineInput, PipelineOutput, PipelineStage } from './pipeline';

/** A log that needs longer than this to read, clean and audit is stopped (5 M points take well under it). */
const TIMEOUT_MS = 10 * 60_000;

export type WorkerMessage =
  | { type: 'progress'; stage: PipelineStage; fraction: number }
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

/**
 * Runs the pipeline in a worker thread bounded in heap and time, so a large log never stalls the API and a
 * hostile one cannot exhaust it. Typed arrays come back by transfer, not copy.
 */
export function runPipelineInWorker(
  input: PipelineInput,
  progress: (stage: PipelineStage, fraction: number) => void,
): Promise<PipelineOutput> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(new URL('./pipeline.worker.mjs', import.meta.url), {
      resourceLimits: { maxOldGenerationSizeMb: 2048, maxYoungGenerationSizeMb: 64, stackSizeMb: 4 },
      workerData: input,
      transferList: [input.bytes.buffer as ArrayBuffer],
    });
    const timer = setTimeout(() => {
      void worker.terminate();
      reject(new LogReadError('Reading the log took too long and was stopped', null));
    }, TIMEOUT_MS);
    worker.on('message', (m: WorkerMessage) => {
      if (m.type === 'progress') progress(m.stage, m.fraction);
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
  });
}
