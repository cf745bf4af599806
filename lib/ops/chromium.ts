// Debian's Chromium drives the browser tests; the test command installs it when it is missing.
import { existsSync } from 'node:fs';
import { aptInstall } from '../../db/local-postgres';

export const CHROMIUM_PATH = process.env.WORLDSHEET_CHROMIUM ?? '/usr/bin/chromium';

export function ensureChromium(log: (line: string) => void): void {
  if (existsSync(CHROMIUM_PATH)) return;
  aptInstall(['chromium'], log);
  if (!existsSync(CHROMIUM_PATH)) throw new Error(`Chromium is still missing at ${CHROMIUM_PATH} after installing it.`);
}
