// Four tiers, run by `npm test` (lib/ops/test-tiers.ts) and each on its own with `npm run test:unit`,
// `test:database`, `test:processes`, `test:browser`:
//   unit      pure code: files in parallel, no PostgreSQL, no fakes, no table truncation, no server or
//             worker processes of its own (the PDF tests only read their output with poppler's tools);
//             one module cache per worker (isolate: false), so mathjs and the library load once;
//   database  the real PostgreSQL test cluster, mail capture and object store (tests/setup/), one file at a
//             time because the files share one database and reset it between tests;
//   processes tests/processes/, the tests that start processes of their own (the calculation CLI, the
//             sandbox's workers, time and memory limits): no database; their time is spent waiting on
//             those processes, so `npm test` runs them beside the database tier;
//   browser   the built app in headless Chromium and over HTTP (tests/e2e/), on the same services.
// A new pure test goes in a unit folder (or the UNIT list); anything else lands in the database tier.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export const UNIT = [
  'tests/calc/**/*.test.ts',
  'tests/ui/**/*.test.ts',
  'tests/http/client-address.test.ts',
  'tests/http/request-guard.test.ts',
  'tests/http/same-origin.test.ts',
  'tests/http/security-headers.test.ts',
  'tests/fonts/**/*.test.ts',
  'tests/lint/**/*.test.ts',
  'tests/unit/**/*.test.ts',
  'tests/api/openapi.test.ts',
  'tests/checks/alternate-comparison.test.ts',
  'tests/checks/submission-findings.test.ts',
  'tests/checks/policy.test.ts',
  'tests/issue/pdf-acknowledgements.test.ts',
  'tests/issue/pdf-alternate-comparison.test.ts',
  'tests/issue/pdf-render.test.ts',
  'tests/issue/pdf-warnings.test.ts',
  'tests/issue/plot-pdf.test.ts',
  'tests/issue/signing.test.ts',
  'tests/ops/server.test.ts',
  'tests/ops/config.test.ts',
  'tests/sheets/compare.test.ts',
  'tests/sheets/content-hash.test.ts',
  'tests/sheets/result-rows.test.ts',
  'tests/sheets/markdown.test.ts',
  'tests/audit/sentences.test.ts',
];
export const BROWSER = ['tests/e2e/**/*.test.ts'];
/** Tests that start processes of their own (the calculation CLI, the sandbox's workers and limits): no database. */
export const PROCESSES = ['tests/processes/**/*.test.ts'];

const services = {
  globalSetup: ['tests/setup/global-setup.ts'],
  setupFiles: ['tests/setup/each-file.ts'],
  // The files share one database and reset it between tests, so they run one at a time.
  fileParallelism: false,
};

export default defineConfig({
  root,
  resolve: { alias: { '@': root } },
  test: {
    environment: 'node',
    testTimeout: 30_000,
    hookTimeout: 600_000,
    projects: [
      {
        extends: true,
        test: { name: 'unit', include: UNIT, isolate: false, setupFiles: ['tests/setup/unit-file.ts'] },
      },
      {
        extends: true,
        test: {
          name: 'database',
          include: ['tests/**/*.test.ts'],
          exclude: [...UNIT, ...BROWSER, ...PROCESSES],
          ...services,
        },
      },
      {
        extends: true,
        // One file at a time: their time is spent waiting on the processes they start and on real time limits.
        test: { name: 'processes', include: PROCESSES, fileParallelism: false },
      },
      {
        extends: true,
        // One app for the files that need no app of their own (tests/setup/browser-app.ts).
        test: {
          name: 'browser',
          include: BROWSER,
          ...services,
          globalSetup: [...services.globalSetup, 'tests/setup/browser-app.ts'],
        },
      },
    ],
  },
});
