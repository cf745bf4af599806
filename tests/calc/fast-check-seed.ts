// One fast-check seed per test file, so that a property test is the same run every time and a
// failure can be replayed: the seed is printed when a test of the file fails, and
// WORLDSHEET_FC_SEED=<n> overrides it (to replay a failure, or to explore other runs on purpose).
// A property that passes only on some seeds is a wrong claim or a wrong tolerance: fix that, not the seed.
import fc from 'fast-check';
import { beforeEach } from 'vitest';

export function seedFastCheck(file: string, fileSeed: number): number {
  const fromEnv = process.env.WORLDSHEET_FC_SEED?.trim();
  const seed = fromEnv ? Number(fromEnv) : fileSeed;
  if (!Number.isSafeInteger(seed)) throw new Error(`WORLDSHEET_FC_SEED must be an integer; got ${fromEnv}`);
  fc.configureGlobal({ ...fc.readConfigureGlobal(), seed });
  beforeEach((context) => {
    context.onTestFailed(() => {
      console.error(`fast-check seed of ${file}: ${seed} (replay with WORLDSHEET_FC_SEED=${seed})`);
    });
  });
  return seed;
}
