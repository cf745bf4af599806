// Where browsers send Content-Security-Policy violation reports (the policy's report-uri and
// report-to, lib/http/security-headers.ts). Unauthenticated: anyone may post, within the caps of
// lib/http/csp-reports.ts (body size, reports per address and in all), answered 204, or 429 past a cap.
//
// Outside the shared request guard (lib/http/route.ts handle): a browser posts its reports itself, as
// application/csp-report or application/reports+json, with the page's cookies for report-uri; the
// route reads no session and changes nothing that belongs to anyone.
import { getDb } from '@/db';
import { AppError, errorResponse } from '@/lib/errors/app-error';
import { readBodyBytes } from '@/lib/http/body';
import { clientAddress } from '@/lib/http/client-address';
import { CSP_REPORT_LIMITS, CSP_REPORT_TYPES, parseCspReports, recordCspReports } from '@/lib/http/csp-reports';

export async function POST(request: Request): Promise<Response> {
  try {
    const type = request.headers.get('content-type')?.split(';')[0].trim().toLowerCase() ?? '';
    if (!(CSP_REPORT_TYPES as readonly string[]).includes(type)) {
      throw new AppError('unsupported_type', `Send a report as ${CSP_REPORT_TYPES.join(' or ')}.`);
    }
    const bytes = await readBodyBytes(request, CSP_REPORT_LIMITS.bodyBytes);
    let body: unknown;
    try {
      body = JSON.parse(new TextDecoder().decode(bytes));
    } catch {
      throw new AppError('bad_request', 'The report is not valid JSON.');
    }
    const outcome = await recordCspReports(getDb(), {
      ip: clientAddress(request.headers),
      violations: parseCspReports(body),
    });
    if (outcome.limited) {
      throw new AppError(
        'too_many_requests',
        'Too many reports from this address just now; the rest were dropped.',
        { stored: outcome.stored },
        outcome.retryAfterSeconds,
      );
    }
    return new Response(null, { status: 204 });
  } catch (error) {
    return errorResponse(error);
  }
}
