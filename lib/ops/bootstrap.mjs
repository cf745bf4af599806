// Entry point of `npm start`, `npm test` and the other project commands.
//
// Plain JavaScript with no dependencies, because it runs before node_modules exists on a fresh
// clone: it installs the npm packages when they are missing or older than package-lock.json, then
// loads the TypeScript commands through tsx in this same process (one process to signal and stop).
import { createHash } from 'node:crypto';
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const stampFile = join(root, 'node_modules', '.worldsheet-install-stamp');

function lockHash() {
  const lock = join(root, 'package-lock.json');
  const source = existsSync(lock) ? readFileSync(lock) : readFileSync(join(root, 'package.json'));
  return createHash('sha256').update(source).digest('hex');
}

function ensurePackages() {
  const wanted = lockHash();
  if (existsSync(stampFile) && readFileSync(stampFile, 'utf8').trim() === wanted) return;
  const hasLock = existsSync(join(root, 'package-lock.json'));
  const args = hasLock ? ['ci', '--no-audit', '--no-fund'] : ['install', '--no-audit', '--no-fund'];
  console.log(`[worldsheet] installing npm packages (npm ${args[0]}) …`);
  const npm = process.platform === 'win32' ? 'npm.cmd' : 'npm';
  // npm ci on Node 20 refuses dev dependencies when NODE_ENV=production; tests and the build need them.
  // Plain JavaScript before TypeScript (and lib/config.ts) is available: npm gets this process's environment.
  const env = { ...process.env, NODE_ENV: 'development' };
  const result = spawnSync(npm, args, { cwd: root, stdio: 'inherit', env });
  if (result.status !== 0) {
    console.error('[worldsheet] npm could not install the packages; see its messages above.');
    process.exit(result.status ?? 1);
  }
  writeFileSync(stampFile, `${wanted}\n`);
}

const [major] = process.versions.node.split('.').map(Number);
if (major < 20) {
  console.error(`[worldsheet] Node.js 20 or newer is needed; this is ${process.version}.`);
  process.exit(1);
}

const command = process.argv[2] ?? 'start';
ensurePackages();
const { register } = await import('tsx/esm/api');
register();
const { runCommand } = await import(pathToFileURL(join(root, 'lib', 'ops', 'commands.ts')).href);
await runCommand(command, process.argv.slice(3));
