// Route handlers are thin adapters: parse (zod), authorize, call lib/, map errors.
// Every handler runs inside `handle(request, fn)`, which first applies the one request guard:
//  - a state-changing request (anything but GET, HEAD, OPTIONS) that carries cookies and no
//    Authorization header, so that a session cookie is what authenticates it, must come from the
//    app's own origin: its Origin header equal to the app's origin (NEXTAUTH_URL), or, when a browser
//    sends no Origin, Sec-Fetch-Site: same-origin. Neither: 403. A page of another site (another port
//    of the same host included) cannot meet that, whatever SameSite lets through.
//  - such a request's body must be application/json (or multipart/form-data on the routes that take
//    a file): 415 otherwise, so the content types an HTML form can send cross-site (text/plain,
//    application/x-www-form-urlencoded) are refused before anything reads them.
//  - requests with an API token (Authorization: Bearer) are not subject to either rule (no browser
//    attaches one by itself), but a read-only token may only read: 403 for anything but GET and HEAD.
// The next-auth route (app/api/auth/[...nextauth]) is outside: next-auth checks its own
// double-submit CSRF token on every POST that signs in or out. So is the CSP report sink
// (app/api/csp-report), which browsers post to themselves in their own content types and which
// reads no session.
import type { ZodType } from 'zod';
import { AppError, errorResponse, unstorableTextPath } from '@/lib/errors/app-error';
import { appUrl } from '@/lib/http/app-url';
import { readJsonBody } from '@/lib/http/body';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export interface GuardOptions {
  /** The route takes a file as multipart/form-data (besides, or instead of, JSON). */
  multipart?: boolean;
}

function mediaType(request: Request): string | null {
  const header = request.headers.get('content-type');
  return header === null ? null : header.split(';')[0].trim().toLowerCase();
}

function hasBody(request: Request): boolean {
  const length = request.headers.get('content-length');
  return (length !== null && length.trim() !== '0') || request.headers.has('transfer-encoding');
}

/** The origin and content-type rule for a state change a browser may have made with the person's cookies. */
function checkBrowserWrite(request: Request, options: GuardOptions = {}): void {
  const origin = request.headers.get('origin');
  const own = new URL(appUrl()).origin;
  if (origin !== null) {
    if (origin !== own)
      throw new AppError(
        'forbidden',
        `Refused: this request comes from another site (${origin.slice(0, 100)}), not from ${own}.`,
      );
  } else if (request.headers.get('sec-fetch-site') !== 'same-origin') {
    throw new AppError(
      'forbidden',
      `Refused: a change made with a browser session must come from the app's own pages (${own}); the request said neither Origin nor Sec-Fetch-Site: same-origin. Scripts use an API token.`,
    );
  }
  const type = mediaType(request);
  const allowed = options.multipart ? ['application/json', 'multipart/form-data'] : ['application/json'];
  if (type === null ? hasBody(request) : !allowed.includes(type)) {
    throw new AppError(
      'unsupported_type',
      `Send the request body as ${allowed.join(' or ')}${type ? `, not ${type}` : ''}.`,
    );
  }
}

/** The request guard described above; throws the refusal. */
async function guardRequest(request: Request, options: GuardOptions = {}): Promise<void> {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return;
  if (!request.headers.has('authorization')) {
    // Without cookies there is no session for another site to borrow: the handler answers 401, or
    // serves the public routes (verification, reset requests) to scripts as to anyone.
    if (request.headers.has('cookie')) checkBrowserWrite(request, options);
    return;
  }
  // Loaded here, not at the top: lib/auth/current-actor is server-only (next/headers), and this
  // module's parsers are also used outside a request.
  const { getActor } = await import('@/lib/auth/current-actor');
  const actor = await getActor();
  if (actor?.tokenScope === 'read')
    throw new AppError('forbidden', 'This API token is read-only: it may only make GET and HEAD requests.');
}

export async function handle(
  request: Request,
  fn: () => Promise<Response>,
  options: GuardOptions = {},
): Promise<Response> {
  try {
    await guardRequest(request, options);
    return await fn();
  } catch (error) {
    return errorResponse(error);
  }
}

export async function parseJson<T>(request: Request, schema: ZodType<T>, maxBytes = 64 * 1024): Promise<T> {
  const body = await readJsonBody(request, maxBytes);
  return parseValue(body, schema);
}

export function parseValue<T>(value: unknown, schema: ZodType<T>): T {
  const unstorable = unstorableTextPath(value);
  if (unstorable !== null) {
    throw new AppError(
      'bad_request',
      `${unstorable || 'body'}: holds a character that cannot be stored (U+0000, or half of a surrogate pair)`,
    );
  }
  const parsed = schema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new AppError(
      'bad_request',
      `${issue.path.join('.') || 'body'}: ${issue.message}`,
      parsed.error.issues.slice(0, 10),
    );
  }
  return parsed.data;
}

export function searchParams(request: Request): Record<string, string> {
  return Object.fromEntries(new URL(request.url).searchParams.entries());
}
