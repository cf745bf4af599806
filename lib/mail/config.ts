// Mail settings shared by the sender (the job worker), the local capture server and the commands.
// A deployment points WORLDSHEET_SMTP_URL at its hosted mail service; `npm start` without
// DATABASE_URL runs the local capture server (lib/mail/capture-server.ts) and sends to it.

/** `npm start`'s capture server: SMTP on 2525, its HTTP API on 2580 (the tests use other ports). */
export const DEFAULT_SMTP_PORT = 2525;
export const DEFAULT_MAIL_CAPTURE_PORT = 2580;
export const DEFAULT_MAIL_FROM = 'Worldsheet <no-reply@worldsheet.test>';

export function smtpPort(env: NodeJS.ProcessEnv = process.env): number {
  return Number(env.WORLDSHEET_SMTP_PORT ?? DEFAULT_SMTP_PORT);
}

export function mailCapturePort(env: NodeJS.ProcessEnv = process.env): number {
  return Number(env.WORLDSHEET_MAIL_CAPTURE_PORT ?? DEFAULT_MAIL_CAPTURE_PORT);
}

/** Where mail is sent: WORLDSHEET_SMTP_URL, else the local capture server's SMTP port. */
export function smtpUrl(env: NodeJS.ProcessEnv = process.env): string {
  return env.WORLDSHEET_SMTP_URL || `smtp://127.0.0.1:${smtpPort(env)}`;
}

export function mailFrom(env: NodeJS.ProcessEnv = process.env): string {
  return env.WORLDSHEET_MAIL_FROM || DEFAULT_MAIL_FROM;
}
