// The client components' one typed client of the routes (components/data/api-client.ts): what it sends
// (same-origin JSON, multipart, or a sheet file's text as it is), how it parses answers with the
// documented response schemas, and how every failure becomes one ApiError the forms show. The error
// body is the one of lib/errors/app-error.ts; fetch is stubbed, the server is not involved.
import { afterEach, expect, it, vi } from 'vitest';
import { api, ApiError, detail, errorText } from '../../components/data/api-client';
import { postEvaluation } from '../../components/calc/one-evaluation-at-a-time';

const SHA = 'a'.repeat(64);
const CHECK = '6f1c2a9e-3b7d-4c1e-9a2f-0d8e7b6c5a41';

function answer(status: number, body: unknown, headers: Record<string, string> = {}): Response {
  const text = typeof body === 'string' ? body : JSON.stringify(body);
  return new Response(status === 204 ? null : text, { status, headers });
}

function stubFetch(...responses: Array<Response | Error>) {
  const calls: Array<{ url: string; init: RequestInit }> = [];
  const queue = [...responses];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string, init: RequestInit) => {
      calls.push({ url, init });
      const next = queue.shift();
      if (!next) throw new Error('no answer stubbed');
      if (next instanceof Error) throw next;
      return next;
    }),
  );
  return calls;
}

async function failure(promise: Promise<unknown>): Promise<ApiError> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(ApiError);
  return error as ApiError;
}

afterEach(() => {
  vi.unstubAllGlobals();
  vi.useRealTimers();
});

it('sends JSON to the route and returns the answer parsed by its response schema', async () => {
  const calls = stubFetch(answer(201, { number: 4, sha256: SHA, ok: true, extra: 'not documented' }));
  const saved = await api.saveVersion('5d1e', {
    parentNumber: 3,
    message: 'fix',
    content: { cells: [] } as never,
  });
  expect(saved).toEqual({ number: 4, sha256: SHA, ok: true });
  expect(calls).toHaveLength(1);
  expect(calls[0].url).toBe('/api/sheets/5d1e/versions');
  expect(calls[0].init.method).toBe('POST');
  expect(calls[0].init.headers).toEqual({ 'content-type': 'application/json' });
  expect(JSON.parse(String(calls[0].init.body))).toEqual({ parentNumber: 3, message: 'fix', content: { cells: [] } });
});

it("turns the server's error body into an ApiError with its status, code, message and details", async () => {
  stubFetch(
    answer(409, {
      error: {
        code: 'conflict',
        message: 'Version 3 is not the latest: version 5 is.',
        details: { latestNumber: 5, latestSha256: SHA },
      },
    }),
  );
  const error = await failure(api.saveVersion('5d1e', { parentNumber: 3, message: '', content: {} as never }));
  expect(error.status).toBe(409);
  expect(error.code).toBe('conflict');
  expect(error.message).toBe('Version 3 is not the latest: version 5 is.');
  expect(detail(error, 'latestNumber')).toBe(5);
  expect(detail(error, 'missing')).toBeUndefined();
  expect(errorText(error, 'not shown: the server answered')).toBe('Version 3 is not the latest: version 5 is.');
});

it('says the status when an error answer has no error body (a proxy page, an empty body)', async () => {
  stubFetch(answer(502, '<html>Bad gateway</html>'), answer(500, { message: 'not our error body' }));
  const gateway = await failure(api.decide(CHECK, { action: 'sign', password: 'x' }));
  expect(gateway.status).toBe(502);
  expect(gateway.code).toBe('http_error');
  expect(gateway.message).toBe('The server answered 502.');
  expect(gateway.details).toBeUndefined();
  const other = await failure(api.decide(CHECK, { action: 'sign', password: 'x' }));
  expect(other.message).toBe('The server answered 500.');
});

it('says the server could not be reached when no answer arrives, in the words the form gives', async () => {
  stubFetch(new TypeError('Failed to fetch'));
  const error = await failure(api.issueJob(CHECK));
  expect(error.status).toBeNull();
  expect(error.code).toBe('unreachable');
  expect(error.cause).toBeInstanceOf(TypeError);
  expect(errorText(error)).toBe('The server could not be reached.');
  expect(errorText(error, 'The server could not be reached; nothing was decided.')).toBe(
    'The server could not be reached; nothing was decided.',
  );
  expect(errorText(new Error('a bug'))).toBe('The server could not be reached.');
});

