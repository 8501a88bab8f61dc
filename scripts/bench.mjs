// `npm run bench`: speed targets, measured side by side in one run (PERFORMANCE.md). Prints each figure and
// its target; exits non-zero only if the benchmark failed to run. Traffic stays on 127.0.0.1.
import { mkdtempSync, rmSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import { freePort, startCluster, stopCluster } from './pg.mjs';
import { ensureNodeModules, runTs, runTsSync, demoUsers, say } from './setup.mjs';

ensureNodeModules();
const baseDir = mkdtempSync(path.join(os.tmpdir(), 'sowright-bench-'));
let db = null;
let server = null;
let failed = false;
try {
  db = await startCluster({ baseDir, port: await freePort(), dbName: 'sowright_bench' });
  const port = await freePort();
  const env = {
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: db.url,
    JWT_SECRET: randomBytes(32).toString('base64url'),
    SOWRIGHT_PORT: String(port),
    SOWRIGHT_SMTP_PORT: String(await freePort()),
  };
  runTsSync('server/db/cli.ts', ['seed'], env);
  server = runTs('server/index.ts', [], { env, stdio: 'ignore' });
  const url = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 100; i++) {
    try {
      if ((await fetch(`${url}/api/health`)).ok) break;
    } catch {
      /* starting */
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  const agronomist = demoUsers().find((u) => u.role === 'agronomist');
  const signIn = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-sowright-request': '1' },
    body: JSON.stringify({ email: agronomist.email, password: agronomist.password }),
  });
  const cookie = signIn.headers.get('set-cookie').split(';')[0];
  const growers = await (await fetch(`${url}/api/growers`, { headers: { cookie } })).json();
  const target = `${url}/api/growers/${growers.items[0].id}`;

  say('API: authenticated single-row GET, 50 connections, 10 s (target ≥ 1000 req/s, p99 ≤ 50 ms, 0 errors)');
  await autocannon({ url: target, connections: 50, duration: 2, headers: { cookie } }); // warm-up
  const r = await autocannon({ url: target, connections: 50, duration: 10, headers: { cookie } });
  const errors = r.errors + r.timeouts + (r.non2xx ?? 0);
  say(
    `  ${r.requests.average.toFixed(0)} req/s, p50 ${r.latency.p50} ms, p99 ${r.latency.p99} ms, errors ${errors}`,
  );
  say(
    `  ratio to target: ${(r.requests.average / 1000).toFixed(2)}× throughput, p99 ${(r.latency.p99 / 50).toFixed(2)}× of the limit`,
  );
} catch (err) {
  console.error(`[bench] failed to run: ${err.stack ?? err.message}`);
  failed = true;
} finally {
  server?.kill('SIGTERM');
  await new Promise((r) => setTimeout(r, 500));
  if (db) stopCluster(db.dataDir);
  rmSync(baseDir, { recursive: true, force: true });
}
process.exit(failed ? 1 : 0);
