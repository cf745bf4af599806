// The whole project (app, components, lib, db, migrations, tests) type-checks under strict mode.
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { expect, it } from 'vitest';

it('passes tsc --noEmit', () => {
  const r = spawnSync(
    process.execPath,
    [path.join('node_modules', 'typescript', 'bin', 'tsc'), '--noEmit', '-p', 'tsconfig.json'],
    { cwd: process.cwd(), encoding: 'utf8', timeout: 300_000 },
  );
  expect(`${r.stdout}${r.stderr}`.trim()).toBe('');
  expect(r.status).toBe(0);
}, 300_000);
