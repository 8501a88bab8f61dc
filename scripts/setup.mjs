// Shared steps of `npm start`, `npm run dev` and `npm test`: node modules, secrets, running TypeScript.
import { spawn, spawnSync } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
export const DATA = path.join(ROOT, '.data');

export function say(msg) {
  process.stdout.write(`[sowright] ${msg}\n`);
}

function fileHash(files) {
  const h = createHash('sha256');
  for (const f of files) if (existsSync(f)) h.update(f).update(readFileSync(f));
  return h.digest('hex');
}

/** Installs node modules when they are missing or the lock file changed since the last install. */
export function ensureNodeModules() {
  const lock = path.join(ROOT, 'package-lock.json');
  const stamp = path.join(ROOT, 'node_modules', '.sowright-install');
  const want = fileHash([path.join(ROOT, 'package.json'), lock]);
  if (existsSync(stamp) && readFileSync(stamp, 'utf8') === want) return;
  say('installing node modules (npm ci)…');
  const t = Date.now();
  const res = spawnSync('npm', [existsSync(lock) ? 'ci' : 'install', '--no-audit', '--no-fund'], {
    cwd: ROOT,
    stdio: 'inherit',
  });
  if (res.status !== 0) throw new Error('npm install failed');
  writeFileSync(stamp, want);
  say(`node modules installed in ${((Date.now() - t) / 1000).toFixed(1)} s`);
}

/** A secret kept in .data, generated once. */
export function persistentSecret(name) {
  mkdirSync(DATA, { recursive: true });
  const file = path.join(DATA, name);
  if (!existsSync(file)) writeFileSync(file, randomBytes(48).toString('base64url'), { mode: 0o600 });
  return readFileSync(file, 'utf8').trim();
}

/** Runs a TypeScript entry point with tsx; resolves with its exit code. */
/**
 * The server's environment: glibc's allocator keeps memory a log import freed (up to 512 MB) for the next one
 * and serves blocks up to 32 MB from its heap, instead of handing them back to the system and mapping fresh
 * pages at every import. On these machines the first write to a fresh page costs about 3 ms a MB; measured:
 * allocating and touching 160 MB of typed arrays again took 136–817 ms by default and 14–52 ms so
 * (DEVELOPERS.md "The server keeps freed memory"). A GLIBC_TUNABLES already set is kept.
 */
export function serverEnv(env) {
  return {
    GLIBC_TUNABLES: 'glibc.malloc.mmap_threshold=33554432:glibc.malloc.trim_threshold=536870912',
    ...env,
  };
}

export function runTs(entry, args = [], { env = process.env, stdio = 'inherit' } = {}) {
  return spawn(process.execPath, ['--import', 'tsx', path.join(ROOT, entry), ...args], {
    cwd: ROOT,
    env,
    stdio,
  });
}

export function runTsSync(entry, args, env) {
  const res = spawnSync(process.execPath, ['--import', 'tsx', path.join(ROOT, entry), ...args], {
    cwd: ROOT,
    env,
    stdio: 'inherit',
  });
  if (res.status !== 0) throw new Error(`${entry} ${args.join(' ')} failed`);
}

function newestMtime(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return newest;
}

/** Builds the client unless dist/ is newer than every source it is built from. */
export function ensureClientBuild({ force = false } = {}) {
  const dist = path.join(ROOT, 'dist', 'index.html');
  const sources = [
    newestMtime(path.join(ROOT, 'src')),
    newestMtime(path.join(ROOT, 'shared')),
    newestMtime(path.join(ROOT, 'public')),
    ...['index.html', 'vite.config.ts', 'tailwind.config.ts', 'package-lock.json'].map((f) =>
      existsSync(path.join(ROOT, f)) ? statSync(path.join(ROOT, f)).mtimeMs : 0,
    ),
  ];
  if (!force && existsSync(dist) && statSync(dist).mtimeMs > Math.max(...sources)) return false;
  say('building the client…');
  const t = Date.now();
  const res = spawnSync(
    process.execPath,
    [path.join(ROOT, 'node_modules', 'vite', 'bin', 'vite.js'), 'build', '--logLevel', 'warn'],
    {
      cwd: ROOT,
      stdio: 'inherit',
    },
  );
  if (res.status !== 0) throw new Error('vite build failed');
  say(`client built in ${((Date.now() - t) / 1000).toFixed(1)} s`);
  return true;
}

export function demoUsers() {
  return JSON.parse(readFileSync(path.join(ROOT, 'server', 'db', 'demo-users.json'), 'utf8'));
}
