// `npm test`: a throwaway PostgreSQL cluster on a free port in a temporary folder, migrations and the demo,
// the client build (for the browser tests), then every vitest project. The cluster is stopped and removed
// whatever happens. Extra arguments go to vitest (e.g. `npm test -- --project server`).
import { mkdtempSync, rmSync, existsSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { spawn } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';
import { ensureDebianPackages, freePort, startCluster, stopCluster } from './pg.mjs';
import { ROOT, ensureClientBuild, ensureNodeModules, runTsSync, say } from './setup.mjs';

const args = process.argv.slice(2);
const onlyE2e = args.includes('--only=e2e');
const vitestArgs = args.filter((a) => a !== '--only=e2e');
const wantsE2e = onlyE2e || !vitestArgs.some((a) => a.startsWith('--project')) || vitestArgs.includes('e2e');

const t0 = Date.now();
ensureNodeModules();
if (wantsE2e) {
  ensureDebianPackages(['chromium'], {
    check: () => existsSync('/usr/bin/chromium'),
    why: 'Chromium for the browser tests',
  });
}
ensureDebianPackages(['gdal-bin'], {
  check: () => existsSync('/usr/bin/ogrinfo'),
  why: "GDAL's ogrinfo, an independent reader for export tests",
});

const baseDir = mkdtempSync(path.join(os.tmpdir(), 'sowright-test-'));
let db = null;
let code = 1;
const cleanup = () => {
  if (db) stopCluster(db.dataDir);
  db = null;
  rmSync(baseDir, { recursive: true, force: true });
};
process.on('SIGINT', () => {
  cleanup();
  process.exit(130);
});

try {
  db = await startCluster({ baseDir, port: await freePort(), dbName: 'sowright_test' });
  const env = {
    ...process.env,
    NODE_ENV: 'test',
    DATABASE_URL: db.url,
    JWT_SECRET: randomBytes(32).toString('base64url'),
    SOWRIGHT_CLIENT_DIR: path.join(ROOT, 'dist'),
    // Log files of the demo and of every test app of this run, removed with the cluster.
    SOWRIGHT_DATA_DIR: path.join(baseDir, 'files'),
  };
  runTsSync('server/db/cli.ts', ['seed'], env);
  if (wantsE2e) ensureClientBuild();
  const runArgs = onlyE2e ? ['run', '--project', 'e2e', ...vitestArgs] : ['run', ...vitestArgs];
  code = await new Promise((resolve) => {
    const child = spawn(
      process.execPath,
      [path.join(ROOT, 'node_modules', 'vitest', 'vitest.mjs'), ...runArgs],
      {
        cwd: ROOT,
        env,
        stdio: 'inherit',
      },
    );
    child.on('exit', (c) => resolve(c ?? 1));
  });
} catch (err) {
  console.error(`[sowright] tests could not run: ${err.message}`);
  code = 1;
} finally {
  cleanup();
}
say(`tests finished in ${((Date.now() - t0) / 1000).toFixed(1)} s with exit code ${code}`);
process.exit(code);
