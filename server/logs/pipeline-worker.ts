import { parentPort } from 'node:worker_threads';
import { runPipeline, storedPointsOf, type PipelineInput } from './pipeline';
import type { WorkerMessage } from './pipeline-runner';
import { startParseHelper } from './parse-helper';
import { warmUpPipeline } from './pipeline-warm-up';
import { collectGarbage } from './collect-garbage';

/**
 * The worker side: for each input (one at a time), runs the pipeline, posts progress, then the points to
 * store as soon as the audit has them (the import starts its COPY while the diagnostics run here), then the
 * result by transfer. The runner keeps the worker for the next log.
 */
const post = (m: WorkerMessage, transfer: ArrayBuffer[] = []) => parentPort!.postMessage(m, transfer);

// The second parsing thread starts, and the pipeline runs once on an invented log, while this worker waits
// for its first log; a log that comes sooner waits for the warm-up (it is short).
startParseHelper();
const warm = warmUpPipeline()
  .catch((err: Error) => process.stderr.write(`[logs] warm-up: ${err.message}\n`))
  .then(() => {
    collectGarbage();
    post({ type: 'warm' });
  });

parentPort!.on('message', async (input: PipelineInput) => {
  await warm;
  try {
    let last = 0;
    const output = await runPipeline(
      input,
      (stage, fraction) => {
        const now = Date.now();
        if (now - last > 200 || fraction === 0 || fraction === 1) {
          last = now;
          post({ type: 'progress', stage, fraction });
        }
      },
      (points) => post({ type: 'points', points: storedPointsOf(points) }),
    );
    const c = output.columns;
    const buffers = new Set<ArrayBuffer>();
    for (const a of [
      c.t,
      c.lon,
      c.lat,
      c.heading,
      c.target,
      c.applied,
      c.speedMps,
      c.wheelMps,
      c.gnssMps,
      c.speedSource,
      c.widthM,
      c.sectionsOn,
      c.workOn,
      output.zone,
      output.removedBy,
      output.trueApplied,
      output.area,
      ...c.rows.map((r) => r.values),
      ...Object.values(output.cells).filter((v): v is Float64Array => ArrayBuffer.isView(v)),
    ]) {
      if (a && !(a.buffer instanceof SharedArrayBuffer)) buffers.add(a.buffer as ArrayBuffer);
    }
    post({ type: 'done', output }, [...buffers]);
  } catch (err) {
    const e = err as Error & { line?: number; column?: string | null; code?: string };
    post({
      type: 'error',
      error: { name: e.name, message: e.message, code: e.code, line: e.line, column: e.column ?? null },
    });
  }
  // No collection here: after each log it made the next one slower (the diagnostics by 0.4–0.8 s in a
  // storage-only benchmark, the heap growing back into fresh pages); the next log's own collections free
  // this one's columns.
});