it('refuses a success answer that is not as documented instead of showing a wrong value', async () => {
  stubFetch(answer(201, { id: CHECK, state: 'in_check', versionNumber: 'three', sha256: SHA }));
  const error = await failure(
    api.submitForCheck('5d1e', { versionNumber: 3, checkerId: CHECK, password: 'x', acknowledgements: [] }),
  );
  expect(error.status).toBe(201);
  expect(error.code).toBe('unexpected_answer');
  expect(error.message).toContain('versionNumber');
});

it('takes only the status a route answers on success where it names one (issuing answers 202)', async () => {
  stubFetch(
    answer(200, { jobId: CHECK, revision: 'A', versionNumber: 2 }),
    answer(202, { jobId: CHECK, revision: 'A', versionNumber: 2 }),
  );
  const error = await failure(api.issueRevision('5d1e', { versionNumber: 2, password: 'x' }));
  expect(error.status).toBe(200);
  await expect(api.issueRevision('5d1e', { versionNumber: 2, password: 'x' })).resolves.toEqual({
    jobId: CHECK,
    revision: 'A',
    versionNumber: 2,
  });
});

it('sends a file as multipart (the browser sets the boundary) and a sheet file as its own text', async () => {
  const calls = stubFetch(
    answer(201, {
      name: 'loads.csv',
      mediaType: 'text/csv',
      size: 12,
      sha256: SHA,
      uploadedBy: 'Originator',
      uploadedAt: '2026-12-04T10:00:00.000Z',
      table: { name: 'loads', rows: 2, columns: [{ name: 'F', unit: 'N' }] },
    }),
    answer(400, { error: { code: 'bad_request', message: 'cells: expected array' } }),
  );
  const file = new File(['F [N]\n1\n2\n'], 'loads.csv', { type: 'text/csv' });
  const info = await api.uploadAttachment('5d1e', file);
  expect(info.table?.columns).toEqual([{ name: 'F', unit: 'N' }]);
  expect(calls[0].init.headers).toBeUndefined();
  expect((calls[0].init.body as FormData).get('file')).toBeInstanceOf(File);

  const text = '{ "format": "worldsheet-sheet" }';
  const error = await failure(api.previewImport('TPT2', text));
  expect(calls[1].url).toBe('/api/projects/TPT2/sheets/import/preview');
  expect(calls[1].init.body).toBe(text);
  expect(calls[1].init.headers).toEqual({ 'content-type': 'application/json' });
  expect(error.message).toBe('cells: expected array');
});

it("treats a JSON form's answer without a JSON body as an empty object, as the forms always have", async () => {
  const calls = stubFetch(answer(204, null), answer(202, { ok: true, message: 'Sent if the address has an account.' }));
  await expect(api.sendForm('PATCH', '/api/admin/users/1', { action: 'lock' })).resolves.toEqual({});
  expect(calls[0].init.method).toBe('PATCH');
  await expect(api.sendForm('POST', '/api/auth/password-reset', { email: 'a@b.test' })).resolves.toEqual({
    ok: true,
    message: 'Sent if the address has an account.',
  });
});

it('retries an evaluation refused with 429 after its Retry-After, and gives up after the third try', async () => {
  vi.useFakeTimers();
  const busy = () =>
    answer(
      429,
      { error: { code: 'too_many_requests', message: 'Two evaluations are in progress.' } },
      { 'retry-after': '2' },
    );
  const result = { ok: true, cells: [], engineVersion: '1.4.0', constantsEdition: 'CODATA 2022' };
  const calls = stubFetch(busy(), answer(200, result));
  const first = postEvaluation({ cells: [] });
  await vi.advanceTimersByTimeAsync(1999);
  expect(calls).toHaveLength(1);
  await vi.advanceTimersByTimeAsync(1);
  await expect(first).resolves.toEqual(result);
  expect(calls).toHaveLength(2);

  const again = stubFetch(busy(), busy(), busy());
  const second = postEvaluation({ cells: [] });
  const refused = failure(second);
  await vi.advanceTimersByTimeAsync(4000);
  const error = await refused;
  expect(again).toHaveLength(3);
  expect(error.status).toBe(429);
  expect(error.retryAfterSeconds).toBe(2);
  expect(error.message).toBe('Two evaluations are in progress.');
});
