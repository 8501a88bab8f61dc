import type { Sequelize } from 'sequelize';
import { QUEUES, startJobs } from '../jobs/boss';
import type { FileStore } from './file-store';
import { importLog } from './import-log';
import { stopPipelineWorker, warmPipelineWorker } from './pipeline-runner';

export type LogJobs = {
  /** Queues the import of a log; a log already queued is not queued twice. */
  enqueue(logId: string): Promise<void>;
  stop(): Promise<void>;
};

/**
 * pg-boss on the app's own PostgreSQL runs log imports in the background: the upload answers at once, the
 * page polls the log's status and progress, and a restart picks up what was queued (pg-boss retries a job
 * whose worker died). Imports run one at a time per process (the machine has two cores).
 */
export async function startLogJobs(deps: {
  sequelize: Sequelize;
  databaseUrl: string;
  files: FileStore;
  onReady?: (logId: string) => Promise<void>;
}): Promise<LogJobs> {
  const jobs = await startJobs(deps.databaseUrl);
  warmPipelineWorker();
  const workerId = await jobs.boss.work<{ logId: string }>(
    QUEUES.logImport,
    { batchSize: 1, pollingIntervalSeconds: 0.5 },
    async ([job]) => {
      await importLog(deps, job.data.logId);
    },
  );
  return {
    async enqueue(logId) {
      await jobs.boss.send(
        QUEUES.logImport,
        { logId },
        { singletonKey: logId, retryLimit: 2, retryDelay: 5, expireInSeconds: 15 * 60 },
      );
      // This process's worker fetches at once instead of at its next poll (up to half a second later).
      jobs.boss.notifyWorker(workerId);
    },
    async stop() {
      await jobs.stop();
      await stopPipelineWorker();
    },
  };
}
