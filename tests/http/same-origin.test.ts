// Where a sign-in may send the browser: only a path of the app's own origin.
import { expect, it } from 'vitest';
import {
  InvalidCallbackUrl,
  isAcceptableCallbackUrl,
  safeSameOriginPath,
  sameOriginPath,
} from '../../lib/http/same-origin';

const origin = 'http://127.0.0.1:3000';

it('keeps paths, queries and fragments of the own origin', () => {
  expect(sameOriginPath('/projects/TPT2?tab=audit#top', origin, '/fallback')).toBe('/projects/TPT2?tab=audit#top');
  expect(sameOriginPath('http://127.0.0.1:3000/checks', origin, '/fallback')).toBe('/checks');
  expect(sameOriginPath('checks', origin, '/fallback')).toBe('/checks');
  expect(sameOriginPath(undefined, origin, '/fallback')).toBe('/fallback');
});

it('refuses every way of naming another host, the backslash included', () => {
  for (const hostile of [
    '/\\localhost:8766/pwned', // the probe's /%5Clocalhost:8766/pwned, decoded
    '\\\\evil.example/',
    '//evil.example/x',
    '/\t/evil.example/',
    'https://evil.example/',
    'http://127.0.0.1:3001/',
    'https://127.0.0.1:3000/',
    'javascript:alert(1)',
    'data:text/html,hi',
  ]) {
    expect(sameOriginPath(hostile, origin, '/fallback'), hostile).toBe('/fallback');
  }
});

it('never returns a protocol-relative path', () => {
  // The parser keeps "//evil.example" as the path of the own origin; written into a link it would leave.
  expect(sameOriginPath('/.//evil.example/x', origin, '/fallback')).toBe('/evil.example/x');
  expect(sameOriginPath('/%2F%2Fevil.example', origin, '/fallback')).toBe('/%2F%2Fevil.example');
});

it('tells a value the URL parser refuses apart, for a 400', () => {
  expect(() => sameOriginPath('http://[', origin, '/')).toThrow(InvalidCallbackUrl);
  expect(safeSameOriginPath('http://[', origin, '/fallback')).toBe('/fallback');
  expect(isAcceptableCallbackUrl('http://[', origin)).toBe(false);
  expect(isAcceptableCallbackUrl('not a url', origin)).toBe(false);
  expect(isAcceptableCallbackUrl('/projects', origin)).toBe(true);
  expect(isAcceptableCallbackUrl('/\\localhost:8766/pwned', origin)).toBe(true); // accepted, then kept home by the redirect callback
  expect(isAcceptableCallbackUrl('https://evil.example/', origin)).toBe(true);
});

it("next-auth's redirect callback keeps the browser on the app's origin", async () => {
  const { authOptions } = await import('../../lib/auth/auth-options');
  const redirect = authOptions.callbacks!.redirect!;
  expect(await redirect({ url: '/\\localhost:8766/pwned', baseUrl: origin })).toBe(`${origin}/`);
  expect(await redirect({ url: 'https://evil.example/x', baseUrl: origin })).toBe(`${origin}/`);
  expect(await redirect({ url: '/.//evil.example/x', baseUrl: origin })).toBe(`${origin}/evil.example/x`);
  expect(await redirect({ url: `${origin}/checks?x=1`, baseUrl: origin })).toBe(`${origin}/checks?x=1`);
  expect(await redirect({ url: 'http://[', baseUrl: origin })).toBe(`${origin}/`);
});
