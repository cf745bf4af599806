// The server's compute budgets through the production server: verification (a PDF whose signature
// holds a DER sequence of 4.5 million elements is refused unread, the server goes on answering,
// each address is rate limited), and evaluation (one user's flood of slow cells leaves another
// user's evaluation free to run and is refused beyond its share, with Retry-After; a request too
// large for one evaluation answers 413; results are cached per project only).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApiToken } from '../../lib/auth/api-tokens';
import { makeSheet } from '../support/approved-sheet';
import { resetDatabase, testDb } from '../support/database';
import { derSequenceOfNulls, pdfWithSignatureContents } from '../support/hostile-pdf';
import { makeProject, makeUser } from '../support/people';
import { startApp, type RunningApp } from './harness';

let app: RunningApp;
const tokens: Record<'a' | 'b' | 'c', string> = { a: '', b: '', c: '' };
const sheets: Record<'one' | 'two', string> = { one: '', two: '' };
const VERIFY_RATE = 5;

beforeAll(async () => {
  await resetDatabase();
  const [a, b, c] = await Promise.all(['flood', 'other', 'third'].map((n) => makeUser(testDb(), `${n}@example.test`)));
  const one = await makeProject(testDb(), 'ONE', [
    [a, 'viewer'],
    [b, 'originator'],
  ]);
  const two = await makeProject(testDb(), 'TWO', [[c, 'originator']]);
  sheets.one = (await makeSheet(testDb(), b, { id: one, code: 'ONE' }, { title: 'Dump power' })).id;
  sheets.two = (await makeSheet(testDb(), c, { id: two, code: 'TWO' }, { title: 'Dump power, elsewhere' })).id;
  tokens.a = (await createApiToken(testDb(), a, 'e2e')).token;
  tokens.b = (await createApiToken(testDb(), b, 'e2e')).token;
  tokens.c = (await createApiToken(testDb(), c, 'e2e')).token;
  app = await startApp({
    WORLDSHEET_VERIFY_RATE_PER_MINUTE: String(VERIFY_RATE),
    WORLDSHEET_CALC_WORKERS: '2',
    WORLDSHEET_CALC_TIMEOUT_MS: '4000',
  });
});

afterAll(async () => {
  await app?.stop();
});

function evaluate(who: keyof typeof tokens, body: unknown): Promise<Response> {
  return fetch(`${app.baseUrl}/api/evaluate`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${tokens[who]}` },
    body: JSON.stringify(body),
  });
}

describe('verification', () => {
  it('refuses a PDF whose signature is one DER sequence of 4.5 million elements (413, plain message), and /api/health answers meanwhile', async () => {
    const form = new FormData();
    form.append(
      'file',
      new Blob([new Uint8Array(pdfWithSignatureContents(derSequenceOfNulls(4_500_000)))], { type: 'application/pdf' }),
      'hostile.pdf',
    );
    const verifying = fetch(`${app.baseUrl}/api/verify`, { method: 'POST', body: form });
    const health = await fetch(`${app.baseUrl}/api/health`);
    expect(health.status).toBe(200);
    const response = await verifying;
    expect(response.status).toBe(413);
    const body = await response.json();
    expect(body.error.message).toMatch(/^Not an authentic issued revision: signature container too large/);
  });

  it(`answers 429 with Retry-After once an address has verified ${VERIFY_RATE} times in a minute`, async () => {
    // The refused PDF above counted as one.
    const statuses: number[] = [];
    let last: Response | null = null;
    for (let i = 0; i < VERIFY_RATE; i++) {
      last = await fetch(`${app.baseUrl}/api/verify`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ code: 'ZZZZ-ZZZZ-ZZZZ' }),
      });
      statuses.push(last.status);
    }
    expect(statuses).toEqual([...Array(VERIFY_RATE - 1).fill(200), 429]);
    const retryAfter = Number(last!.headers.get('retry-after'));
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    expect(retryAfter).toBeLessThanOrEqual(60);
    expect((await last!.json()).error).toMatchObject({ code: 'too_many_requests' });
  });
});

describe('evaluation', () => {
  const SLOW = [{ id: 's', kind: 'calc', source: 'f(x) = x > 0 ? f(x - 1) + f(x - 1) : 0\ny_s = f(60)' }];

  it(
    'serves another user while one floods slow cells; the flood is refused beyond its share with Retry-After',
    { timeout: 120_000 },
    async () => {
      // Warm both workers so that the comparison below is of scheduling, not of start-up.
      await Promise.all([
        evaluate('b', { cells: [{ id: 'w', kind: 'calc', source: 'w_1 = 1 m' }] }),
        evaluate('c', { cells: [{ id: 'w', kind: 'calc', source: 'w_2 = 2 m' }] }),
      ]);
      // Seven at once: two are taken (one runs, one waits its turn), five are refused.
      const answered = { ok: 0 };
      const flood = Array.from({ length: 7 }, () =>
        evaluate('a', { cells: SLOW }).then((r) => {
          if (r.status === 200) answered.ok++;
          return r;
        }),
      );
      const other = await evaluate('b', { cells: [{ id: 'k', kind: 'calc', source: 'E_k = 250 MeV\nE_2 = 2 * E_k' }] });
      expect(other.status).toBe(200);
      // Answered while none of the flood's slow cells had yet run into the time limit.
      expect(answered.ok).toBe(0);
      const responses = await Promise.all(flood);
      const refused = responses.filter((r) => r.status === 429);
      expect(refused).toHaveLength(5);
      for (const r of refused) {
        expect(Number(r.headers.get('retry-after'))).toBe(4);
        expect((await r.json()).error.message).toMatch(
          /^You have 2 evaluations in progress already; at most 2 at a time\./,
        );
      }
      const taken = responses.filter((r) => r.status !== 429);
      expect(taken.map((r) => r.status)).toEqual([200, 200]);
      for (const r of taken)
        expect((await r.json()).cells[0].error).toBe('stopped after 4 s: this cell takes longer than the time limit');
    },
  );

  it('answers 413 with what to reduce for 1,000 cells of 60 statements', async () => {
    const cells = Array.from({ length: 1000 }, (_, i) => ({
      id: `c${i}`,
      kind: 'calc',
      source: Array.from({ length: 60 }, (_, j) => `v_${i}_${j} = ${j} m`).join('\n'),
    }));
    const response = await evaluate('b', { cells });
    expect(response.status).toBe(413);
    expect((await response.json()).error.message).toBe(
      'This evaluation holds 60,000 statements; at most 20,000 are evaluated in one request. Evaluate fewer cells at a time (split the sheet), or fewer statements per cell.',
    );
  });

  it('does not tell another project that a cell was evaluated before (the cache is per project)', async () => {
    const cells = [{ id: 'p', kind: 'calc', source: 'I_beam = 312.5 mA\nP_dump = I_beam * 6.5 MV' }];
    const first = await (await evaluate('b', { cells, sheetId: sheets.one, sheetKey: sheets.one })).json();
    expect(first.evaluatedCells).toBe(1);
    const again = await (await evaluate('b', { cells, sheetId: sheets.one, sheetKey: sheets.one })).json();
    expect(again.evaluatedCells).toBe(0);
    const elsewhere = await (await evaluate('c', { cells, sheetId: sheets.two, sheetKey: sheets.two })).json();
    expect(elsewhere.evaluatedCells).toBe(1);
    // A sheet of a project the caller is not a member of is not a way into its scope.
    expect((await evaluate('c', { cells, sheetId: sheets.one })).status).toBe(404);
  });
});
