import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export default defineConfig({
  root,
  resolve: { alias: { '@': root } },
  test: {
    include: ['tests/**/*.test.ts'],
    environment: 'node',
    globalSetup: ['tests/setup/global-setup.ts'],
    setupFiles: ['tests/setup/each-file.ts'],
    // Database tests share one database and reset it between tests, so files run one at a time.
    fileParallelism: false,
    testTimeout: 30_000,
    hookTimeout: 600_000,
  },
});
