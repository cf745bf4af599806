// Violation reports as browsers send them, stored within caps (the report endpoint is open to anyone).
import { sql } from 'kysely';
import { expect, it } from 'vitest';
import { CSP_REPORT_LIMITS, parseCspReports, recordCspReports } from '../../lib/http/csp-reports';
import { testDb } from '../support/database';

// The report-uri form, as Chromium posts it (application/csp-report).
const reportUri = {
  'csp-report': {
    'document-uri': 'http://127.0.0.1:3000/projects',
    referrer: '',
    'violated-directive': 'script-src-elem',
    'effective-directive': 'script-src-elem',
    'original-policy': "default-src 'self'; script-src 'self' 'nonce-abc' 'strict-dynamic'",
    disposition: 'enforce',
    'blocked-uri': 'inline',
    'line-number': 12,
    'script-sample': 'alert(1)',
    'status-code': 200,
  },
};

// The Reporting API form (application/reports+json): a batch, possibly with other report types.
const reportingApi = [
  {
    type: 'csp-violation',
    age: 10,
    url: 'https://calc.example.org/checks',
    user_agent: 'Chromium',
    body: {
      documentURL: 'https://calc.example.org/checks',
      blockedURL: 'https://cdn.example/x.js',
      effectiveDirective: 'script-src-elem',
      disposition: 'enforce',
      sample: '',
      statusCode: 200,
    },
  },
  { type: 'deprecation', url: 'https://calc.example.org/', body: { id: 'x', message: 'y' } },
];

it('reads both forms and keeps only violations', () => {
  expect(parseCspReports(reportUri)).toEqual([
    expect.objectContaining({
      documentUri: 'http://127.0.0.1:3000/projects',
      blockedUri: 'inline',
      directive: 'script-src-elem',
      disposition: 'enforce',
    }),
  ]);
  expect(parseCspReports(reportingApi)).toEqual([
    expect.objectContaining({
      documentUri: 'https://calc.example.org/checks',
      blockedUri: 'https://cdn.example/x.js',
      directive: 'script-src-elem',
    }),
  ]);
  expect(() => parseCspReports({ hello: 'world' })).toThrow(/not a Content-Security-Policy violation report/);
  expect(() => parseCspReports('text')).toThrow();
});

it('cuts long text and nested values, and at most 20 reports of a batch', () => {
  const long = {
    'csp-report': {
      ...reportUri['csp-report'],
      'script-sample': 'x'.repeat(50_000),
      nested: { deep: 'x'.repeat(50_000) },
    },
  };
  const [v] = parseCspReports(long);
  expect((v.report['script-sample'] as string).length).toBe(CSP_REPORT_LIMITS.textChars);
  expect(v.report.nested).toBeUndefined();
  expect(parseCspReports(Array.from({ length: 100 }, () => reportingApi[0]))).toHaveLength(
    CSP_REPORT_LIMITS.reportsPerBody,
  );
});

it('stores reports in csp_reports with the sender address', async () => {
  const db = testDb();
  const outcome = await recordCspReports(db, {
    ip: '198.51.100.7',
    violations: [...parseCspReports(reportUri), ...parseCspReports(reportingApi)],
  });
  expect(outcome).toEqual({ stored: 2, limited: false });
  const rows = await db.selectFrom('csp_reports').selectAll().orderBy('id').execute();
  expect(rows.map((r) => [r.ip, r.directive, r.blocked_uri])).toEqual([
    ['198.51.100.7', 'script-src-elem', 'inline'],
    ['198.51.100.7', 'script-src-elem', 'https://cdn.example/x.js'],
  ]);
  expect(rows[0].report).toMatchObject({ 'script-sample': 'alert(1)', 'line-number': 12 });
});

it('caps reports per address, counted in one locked transaction even when posts race', async () => {
  const db = testDb();
  const [one] = parseCspReports(reportUri);
  const cap = CSP_REPORT_LIMITS.perAddress.count;
  // Twice the cap, posted 5 at a time concurrently from one address.
  const outcomes = await Promise.all(
    Array.from({ length: (2 * cap) / 5 }, () =>
      recordCspReports(db, { ip: '203.0.113.66', violations: Array(5).fill(one) }),
    ),
  );
  expect(outcomes.reduce((n, o) => n + o.stored, 0)).toBe(cap);
  expect(outcomes.filter((o) => o.limited)).toHaveLength(cap / 5);
  expect(outcomes.find((o) => o.limited)).toMatchObject({
    retryAfterSeconds: CSP_REPORT_LIMITS.perAddress.minutes * 60,
  });
  // Another address still gets through.
  expect(await recordCspReports(db, { ip: '203.0.113.67', violations: [one] })).toEqual({ stored: 1, limited: false });
});

it('caps reports from all addresses together and forgets them after 30 days', async () => {
  const db = testDb();
  const [one] = parseCspReports(reportUri);
  // The table as it would be after a day of reports from everywhere.
  await sql`insert into csp_reports (ip, report) select '192.0.2.' || (g % 250), '{}'::jsonb from generate_series(1, ${CSP_REPORT_LIMITS.overall.count}) g`.execute(
    db,
  );
  expect(await recordCspReports(db, { ip: '203.0.113.5', violations: [one] })).toEqual({
    stored: 0,
    limited: true,
    retryAfterSeconds: 3600,
  });
  await sql`update csp_reports set received_at = now() - interval '31 days'`.execute(db);
  expect(await recordCspReports(db, { ip: '203.0.113.5', violations: [one] })).toEqual({ stored: 1, limited: false });
  expect(
    Number(
      (
        await db
          .selectFrom('csp_reports')
          .select((eb) => eb.fn.countAll().as('n'))
          .executeTakeFirstOrThrow()
      ).n,
    ),
  ).toBe(1);
});
