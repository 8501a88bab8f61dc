// Entry of the zones-from-data worker thread (zones-from-points.job.ts). A worker does not inherit the
// TypeScript loader of its parent (tsx or vitest), so it registers tsx itself, then loads the job.
import { register } from 'tsx/esm/api';
import { URL } from 'node:url';

register();
await import(new URL('./zones-from-points.job.ts', import.meta.url).href);
