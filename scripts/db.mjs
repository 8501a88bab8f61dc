// `npm run db:migrate | db:seed | db:reset` against the `npm start` cluster (started if it is not running).
import { startCluster } from './pg.mjs';
import { DATA, ensureNodeModules, runTsSync } from './setup.mjs';

const command = process.argv[2] ?? 'migrate';
ensureNodeModules();
const db = await startCluster({
  baseDir: DATA,
  port: Number(process.env.SOWRIGHT_DB_PORT ?? 54329),
  dbName: 'sowright',
});
runTsSync('server/db/cli.ts', [command], {
  ...process.env,
  DATABASE_URL: process.env.DATABASE_URL ?? db.url,
});
