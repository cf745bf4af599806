// Builds the production app only when its sources changed since the last build into that folder.
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { ensureCalcWorkerBundle } from './calc-worker-build';

const SOURCE_DIRS = ['app', 'components', 'lib', 'db', 'public', 'fonts'];
const SOURCE_FILES = ['package-lock.json', 'next.config.mjs', 'tailwind.config.ts', 'tsconfig.json', '.postcssrc.json'];

function walk(dir: string, out: string[]): void {
  if (!existsSync(dir)) return;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) walk(path, out);
    else if (entry.isFile()) out.push(path);
  }
}

function sourceHash(root: string): string {
  const files: string[] = [];
  for (const d of SOURCE_DIRS) walk(join(root, d), files);
  for (const f of SOURCE_FILES) if (existsSync(join(root, f))) files.push(join(root, f));
  const hash = createHash('sha256');
  for (const file of files.sort()) {
    hash
      .update(relative(root, file))
      .update('\0')
      .update(String(statSync(file).size))
      .update('\0');
    hash.update(readFileSync(file)).update('\0');
  }
  return hash.digest('hex');
}

/**
 * Runs `next build` into `distDir` unless the stamp there matches the sources, after building the
 * evaluation worker's prebuilt engine if needed. Returns whether it ran `next build`.
 */
export function buildIfStale(root: string, distDir: string, env: NodeJS.ProcessEnv): boolean {
  // The app's evaluation workers load the prebuilt engine for the same sources (built apart: the
  // Next.js build does not include it, and it is made again only when lib/calc or the lock changed).
  ensureCalcWorkerBundle(root);
  // One build of a folder at a time (`npm test` builds beside the tiers while a database-tier test
  // may ask for the same build): a second caller waits, then finds it current.
  return withBuildLock(root, distDir, () => buildUnlocked(root, distDir, env));
}

/** Holds `.data/build-locks/<distDir>.lock` (the holder's PID) while `fn` runs; a lock whose holder is gone is taken over. */
function withBuildLock<T>(root: string, distDir: string, fn: () => T): T {
  const folder = join(root, '.data', 'build-locks');
  mkdirSync(folder, { recursive: true });
  const lock = join(folder, `${distDir.replace(/[^\w.-]+/g, '_')}.lock`);
  const pause = new Int32Array(new SharedArrayBuffer(4));
  for (;;) {
    try {
      writeFileSync(lock, String(process.pid), { flag: 'wx' });
      break;
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
      const holder = Number(readFileSync(lock, 'utf8'));
      if (!holder || !alive(holder)) rmSync(lock, { force: true });
      else Atomics.wait(pause, 0, 0, 500);
    }
  }
  try {
    return fn();
  } finally {
    rmSync(lock, { force: true });
  }
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function buildUnlocked(root: string, distDir: string, env: NodeJS.ProcessEnv): boolean {
  const stamp = join(root, distDir, 'worldsheet-source-hash');
  const wanted = sourceHash(root);
  if (
    existsSync(join(root, distDir, 'BUILD_ID')) &&
    existsSync(stamp) &&
    readFileSync(stamp, 'utf8').trim() === wanted
  ) {
    return false;
  }
  console.log(`[worldsheet] building the app into ${distDir}/ …`);
  const result = spawnSync(process.execPath, [join(root, 'node_modules', 'next', 'dist', 'bin', 'next'), 'build'], {
    cwd: root,
    stdio: 'inherit',
    env: { ...env, WORLDSHEET_DIST_DIR: distDir, NEXT_TELEMETRY_DISABLED: '1' },
  });
  if (result.status !== 0) throw new Error('`next build` failed; see its messages above.');
  // Hashed again: `next build` may rewrite tsconfig.json, and a stamp of the sources before it would
  // make the next caller build again, into the folder a running server reads.
  writeFileSync(stamp, `${sourceHash(root)}\n`);
  return true;
}
