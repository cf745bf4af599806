// The names and attributes of next-auth's cookies. Served over HTTPS (lib/http/security-headers.ts
// httpsEnabled) every one is Secure and carries the __Host- prefix, which the browser accepts only
// from a secure origin, with Path=/ and no Domain: no other host of the domain, and no plain-HTTP
// page, can set or overwrite the session cookie. Over plain HTTP (the local demo) next-auth's own
// names stay, without Secure, or the browser would refuse them.
import type { CookiesOptions } from 'next-auth';

const FIFTEEN_MINUTES = 15 * 60;

export function authCookies(https: boolean): CookiesOptions {
  const prefix = https ? '__Host-' : '';
  const base = { httpOnly: true, sameSite: 'lax' as const, path: '/', secure: https };
  return {
    sessionToken: { name: `${prefix}next-auth.session-token`, options: base },
    callbackUrl: { name: `${prefix}next-auth.callback-url`, options: base },
    csrfToken: { name: `${prefix}next-auth.csrf-token`, options: base },
    pkceCodeVerifier: { name: `${prefix}next-auth.pkce.code_verifier`, options: { ...base, maxAge: FIFTEEN_MINUTES } },
    state: { name: `${prefix}next-auth.state`, options: { ...base, maxAge: FIFTEEN_MINUTES } },
    nonce: { name: `${prefix}next-auth.nonce`, options: base },
  };
}
