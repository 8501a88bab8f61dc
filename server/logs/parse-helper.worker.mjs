// Entry of the second parsing thread (server/logs/parse-helper.ts). A worker does not inherit the TypeScript
// loader of its parent, so it registers tsx itself, then loads the job.
import { register } from 'tsx/esm/api';
import { URL } from 'node:url';

register();
await import(new URL('./parse-helper-worker.ts', import.meta.url).href);
