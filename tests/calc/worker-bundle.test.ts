// The evaluation worker's prebuilt file is used only for the sources it was built from: any change
// under lib/calc (or to the package lock) names another file, so a worker never runs stale code
// (lib/calc/sandbox/worker-bundle.ts).
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { currentWorkerBundle, workerBundlePath, workerSourceHash } from '../../lib/calc/sandbox/worker-bundle';

function project(): string {
  const root = mkdtempSync(path.join(tmpdir(), 'ws-worker-bundle-'));
  mkdirSync(path.join(root, 'lib', 'calc', 'engine'), { recursive: true });
  writeFileSync(path.join(root, 'lib', 'calc', 'a.ts'), 'export const a = 1;\n');
  writeFileSync(path.join(root, 'lib', 'calc', 'engine', 'b.ts'), 'export const b = 2;\n');
  writeFileSync(path.join(root, 'package-lock.json'), '{"lockfileVersion":3}\n');
  return root;
}

function build(root: string): string {
  const entry = workerBundlePath(workerSourceHash(root));
  mkdirSync(path.dirname(path.join(root, entry)), { recursive: true });
  writeFileSync(path.join(root, entry), '// built\n');
  return entry;
}

describe('the prebuilt evaluation worker', () => {
  it('is none until built, then the file built for these sources', () => {
    const root = project();
    expect(currentWorkerBundle(root)).toBeNull();
    const entry = build(root);
    expect(currentWorkerBundle(root)).toBe(entry);
  });

  it.each([
    [
      'a file of lib/calc edited',
      (root: string) => writeFileSync(path.join(root, 'lib', 'calc', 'a.ts'), 'export const a = 3;\n'),
    ],
    [
      'a nested file edited',
      (root: string) => writeFileSync(path.join(root, 'lib', 'calc', 'engine', 'b.ts'), 'export const b = 4;\n'),
    ],
    ['a file added', (root: string) => writeFileSync(path.join(root, 'lib', 'calc', 'c.ts'), 'export {};\n')],
    [
      'the package lock changed',
      (root: string) => writeFileSync(path.join(root, 'package-lock.json'), '{"lockfileVersion":4}\n'),
    ],
  ])('is not used once %s', (_what, change) => {
    const root = project();
    build(root);
    change(root);
    expect(currentWorkerBundle(root)).toBeNull();
  });

  it('does not depend on files outside lib/calc', () => {
    const root = project();
    const entry = build(root);
    mkdirSync(path.join(root, 'lib', 'sheets'));
    writeFileSync(path.join(root, 'lib', 'sheets', 'x.ts'), 'export {};\n');
    expect(currentWorkerBundle(root)).toBe(entry);
  });
});
