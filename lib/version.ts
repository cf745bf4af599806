/** The app version from package.json, injected at build time by next.config.mjs. */
export const APP_VERSION: string = process.env.WORLDSHEET_VERSION ?? '0.0.0-dev';
