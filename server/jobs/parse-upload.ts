import { parentPort } from 'node:worker_threads';
import { DomainError } from '../errors';
import { GeoInputError } from '../../shared/geo/geo-input-error';
import { ZipRefusedError } from '../lib/zip-inspect';
import { readUpload } from '../routes/imports/parsers/read-upload';
import type { ParseJob, WorkerReply } from '../routes/imports/parsers/types';

/** Turns anything thrown while reading into an answer a person understands; never a stack trace. */
export function replyFor(err: unknown): WorkerReply {
  if (err instanceof DomainError)
    return { ok: false, code: err.code, message: err.message, details: err.details };
  if (err instanceof GeoInputError) {
    const path = err.place?.feature !== undefined ? ['features', err.place.feature] : ['file'];
    return {
      ok: false,
      code: 'invalid_geometry',
      message: err.message,
      details: [{ path, message: err.message }],
    };
  }
  if (err instanceof ZipRefusedError) return { ok: false, code: 'unreadable_file', message: err.message };
  if (err instanceof RangeError && /call stack/i.test(err.message)) {
    return { ok: false, code: 'unreadable_file', message: 'The file is nested too deeply to read' };
  }
  const detail = err instanceof Error ? err.message.split('\n')[0].slice(0, 160) : '';
  return {
    ok: false,
    code: 'unreadable_file',
    message: `The file could not be read${detail ? `: ${detail}` : ''}`,
  };
}

// One job at a time; the runner keeps the worker for the next job, or ends it after a time limit.
parentPort?.on('message', async (job: ParseJob) => {
  let reply: WorkerReply;
  try {
    reply = { ok: true, outcome: await readUpload(job) };
  } catch (err) {
    reply = replyFor(err);
  }
  const transfer =
    reply.ok && reply.outcome.points
      ? [
          reply.outcome.points.lon.buffer,
          reply.outcome.points.lat.buffer,
          ...reply.outcome.points.columns.map((c) => c.values.buffer),
        ]
      : [];
  parentPort!.postMessage(reply, transfer as ArrayBuffer[]);
});
