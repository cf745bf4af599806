// The shared request guard of route handlers (lib/http/route.ts `handle`), the bounded body reader
// (lib/http/body.ts) and the path parameters (lib/http/params.ts), called directly; the production
// server's answers are in tests/e2e/authorization-matrix.test.ts and tests/e2e/body-limits.test.ts.
// Sources: Fetch Standard §3.1 (a browser sends Origin on every request whose method is not GET or
// HEAD) and W3C Fetch Metadata Request Headers (Sec-Fetch-Site); OWASP Cross-Site Request Forgery
// Prevention Cheat Sheet ("verifying origin with standard headers", content types a form can send).
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { readBodyBytes, readJsonBody } from '../../lib/http/body';
import { checkPathParams, INT4_MAX, PATH_PARAMS, queryInt4 } from '../../lib/http/params';
import { handle } from '../../lib/http/route';

process.env.NEXTAUTH_URL = 'http://127.0.0.1:3000';
const OWN = 'http://127.0.0.1:3000';

async function guarded(
  init: { method?: string; headers?: Record<string, string>; body?: string },
  options?: { multipart?: boolean },
) {
  let ran = false;
  const request = new Request(`${OWN}/api/thing`, {
    method: init.method ?? 'POST',
    headers: init.headers,
    body: init.body,
  });
  const response = await handle(
    request,
    async () => {
      ran = true;
      return Response.json({ ok: true });
    },
    options,
  );
  return { status: response.status, ran, body: (await response.json()) as { error?: { message: string } } };
}

const cookie = { cookie: 'next-auth.session-token=abc' };
const json = { 'content-type': 'application/json' };

describe('state changes with a session cookie', () => {
  it('accepts JSON from the app’s own origin, by Origin or (without one) by Sec-Fetch-Site', async () => {
    expect(await guarded({ headers: { ...cookie, ...json, origin: OWN }, body: '{}' })).toMatchObject({
      status: 200,
      ran: true,
    });
    expect(
      await guarded({ headers: { ...cookie, ...json, 'sec-fetch-site': 'same-origin' }, body: '{}' }),
    ).toMatchObject({ status: 200, ran: true });
    for (const method of ['PUT', 'PATCH', 'DELETE'])
      expect(await guarded({ method, headers: { ...cookie, ...json, origin: OWN }, body: '{}' })).toMatchObject({
        status: 200,
        ran: true,
      });
  });

  it('refuses another origin (another port of the same host too), a null origin, and no word of where it comes from, with 403', async () => {
    for (const origin of [
      'http://evil.example',
      'http://127.0.0.1:8766',
      'https://127.0.0.1:3000',
      'null',
      'http://127.0.0.1:3000.evil.example',
    ]) {
      const r = await guarded({ headers: { ...cookie, ...json, origin }, body: '{}' });
      expect(r, origin).toMatchObject({ status: 403, ran: false });
      expect(r.body.error!.message).toMatch(/another site/);
    }
    for (const site of ['same-site', 'cross-site', 'none']) {
      expect(
        await guarded({ headers: { ...cookie, ...json, 'sec-fetch-site': site }, body: '{}' }),
        site,
      ).toMatchObject({ status: 403, ran: false });
    }
    expect(await guarded({ headers: { ...cookie, ...json }, body: '{}' })).toMatchObject({ status: 403, ran: false });
    // Origin decides when both are sent.
    expect(
      await guarded({
        headers: { ...cookie, ...json, origin: 'http://evil.example', 'sec-fetch-site': 'same-origin' },
        body: '{}',
      }),
    ).toMatchObject({ status: 403, ran: false });
  });

  it('refuses the bodies an HTML form can send (text/plain, urlencoded, multipart where no file is taken) with 415, even from the own origin', async () => {
    for (const type of [
      'text/plain',
      'application/x-www-form-urlencoded',
      'multipart/form-data; boundary=x',
      'text/plain;charset=UTF-8',
      'application/jsonx',
    ]) {
      const r = await guarded({ headers: { ...cookie, origin: OWN, 'content-type': type }, body: '{"title":"x"}' });
      expect(r, type).toMatchObject({ status: 415, ran: false });
    }
    // A body without a type at all.
    expect(
      await guarded({ headers: { ...cookie, origin: OWN, 'content-length': '2', 'content-type': '' }, body: '{}' }),
    ).toMatchObject({ status: 415, ran: false });
  });

  it('takes multipart/form-data on the routes that take a file, and a request without a body (DELETE of a token) without a type', async () => {
    expect(
      await guarded(
        { headers: { ...cookie, origin: OWN, 'content-type': 'multipart/form-data; boundary=x' }, body: '--x--' },
        { multipart: true },
      ),
    ).toMatchObject({ status: 200, ran: true });
    expect(
      await guarded(
        { headers: { ...cookie, origin: OWN, 'content-type': 'text/plain' }, body: 'x' },
        { multipart: true },
      ),
    ).toMatchObject({ status: 415, ran: false });
    expect(await guarded({ method: 'DELETE', headers: { ...cookie, origin: OWN } })).toMatchObject({
      status: 200,
      ran: true,
    });
  });

  it('leaves reads alone, and requests with no cookie (nothing for another site to borrow) to the handler', async () => {
    expect(await guarded({ method: 'GET', headers: { ...cookie, origin: 'http://evil.example' } })).toMatchObject({
      status: 200,
      ran: true,
    });
    expect(await guarded({ method: 'HEAD', headers: { ...cookie } })).toMatchObject({ status: 200, ran: true });
    expect(await guarded({ headers: { ...json }, body: '{}' })).toMatchObject({ status: 200, ran: true });
  });
});

