// Where the evaluation worker's prebuilt JavaScript is, and whether it is current. Loading the engine
// from its TypeScript sources costs each worker a tsx loader (module hooks on a thread of their own)
// and a compilation: about 100 MiB and 2–4 s per worker, where one prebuilt file of the worker
// (worker.ts, the engine and mathjs, bundled by esbuild) starts in about 50 MiB and 0.3 s.
//
// The file is named by a hash of what it is built from: every file under lib/calc (the worker
// imports nothing of the project outside it, `.lint/walls.mjs`) and the package lock (the packages it
// bundles). A worker uses it only when the name matches the sources of the moment, so an edit that
// was not built yet runs from source through tsx (worker-entry.mjs), never as stale code. The project
// commands build it (lib/ops/calc-worker-build.ts: `npm start`, `npm test`, every app build).
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';

/** Folder of the prebuilt workers, under the project root (node_modules/.cache: made again after npm ci). */
export const WORKER_BUNDLE_DIR = path.join('node_modules', '.cache', 'worldsheet');

/** Changes when the way the bundle is built changes, so that an older build is not taken for current. */
const BUILD_RECIPE = 'esm node createRequire keepNames 1';

function walk(dir: string, out: string[]): void {
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) walk(full, out);
    else if (entry.isFile()) out.push(full);
  }
}

/** Hash of the worker's sources under `root`: every file under lib/calc, the package lock and the recipe. */
export function workerSourceHash(root: string): string {
  const files: string[] = [];
  walk(path.join(/* turbopackIgnore: true */ root, 'lib', 'calc'), files);
  const lock = path.join(/* turbopackIgnore: true */ root, 'package-lock.json');
  if (existsSync(lock)) files.push(lock);
  const hash = createHash('sha256').update(BUILD_RECIPE).update('\0');
  for (const file of files.sort()) {
    hash.update(path.relative(root, file)).update('\0').update(readFileSync(file)).update('\0');
  }
  return hash.digest('hex').slice(0, 20);
}

/** The bundle's path relative to the project root, for sources with this hash. */
export function workerBundlePath(hash: string): string {
  return path.join(WORKER_BUNDLE_DIR, `calc-worker-${hash}.mjs`);
}

/** The prebuilt worker for the sources under `root` as they are now (relative to root), or null when none is built. */
export function currentWorkerBundle(root: string): string | null {
  const entry = workerBundlePath(workerSourceHash(root));
  return existsSync(path.join(/* turbopackIgnore: true */ root, entry)) ? entry : null;
}
