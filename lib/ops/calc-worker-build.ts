// Builds the evaluation worker's prebuilt JavaScript (lib/calc/sandbox/worker-bundle.ts says why and
// how a worker picks it) with esbuild, the compiler tsx itself runs on (installed as tsx's
// dependency; nothing is downloaded). Called by `npm start` and `npm run dev`, `npm test` and every
// app build (lib/ops/next-build.ts); about a second, and nothing when the current one exists.
import { existsSync, mkdirSync, readdirSync, renameSync, rmSync, statSync } from 'node:fs';
import path from 'node:path';
import { buildSync } from 'esbuild';
import { WORKER_BUNDLE_DIR, workerBundlePath, workerSourceHash } from '../calc/sandbox/worker-bundle';

/** Older bundles are removed once this old: a process started before the edit may still be starting one. */
const KEEP_OLD_MS = 60 * 60_000;

/**
 * Builds the prebuilt worker for the sources under `root` unless it exists. Returns whether it built.
 * Sources esbuild cannot read (an edit in progress) are left for tsc and the tests to report: it says
 * so in one line and the workers load the engine from source, as whenever no build matches.
 */
export function ensureCalcWorkerBundle(root: string): boolean {
  const entry = workerBundlePath(workerSourceHash(root));
  const file = path.join(root, entry);
  if (existsSync(file)) return false;
  const folder = path.join(root, WORKER_BUNDLE_DIR);
  mkdirSync(folder, { recursive: true });
  // Written beside and renamed: two commands building at once each rename a whole file.
  const partial = `${file}.${process.pid}.partial`;
  try {
    buildWorker(root, partial);
  } catch (error) {
    rmSync(partial, { force: true });
    const first = (error as { errors?: Array<{ text: string; location: { file: string; line: number } | null }> })
      .errors?.[0];
    const reason = first
      ? `${first.location ? `${first.location.file}:${first.location.line}: ` : ''}${first.text}`
      : (error as Error).message;
    console.error(`[worldsheet] the evaluation worker was not prebuilt (${reason}); workers load it from source`);
    return false;
  }
  renameSync(partial, file);
  const now = Date.now();
  for (const name of readdirSync(folder)) {
    const other = path.join(folder, name);
    if (other !== file && name.startsWith('calc-worker-') && now - statSync(other).mtimeMs > KEEP_OLD_MS) {
      rmSync(other, { force: true });
    }
  }
  return true;
}

function buildWorker(root: string, outfile: string): void {
  buildSync({
    absWorkingDir: root,
    entryPoints: [path.join('lib', 'calc', 'sandbox', 'worker.ts')],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: `node${process.versions.node.split('.')[0]}`,
    // Function and class names as in the sources (messages and mathjs's typed functions may show them).
    keepNames: true,
    // The packages' CommonJS modules require Node's built-ins as they do when loaded from node_modules.
    banner: {
      js: "import { createRequire as __wsCreateRequire } from 'node:module'; const require = __wsCreateRequire(import.meta.url);",
    },
    logLevel: 'silent',
  });
}