describe('bounded bodies', () => {
  /** A body that never ends, counting the bytes it was asked for. */
  function endless(chunkBytes: number) {
    const pulled = { bytes: 0, cancelled: false };
    const stream = new ReadableStream<Uint8Array>({
      pull(controller) {
        pulled.bytes += chunkBytes;
        controller.enqueue(new Uint8Array(chunkBytes).fill(32));
      },
      cancel() {
        pulled.cancelled = true;
      },
    });
    return {
      pulled,
      request: new Request(`${OWN}/api/thing`, { method: 'POST', body: stream, duplex: 'half' } as RequestInit),
    };
  }

  it('stops reading a chunked body without Content-Length as soon as it passes the limit, and cancels the rest', async () => {
    const { pulled, request } = endless(64 * 1024);
    await expect(readBodyBytes(request, 1024 * 1024)).rejects.toMatchObject({ code: 'too_large', status: 413 });
    expect(pulled.cancelled).toBe(true);
    // The limit, one chunk past it, and what the stream had queued ahead: nowhere near the endless rest.
    expect(pulled.bytes).toBeLessThanOrEqual(1024 * 1024 + 4 * 64 * 1024);
  });

  it('refuses a declared Content-Length over the limit before reading anything', async () => {
    const { pulled, request } = endless(64 * 1024);
    const declared = new Request(request, { headers: { 'content-length': String(300 * 1024 * 1024) } });
    await expect(readJsonBody(declared, 1024)).rejects.toMatchObject({ code: 'too_large' });
    expect(pulled.bytes).toBeLessThanOrEqual(2 * 64 * 1024);
  });

  it('reads a body within the limit, exactly at it, and answers 400 for what is not JSON', async () => {
    const body = JSON.stringify({ a: 'é'.repeat(10) });
    expect(await readJsonBody(new Request(OWN, { method: 'POST', body }), Buffer.byteLength(body))).toEqual({
      a: 'é'.repeat(10),
    });
    await expect(
      readJsonBody(new Request(OWN, { method: 'POST', body }), Buffer.byteLength(body) - 1),
    ).rejects.toMatchObject({ code: 'too_large' });
    await expect(readJsonBody(new Request(OWN, { method: 'POST', body: '{"a":' }), 100)).rejects.toMatchObject({
      code: 'bad_request',
    });
    expect(await readJsonBody(new Request(OWN, { method: 'POST', body: '\ufeff{"b":1}' }), 100)).toEqual({ b: 1 });
  });
});

