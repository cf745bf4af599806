// Reads the local capture server's HTTP API (lib/mail/capture-server.ts). Used by the demo mailbox
// page and by the tests; it imports nothing Node-only, so the app can bundle it.

/** One message as the capture server received it. */
export interface CapturedMessage {
  id: string;
  /** The From header as written, e.g. `Worldsheet <no-reply@worldsheet.test>`. */
  from: string;
  /** The envelope recipients (every address the message was delivered to), lower case. */
  to: string[];
  subject: string;
  /** When the capture server received it, ISO 8601. */
  date: string;
  text: string;
  html: string | null;
  /** http(s) links found in the text (or, for an HTML-only message, in its hrefs), in order. */
  links: string[];
  /** The X-Worldsheet-Mail-Kind header (e.g. `verify-email`), when present. */
  kind: string | null;
}

const URL_IN_TEXT = /\bhttps?:\/\/[^\s<>"'()[\]{}]+/gi;
const TRAILING_PUNCTUATION = /[.,;:!?]+$/;

export type TextPart = { text: string } | { href: string };

/** Splits plain text into text and http(s) links (a sentence's final full stop stays text). */
export function splitLinks(text: string): TextPart[] {
  const parts: TextPart[] = [];
  let last = 0;
  for (const m of text.matchAll(URL_IN_TEXT)) {
    const href = m[0].replace(TRAILING_PUNCTUATION, '');
    if (m.index > last) parts.push({ text: text.slice(last, m.index) });
    parts.push({ href });
    last = m.index + href.length;
  }
  if (last < text.length) parts.push({ text: text.slice(last) });
  return parts;
}

function endpoint(baseUrl: string, path: string): string {
  return `${baseUrl.replace(/\/+$/, '')}${path}`;
}

async function ok(response: Response, what: string): Promise<Response> {
  if (!response.ok) throw new Error(`the mail capture server answered ${response.status} to ${what}`);
  return response;
}

/** Every captured message, newest first. */
export async function listCapturedMessages(baseUrl: string, init: RequestInit = {}): Promise<CapturedMessage[]> {
  const r = await ok(await fetch(endpoint(baseUrl, '/messages'), { cache: 'no-store', ...init }), 'GET /messages');
  return (await r.json()) as CapturedMessage[];
}

export async function getCapturedMessage(baseUrl: string, id: string): Promise<CapturedMessage | null> {
  const r = await fetch(endpoint(baseUrl, `/messages/${encodeURIComponent(id)}`), { cache: 'no-store' });
  if (r.status === 404) return null;
  return (await (await ok(r, 'GET /messages/:id')).json()) as CapturedMessage;
}

export async function clearCapturedMessages(baseUrl: string): Promise<void> {
  await ok(await fetch(endpoint(baseUrl, '/messages'), { method: 'DELETE' }), 'DELETE /messages');
}
