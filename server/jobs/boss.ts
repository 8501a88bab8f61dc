import PgBoss from 'pg-boss';

/** Queues of background work, on the same PostgreSQL (pg-boss keeps its tables in schema `pgboss`). */
export const QUEUES = { logImport: 'log-import' } as const;

export type Jobs = {
  boss: PgBoss;
  stop(): Promise<void>;
};

/** Starts pg-boss and creates the queues; handlers are attached by whoever owns them (server/logs). */
export async function startJobs(
  databaseUrl: string,
  queues: string[] = Object.values(QUEUES),
): Promise<Jobs> {
  const boss = new PgBoss({ connectionString: databaseUrl, max: 4, application_name: 'sowright-jobs' });
  boss.on('error', (err) => process.stderr.write(`[jobs] ${err.message}\n`));
  await boss.start();
  for (const name of queues) await boss.createQueue(name);
  return {
    boss,
    async stop() {
      await boss.stop({ graceful: true, timeout: 10_000 });
    },
  };
}