describe('path parameters', () => {
  it('takes UUIDs, project codes, and decimal integers within int4', () => {
    expect(
      checkPathParams({
        sheetId: '3f1c7a52-9d6e-4b8a-8f0e-2a4b6c8d0e1f',
        number: '12',
        cellIndex: '0',
        projectId: 'TPT2',
      }),
    ).toEqual({
      ok: true,
      value: { sheetId: '3f1c7a52-9d6e-4b8a-8f0e-2a4b6c8d0e1f', number: 12, cellIndex: 0, projectId: 'TPT2' },
    });
    expect(checkPathParams({ number: String(INT4_MAX) })).toMatchObject({ ok: true, value: { number: INT4_MAX } });
  });

  it('refuses 36 dashes, UUID-shaped zeros of the wrong form, numbers beyond int4 and numbers not written as digits', () => {
    for (const bad of [
      '-'.repeat(36),
      '0'.repeat(36),
      '00000000-0000-0000-0000-00000000000',
      '00000000_0000_0000_0000_000000000000',
      'zzzzzzzz-zzzz-4zzz-8zzz-zzzzzzzzzzzz',
      '',
      "1' or '1'='1",
    ]) {
      expect(checkPathParams({ checkId: bad }), bad).toMatchObject({ ok: false, what: 'check' });
    }
    for (const bad of [
      String(INT4_MAX + 1),
      '99999999999',
      '0',
      '-1',
      '+1',
      '1e3',
      '1.0',
      ' 1',
      '0x10',
      'NaN',
      'Infinity',
    ]) {
      expect(checkPathParams({ number: bad }), bad).toMatchObject({ ok: false, what: 'version' });
      expect(queryInt4(bad), bad).toBeNull();
    }
    expect(checkPathParams({ projectId: 'tpt2' })).toMatchObject({ ok: false });
  });

  it('has a schema for every dynamic segment under app/, and every route handler and page with one validates it', () => {
    const appDir = path.join(process.cwd(), 'app');
    const files: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const p = path.join(dir, name);
        if (statSync(p).isDirectory()) walk(p);
        else if (name === 'route.ts' || name === 'page.tsx') files.push(p);
      }
    };
    walk(appDir);
    const unvalidated: string[] = [];
    for (const file of files) {
      const segments = path
        .relative(appDir, file)
        .split(path.sep)
        .map((s) => /^\[([A-Za-z0-9]+)\]$/.exec(s)?.[1])
        .filter((s): s is string => Boolean(s));
      for (const segment of segments) expect(Object.keys(PATH_PARAMS), `${file}: [${segment}]`).toContain(segment);
      if (segments.length === 0) continue;
      const source = readFileSync(file, 'utf8');
      const validated = file.endsWith('route.ts')
        ? /routeParams\(params\)/.test(source)
        : /pageParams\(|pageProject\(/.test(source);
      if (!validated) unvalidated.push(path.relative(appDir, file));
    }
    expect(unvalidated).toEqual([]);
  });

  it('there are no server actions, which would be state changes outside the guard', () => {
    const withActions: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const p = path.join(dir, name);
        if (statSync(p).isDirectory()) walk(p);
        else if (/\.(ts|tsx)$/.test(name) && /^\s*['"]use server['"]/m.test(readFileSync(p, 'utf8')))
          withActions.push(path.relative(process.cwd(), p));
      }
    };
    for (const dir of ['app', 'components', 'lib']) walk(path.join(process.cwd(), dir));
    expect(withActions).toEqual([]);
  });

  it('every route handler runs inside handle(request, …) (the guard), one per exported method', () => {
    const apiDir = path.join(process.cwd(), 'app', 'api');
    // csp-report: browsers post violation reports themselves (application/csp-report, with the page's
    // cookies); it reads no session and stores only capped reports (app/api/csp-report/route.ts).
    // health/live: a load balancer's liveness probe, answered without reading the request or the database.
    const outside = new Set([
      'auth/[...nextauth]/route.ts',
      'health/route.ts',
      'health/live/route.ts',
      'openapi.json/route.ts',
      'csp-report/route.ts',
    ]);
    const walk = (dir: string, out: string[] = []): string[] => {
      for (const name of readdirSync(dir)) {
        const p = path.join(dir, name);
        if (statSync(p).isDirectory()) walk(p, out);
        else if (name === 'route.ts') out.push(p);
      }
      return out;
    };
    const missing: string[] = [];
    for (const file of walk(apiDir)) {
      const rel = path.relative(apiDir, file).split(path.sep).join('/');
      if (outside.has(rel)) continue;
      const source = readFileSync(file, 'utf8');
      const methods = [...source.matchAll(/export\s+(?:async\s+)?function\s+(GET|HEAD|POST|PUT|PATCH|DELETE)\b/g)]
        .length;
      const guarded = [...source.matchAll(/return handle\(\s*request\s*,/g)].length;
      if (methods === 0 || methods !== guarded) missing.push(rel);
    }
    expect(missing).toEqual([]);
  });
});
