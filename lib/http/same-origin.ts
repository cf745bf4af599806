// Where the app may send a browser after signing in: a path on its own origin, never another host.
//
// A prefix test ("starts with / but not //") lets `/\evil.example/` through: browsers read the
// backslash as a slash, so `/\evil.example` is protocol-relative. The URL parser is the one the browser
// uses, so the callback is resolved against the app's own origin with it and kept only when the
// origin stays the same.

export class InvalidCallbackUrl extends Error {
  constructor() {
    super('The callback URL is not a valid URL.');
    this.name = 'InvalidCallbackUrl';
  }
}

/**
 * The path, query and fragment of `value` resolved against `origin`, when it stays on that origin;
 * `fallback` when it leaves it (or is empty). Throws InvalidCallbackUrl when the URL parser refuses
 * `value` even relative to the origin (for instance `http://[`).
 */
export function sameOriginPath(value: string | null | undefined, origin: string, fallback: string): string {
  if (!value) return fallback;
  const own = new URL(origin).origin;
  let url: URL;
  try {
    url = new URL(value, own);
  } catch {
    throw new InvalidCallbackUrl();
  }
  if (url.origin !== own) return fallback;
  // `/.//evil.example` parses to the path `//evil.example`, which is protocol-relative when written
  // into a link: one leading slash only.
  return `${url.pathname.replace(/^\/+/, '/')}${url.search}${url.hash}`;
}

/** sameOriginPath, with the fallback also for a value the URL parser refuses (for a page that only renders). */
export function safeSameOriginPath(value: string | null | undefined, origin: string, fallback: string): string {
  try {
    return sameOriginPath(value, origin, fallback);
  } catch (error) {
    if (error instanceof InvalidCallbackUrl) return fallback;
    throw error;
  }
}

/**
 * Whether next-auth accepts `value` as a callback URL: an absolute http(s) URL, or a path starting
 * with `/`. next-auth answers 500 ("a problem with the server configuration") for any other value in
 * the callbackUrl parameter or cookie, so its route refuses those first with 400.
 */
export function isAcceptableCallbackUrl(value: string, origin: string): boolean {
  try {
    return /^https?:$/.test(new URL(value, value.startsWith('/') ? origin : undefined).protocol);
  } catch {
    return false;
  }
}
