import { parentPort } from 'node:worker_threads';
import type { MultiPolygon } from 'geojson';
import {
  zonesFromPoints,
  type ZonesFromPointsOptions,
  type ZonesFromPointsResult,
} from '../../../shared/geo/zones-from-points';
import { GeoInputError } from '../../../shared/geo/geo-input-error';

/** What the zones-from-data worker is sent: the points as three columns (transferred, not copied). */
export type ZonesJob = {
  lon: Float64Array;
  lat: Float64Array;
  value: Float64Array;
  boundary: MultiPolygon;
  options: ZonesFromPointsOptions;
};
export type ZonesReply =
  { ok: true; result: ZonesFromPointsResult } | { ok: false; geoInput: boolean; message: string };

// One job per worker: the runner ends the worker when it answers, or when it runs out of time or memory.
parentPort?.once('message', (job: ZonesJob) => {
  let reply: ZonesReply;
  try {
    const points = Array.from(job.lon, (lon, i) => ({ lon, lat: job.lat[i], value: job.value[i] }));
    reply = { ok: true, result: zonesFromPoints(points, job.boundary, job.options) };
  } catch (err) {
    const message = err instanceof Error ? err.message.split('\n')[0].slice(0, 200) : String(err);
    reply = { ok: false, geoInput: err instanceof GeoInputError, message };
  }
  parentPort!.postMessage(reply);
});
