// `npm start`: database, migrations, demo, client build and server, all on 127.0.0.1. Ctrl-C stops it all.
import path from 'node:path';
import { startCluster, stopCluster } from './pg.mjs';
import {
  DATA,
  ROOT,
  demoUsers,
  ensureClientBuild,
  ensureNodeModules,
  persistentSecret,
  runTs,
  serverEnv,
  runTsSync,
  say,
} from './setup.mjs';

const t0 = Date.now();
const appPort = Number(process.env.SOWRIGHT_PORT ?? 4280);
const dbPort = Number(process.env.SOWRIGHT_DB_PORT ?? 54329);

ensureNodeModules();
const db = await startCluster({ baseDir: DATA, port: dbPort, dbName: 'sowright' });
let stopped = false;
const stopDb = () => {
  if (stopped) return;
  stopped = true;
  stopCluster(db.dataDir);
};

try {
  const env = {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: process.env.DATABASE_URL ?? db.url,
    JWT_SECRET: process.env.JWT_SECRET ?? persistentSecret('jwt-secret'),
    SOWRIGHT_PORT: String(appPort),
    SOWRIGHT_CLIENT_DIR: path.join(ROOT, 'dist'),
  };
  runTsSync('server/db/cli.ts', ['seed'], env);
  ensureClientBuild();

  const server = runTs('server/index.ts', [], { env: serverEnv(env) });
  const shutdown = (signal) => {
    say(`${signal}: stopping the server and the database…`);
    server.kill('SIGTERM');
  };
  process.on('SIGINT', () => shutdown('Ctrl-C'));
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  server.on('exit', (code) => {
    stopDb();
    process.exit(code ?? 0);
  });

  // Wait until the API answers, then print where it is and who can sign in.
  const url = `http://127.0.0.1:${appPort}`;
  for (let i = 0; i < 200; i++) {
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) break;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  say(`ready in ${((Date.now() - t0) / 1000).toFixed(1)} s: open ${url}`);
  say('demo sign-ins (an invented practice):');
  for (const u of demoUsers()) say(`  ${u.role.padEnd(11)} ${u.email.padEnd(30)} ${u.password}`);
  say('e-mail is caught locally: sign in as admin and open "Mail outbox". Ctrl-C stops everything.');
} catch (err) {
  console.error(`[sowright] could not start: ${err.message}`);
  stopDb();
  process.exit(1);
}
