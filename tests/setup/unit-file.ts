// Each unit-tier file runs in a worker shared with other files (isolate: false, so the calculation
// library loads once per worker). What a file changes in the process is put back when it ends: the
// environment variables it set or removed, and the spies it left on shared modules.
import { afterAll, vi } from 'vitest';

const saved = { ...process.env };

afterAll(() => {
  vi.restoreAllMocks();
  vi.unstubAllEnvs();
  for (const name of Object.keys(process.env)) if (!(name in saved)) delete process.env[name];
  Object.assign(process.env, saved);
});
