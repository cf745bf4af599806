// The data of the demo mailbox page (app/mailbox/page.tsx): the mail captured by the local demo
// mail server. There is no mailbox outside demo mode, where mail really goes out.
import { listCapturedMessages, type CapturedMessage } from './capture-client';

export type DemoMailbox =
  | { status: 'not-demo' }
  | { status: 'unavailable'; captureUrl: string | null; reason: string }
  | { status: 'ok'; captureUrl: string; messages: CapturedMessage[] };

type Env = Record<string, string | undefined>;

/** Only a demo installation (`npm start` without DATABASE_URL) has a mailbox. */
export function demoMailboxEnabled(env: Env = process.env): boolean {
  return env.WORLDSHEET_DEMO === '1';
}

export async function loadDemoMailbox(env: Env = process.env): Promise<DemoMailbox> {
  if (!demoMailboxEnabled(env)) return { status: 'not-demo' };
  const captureUrl = env.WORLDSHEET_MAIL_CAPTURE_URL;
  if (!captureUrl) {
    return { status: 'unavailable', captureUrl: null, reason: 'WORLDSHEET_MAIL_CAPTURE_URL is not set; `npm start` sets it.' };
  }
  try {
    const messages = await listCapturedMessages(captureUrl, { signal: AbortSignal.timeout(3000) });
    return { status: 'ok', captureUrl, messages };
  } catch (error) {
    const e = error as Error & { cause?: { message?: string } };
    return { status: 'unavailable', captureUrl, reason: e.cause?.message ?? e.message };
  }
}
