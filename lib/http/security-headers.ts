// The headers the app's server (lib/ops/server.ts) puts on every response: the Content-Security-Policy
// with a fresh nonce per request and where browsers send its violation reports, and, when the app is
// served over HTTPS, Strict-Transport-Security.
//
// Next.js gives its own inline and bootstrap scripts the nonce it finds in the REQUEST's
// Content-Security-Policy header, so the server sets the same policy on the request it hands to Next
// and on the response. Scripts run only with the nonce ('strict-dynamic' lets those scripts load the
// app's chunks); no inline script runs without it. Styles allow 'unsafe-inline': KaTeX, CodeMirror,
// Observable Plot and React's style attributes write inline styles, which cannot run code.
import { randomBytes } from 'node:crypto';
import { settingsOf, type Environment } from '@/lib/config';

const CSP_REPORT_PATH = '/api/csp-report';
/** The Reporting API endpoint name the policy's report-to directive names. */
const CSP_REPORT_GROUP = 'csp';

/**
 * Whether the app is served over HTTPS: WORLDSHEET_HTTPS=1 (or 0 to say no), otherwise whether
 * NEXTAUTH_URL, the app's public address, starts with https:.
 */
export function httpsEnabled(env?: Environment): boolean {
  const settings = settingsOf(env);
  return settings.WORLDSHEET_HTTPS ?? /^https:/i.test(settings.NEXTAUTH_URL ?? '');
}

/** 128 random bits, base64: a fresh one for every response. */
export function newNonce(): string {
  return randomBytes(16).toString('base64');
}

export interface PolicyOptions {
  nonce: string;
  /** `next dev`: React's development build needs eval for its error overlay and call stacks. */
  dev?: boolean;
  https?: boolean;
}

export function contentSecurityPolicy({ nonce, dev = false, https = false }: PolicyOptions): string {
  if (!/^[A-Za-z0-9+/_-]+={0,2}$/.test(nonce)) throw new Error('a CSP nonce is base64');
  const directives: [string, ...string[]][] = [
    ['default-src', "'self'"],
    ['script-src', "'self'", `'nonce-${nonce}'`, "'strict-dynamic'", ...(dev ? ["'unsafe-eval'"] : [])],
    ['style-src', "'self'", "'unsafe-inline'"],
    ['img-src', "'self'", 'data:', 'blob:'],
    ['font-src', "'self'", 'data:'],
    ['connect-src', "'self'"],
    ['object-src', "'none'"],
    ['base-uri', "'self'"],
    ['form-action', "'self'"],
    ['frame-ancestors', "'none'"],
    ['report-uri', CSP_REPORT_PATH],
  ];
  // The Reporting API delivers only to secure origins, and a browser that sees report-to ignores
  // report-uri: over plain HTTP the policy names report-uri alone, so the reports still arrive.
  if (https) directives.push(['report-to', CSP_REPORT_GROUP], ['upgrade-insecure-requests']);
  return directives.map((d) => d.join(' ')).join('; ');
}

/** Two years, the figure the HSTS preload list asks for. */
const HSTS_MAX_AGE_SECONDS = 63_072_000;

/** The headers for one response; `nonce` must be the one also set on the request Next renders. */
export function edgeHeaders(options: PolicyOptions): Record<string, string> {
  const headers: Record<string, string> = { 'Content-Security-Policy': contentSecurityPolicy(options) };
  if (options.https) {
    headers['Reporting-Endpoints'] = `${CSP_REPORT_GROUP}="${CSP_REPORT_PATH}"`;
    headers['Strict-Transport-Security'] = `max-age=${HSTS_MAX_AGE_SECONDS}`;
  }
  return headers;
}
