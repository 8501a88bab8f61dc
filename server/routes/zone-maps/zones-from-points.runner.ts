import { Worker } from 'node:worker_threads';
import type { MultiPolygon } from 'geojson';
import type { ZonesFromPointsOptions, ZonesFromPointsResult } from '../../../shared/geo/zones-from-points';
import { DomainError } from '../../errors';
import type { ZonesJob, ZonesReply } from './zones-from-points.job';

/** Interpolating and classing must end within this time and heap, or the request is refused (never a hang). */
export const ZONES_LIMITS = { timeoutMs: 60_000, maxOldGenerationSizeMb: 1024 };

const tooMuch = (what: string) =>
  new DomainError('validation_failed', `${what}: choose larger cells or fewer classes and try again`, [
    { path: ['cellSizeM'], message: what },
  ]);

/**
 * Runs shared/geo zonesFromPoints in a worker thread bounded in time and heap, so a large grid neither blocks
 * the server nor takes it down. A refusal of the input (GeoInputError) comes back as a 422.
 */
export function zonesFromPointsInWorker(
  points: { lon: number; lat: number; value: number }[],
  boundary: MultiPolygon,
  options: ZonesFromPointsOptions,
  limits = ZONES_LIMITS,
): Promise<ZonesFromPointsResult> {
  const job: ZonesJob = {
    lon: Float64Array.from(points, (p) => p.lon),
    lat: Float64Array.from(points, (p) => p.lat),
    value: Float64Array.from(points, (p) => p.value),
    boundary,
    options,
  };
  const worker = new Worker(new URL('./zones-from-points.worker.mjs', import.meta.url), {
    resourceLimits: { maxOldGenerationSizeMb: limits.maxOldGenerationSizeMb, stackSizeMb: 4 },
    stdout: false,
    stderr: false,
  });
  return new Promise<ZonesFromPointsResult>((resolve, reject) => {
    let settled = false;
    const finish = (fn: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      void worker.terminate();
      fn();
    };
    const timer = setTimeout(
      () => finish(() => reject(tooMuch(`Making zones took longer than ${limits.timeoutMs / 1000} s`))),
      limits.timeoutMs,
    );
    worker.once('message', (reply: ZonesReply) =>
      finish(() => {
        if (reply.ok) return resolve(reply.result);
        const path = reply.geoInput ? 'importId' : 'cellSizeM';
        const message = reply.geoInput ? reply.message : `The zones could not be made: ${reply.message}`;
        reject(
          new DomainError(reply.geoInput ? 'invalid_geometry' : 'validation_failed', message, [
            { path: [path], message },
          ]),
        );
      }),
    );
    worker.once('error', (err: Error & { code?: string }) =>
      finish(() =>
        reject(
          err.code === 'ERR_WORKER_OUT_OF_MEMORY'
            ? tooMuch('Making zones needs more memory than allowed')
            : new DomainError('validation_failed', 'The zones could not be made from these points'),
        ),
      ),
    );
    worker.once('exit', () =>
      finish(() =>
        reject(new DomainError('validation_failed', 'The zones could not be made from these points')),
      ),
    );
    worker.postMessage(job, [job.lon.buffer, job.lat.buffer, job.value.buffer] as ArrayBuffer[]);
  });
}
