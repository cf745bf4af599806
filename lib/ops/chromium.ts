// Debian packages the tests need: Chromium drives the browser tests, and poppler-utils (pdfsig,
// pdftotext, pdfinfo, pdffonts, pdftoppm) checks the issued PDFs as an independent reader. The test
// command installs whichever is missing.
import { existsSync } from 'node:fs';
import { aptInstall } from '../../db/local-postgres';
import { config } from '../config';

export const CHROMIUM_PATH = config().WORLDSHEET_CHROMIUM;
const PDFSIG_PATH = '/usr/bin/pdfsig';

export function ensureChromium(log: (line: string) => void): void {
  const missing = [
    ...(existsSync(CHROMIUM_PATH) ? [] : ['chromium']),
    ...(existsSync(PDFSIG_PATH) ? [] : ['poppler-utils']),
  ];
  if (missing.length === 0) return;
  aptInstall(missing, log);
  if (!existsSync(CHROMIUM_PATH)) throw new Error(`Chromium is still missing at ${CHROMIUM_PATH} after installing it.`);
  if (!existsSync(PDFSIG_PATH))
    throw new Error(`pdfsig is still missing at ${PDFSIG_PATH} after installing poppler-utils.`);
}
