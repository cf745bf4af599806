// The data of the demo mailbox page (app/mailbox/page.tsx): the mail captured by the local demo
// mail server. There is no mailbox outside demo mode, where mail really goes out.
//
// The captured mail holds sign-in, reset, unlock and invitation links, so the mailbox is a person's
// own inbox, not a public board: signed out, nothing is read from the capture server at all; a
// signed-in person gets only the messages addressed to them; an administrator may read every
// message, and each such reading is recorded in the audit trail (mail.mailbox-read-all).
import type { Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import { settingsOf, type Environment } from '@/lib/config';
import { listCapturedMessages, type CapturedMessage } from './capture-client';

export type DemoMailbox =
  | { status: 'not-demo' }
  | { status: 'signed-out' }
  | { status: 'unavailable'; captureUrl: string | null; reason: string }
  /** `scope` 'own': the messages addressed to `viewerEmail`; 'all': every message (an administrator). */
  | { status: 'ok'; captureUrl: string; scope: 'own' | 'all'; viewerEmail: string; messages: CapturedMessage[] };

/** Only a demo installation (`npm start` without DATABASE_URL) has a mailbox. */
export function demoMailboxEnabled(env?: Environment): boolean {
  return settingsOf(env).WORLDSHEET_DEMO;
}

export async function loadDemoMailbox(
  db: Kysely<Database>,
  viewer: Actor | null,
  env?: Environment,
): Promise<DemoMailbox> {
  const settings = settingsOf(env);
  if (!settings.WORLDSHEET_DEMO) return { status: 'not-demo' };
  if (!viewer) return { status: 'signed-out' };
  const captureUrl = settings.WORLDSHEET_MAIL_CAPTURE_URL;
  if (!captureUrl) {
    return {
      status: 'unavailable',
      captureUrl: null,
      reason: 'WORLDSHEET_MAIL_CAPTURE_URL is not set; `npm start` sets it.',
    };
  }
  let captured: CapturedMessage[];
  try {
    captured = await listCapturedMessages(captureUrl, { signal: AbortSignal.timeout(3000) });
  } catch (error) {
    const e = error as Error & { cause?: { message?: string } };
    return { status: 'unavailable', captureUrl, reason: e.cause?.message ?? e.message };
  }
  const email = viewer.email.toLowerCase();
  if (!viewer.isAdmin) {
    return {
      status: 'ok',
      captureUrl,
      scope: 'own',
      viewerEmail: email,
      messages: captured.filter((m) => m.to.some((to) => to.toLowerCase() === email)),
    };
  }
  await recordAudit(db, viewer, {
    action: 'mail.mailbox-read-all',
    objectType: 'mailbox',
    newValue: { messages: captured.length, ids: captured.map((m) => m.id) },
  });
  return { status: 'ok', captureUrl, scope: 'all', viewerEmail: email, messages: captured };
}
