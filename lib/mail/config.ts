// Mail settings shared by the sender (the job worker), the local capture server and the commands.
// A deployment points WORLDSHEET_SMTP_URL at its hosted mail service; `npm start` without
// DATABASE_URL runs the local capture server (lib/mail/capture-server.ts) and sends to it.
// The values come from lib/config.ts; `env`, when given, is parsed instead (the tests pass their own).
import { DEFAULTS, settingsOf, type Environment } from '@/lib/config';

export const DEFAULT_MAIL_FROM = DEFAULTS.WORLDSHEET_MAIL_FROM;

export function smtpPort(env?: Environment): number {
  return settingsOf(env).WORLDSHEET_SMTP_PORT;
}

export function mailCapturePort(env?: Environment): number {
  return settingsOf(env).WORLDSHEET_MAIL_CAPTURE_PORT;
}

/** Where mail is sent: WORLDSHEET_SMTP_URL, else the local capture server's SMTP port. */
export function smtpUrl(env?: Environment): string {
  const settings = settingsOf(env);
  return settings.WORLDSHEET_SMTP_URL ?? `smtp://127.0.0.1:${settings.WORLDSHEET_SMTP_PORT}`;
}

export function mailFrom(env?: Environment): string {
  return settingsOf(env).WORLDSHEET_MAIL_FROM;
}
