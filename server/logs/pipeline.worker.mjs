// Entry of the log pipeline worker thread (server/logs/pipeline-runner.ts). A worker does not inherit the
// TypeScript loader of its parent (tsx or vitest), so it registers tsx itself, then loads the job.
import { register } from 'tsx/esm/api';
import { URL } from 'node:url';

register();
await import(new URL('./pipeline-worker.ts', import.meta.url).href);
