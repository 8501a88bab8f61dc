// `npm run dev`: the same database as `npm start`, the API under `tsx watch` (restarts on change) and Vite's
// dev server with hot reload, which proxies /api to the API. Ctrl-C stops all three.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { startCluster, stopCluster } from './pg.mjs';
import {
  DATA,
  ROOT,
  demoUsers,
  ensureNodeModules,
  persistentSecret,
  runTsSync,
  say,
  serverEnv,
} from './setup.mjs';

const appPort = Number(process.env.SOWRIGHT_PORT ?? 4280);
ensureNodeModules();
const db = await startCluster({
  baseDir: DATA,
  port: Number(process.env.SOWRIGHT_DB_PORT ?? 54329),
  dbName: 'sowright',
});
const env = {
  ...process.env,
  NODE_ENV: 'development',
  DATABASE_URL: process.env.DATABASE_URL ?? db.url,
  JWT_SECRET: process.env.JWT_SECRET ?? persistentSecret('jwt-secret'),
  SOWRIGHT_PORT: String(appPort),
  APP_URL: process.env.APP_URL ?? 'http://127.0.0.1:5173',
};
runTsSync('server/db/cli.ts', ['seed'], env);

const api = spawn(process.execPath, ['--import', 'tsx', '--watch', path.join(ROOT, 'server/index.ts')], {
  cwd: ROOT,
  env: serverEnv(env),
  stdio: 'inherit',
});
const vite = spawn(process.execPath, [path.join(ROOT, 'node_modules/vite/bin/vite.js')], {
  cwd: ROOT,
  env,
  stdio: 'inherit',
});
say('API on http://127.0.0.1:' + appPort + ', client with hot reload on http://127.0.0.1:5173');
for (const u of demoUsers()) say(`  ${u.role.padEnd(11)} ${u.email.padEnd(30)} ${u.password}`);

let stopping = false;
const stop = () => {
  if (stopping) return;
  stopping = true;
  api.kill('SIGTERM');
  vite.kill('SIGTERM');
  setTimeout(() => {
    stopCluster(db.dataDir);
    process.exit(0);
  }, 800);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
api.on('exit', () => !stopping && stop());
vite.on('exit', () => !stopping && stop());
