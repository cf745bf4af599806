// The Content-Security-Policy, HSTS and cookie settings of the app's server, as values: the browser
// tests (tests/e2e/edge.test.ts) check the plain-HTTP path on the served app.
import { expect, it } from 'vitest';
import { authCookies } from '../../lib/auth/auth-cookies';
import { contentSecurityPolicy, edgeHeaders, httpsEnabled, newNonce } from '../../lib/http/security-headers';

function directives(policy: string): Map<string, string[]> {
  return new Map(
    policy
      .split(';')
      .map((d) => d.trim().split(/\s+/))
      .map(([name, ...values]) => [name, values]),
  );
}

it('allows scripts only with the nonce (strict-dynamic), never inline, and locks framing, plugins, base and forms', () => {
  const nonce = newNonce();
  const d = directives(contentSecurityPolicy({ nonce }));
  expect(d.get('script-src')).toEqual(["'self'", `'nonce-${nonce}'`, "'strict-dynamic'"]);
  expect(d.get('script-src')).not.toContain("'unsafe-inline'");
  expect(d.get('script-src')).not.toContain("'unsafe-eval'");
  expect(d.get('default-src')).toEqual(["'self'"]);
  expect(d.get('object-src')).toEqual(["'none'"]);
  expect(d.get('base-uri')).toEqual(["'self'"]);
  expect(d.get('form-action')).toEqual(["'self'"]);
  expect(d.get('frame-ancestors')).toEqual(["'none'"]);
  expect(d.get('report-uri')).toEqual(['/api/csp-report']);
  // Inline styles (KaTeX, CodeMirror, Plot, React style attributes) cannot run code.
  expect(d.get('style-src')).toEqual(["'self'", "'unsafe-inline'"]);
});

it('uses a fresh 128-bit nonce each time and refuses one that would break the header', () => {
  const a = newNonce();
  expect(Buffer.from(a, 'base64')).toHaveLength(16);
  expect(newNonce()).not.toBe(a);
  expect(() => contentSecurityPolicy({ nonce: "x'; script-src *" })).toThrow();
});

it('adds eval only for next dev', () => {
  expect(directives(contentSecurityPolicy({ nonce: 'abc', dev: true })).get('script-src')).toContain("'unsafe-eval'");
});

it('over plain HTTP: no HSTS, no report-to (the Reporting API needs a secure origin), report-uri only', () => {
  const h = edgeHeaders({ nonce: 'abc', https: false });
  expect(Object.keys(h)).toEqual(['Content-Security-Policy']);
  expect(directives(h['Content-Security-Policy']).has('report-to')).toBe(false);
  expect(directives(h['Content-Security-Policy']).has('upgrade-insecure-requests')).toBe(false);
});

it('over HTTPS: HSTS for two years, report-to with its endpoint, and upgrade-insecure-requests', () => {
  const h = edgeHeaders({ nonce: 'abc', https: true });
  expect(h['Strict-Transport-Security']).toBe('max-age=63072000');
  expect(h['Reporting-Endpoints']).toBe('csp="/api/csp-report"');
  const d = directives(h['Content-Security-Policy']);
  expect(d.get('report-to')).toEqual(['csp']);
  expect(d.has('upgrade-insecure-requests')).toBe(true);
});

it('reads the HTTPS setting: WORLDSHEET_HTTPS first, else whether NEXTAUTH_URL is https', () => {
  expect(httpsEnabled({})).toBe(false);
  expect(httpsEnabled({ NEXTAUTH_URL: 'http://127.0.0.1:3000' })).toBe(false);
  expect(httpsEnabled({ NEXTAUTH_URL: 'https://calc.example.org' })).toBe(true);
  expect(httpsEnabled({ WORLDSHEET_HTTPS: '1', NEXTAUTH_URL: 'http://127.0.0.1:3000' })).toBe(true);
  expect(httpsEnabled({ WORLDSHEET_HTTPS: '0', NEXTAUTH_URL: 'https://calc.example.org' })).toBe(false);
});

it('over HTTPS every next-auth cookie is Secure and __Host- (Path=/, no Domain); over HTTP next-auth names, not Secure', () => {
  const secure = authCookies(true);
  for (const [key, cookie] of Object.entries(secure)) {
    expect(cookie.name, key).toMatch(/^__Host-next-auth\./);
    expect(cookie.options, key).toMatchObject({ secure: true, path: '/', httpOnly: true, sameSite: 'lax' });
    expect(cookie.options.domain, key).toBeUndefined();
  }
  expect(secure.sessionToken.name).toBe('__Host-next-auth.session-token');
  const plain = authCookies(false);
  expect(plain.sessionToken).toEqual({
    name: 'next-auth.session-token',
    options: { httpOnly: true, sameSite: 'lax', path: '/', secure: false },
  });
  for (const cookie of Object.values(plain)) expect(cookie.options.secure).toBe(false);
});
