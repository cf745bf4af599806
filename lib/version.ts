import { config } from './config';

/** The app version from package.json, injected at build time by next.config.mjs (see lib/config.ts). */
export const APP_VERSION: string = config().WORLDSHEET_VERSION;
