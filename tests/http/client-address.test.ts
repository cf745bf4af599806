// Which address the rate limits, lockouts and audit trail record: the connection's, never what a
// client wrote in X-Forwarded-For, unless a configured proxy wrote it.
import { afterEach, expect, it } from 'vitest';
import {
  clientAddress,
  normaliseAddress,
  parseTrustedProxies,
  PEER_ADDRESS_HEADER,
} from '../../lib/http/client-address';

const none = parseTrustedProxies(undefined);
const proxies = parseTrustedProxies('10.0.0.0/8, 192.0.2.7, fd00::/8');

afterEach(() => {
  delete process.env.WORLDSHEET_TRUSTED_PROXIES;
});

it('ignores a client-sent X-Forwarded-For when no proxy is trusted: the peer is the client', () => {
  const h = new Headers({ [PEER_ADDRESS_HEADER]: '203.0.113.9', 'x-forwarded-for': '198.51.100.1, 10.1.2.3' });
  expect(clientAddress(h, none)).toBe('203.0.113.9');
  // The default list comes from the (empty) setting.
  expect(clientAddress(h)).toBe('203.0.113.9');
});

it('ignores X-Forwarded-For from a peer that is not one of the trusted proxies', () => {
  const h = new Headers({ [PEER_ADDRESS_HEADER]: '203.0.113.9', 'x-forwarded-for': '198.51.100.1' });
  expect(clientAddress(h, proxies)).toBe('203.0.113.9');
});

it('behind trusted proxies takes the right-most hop that is not a trusted proxy', () => {
  // The client wrote "6.6.6.6" itself; 198.51.100.1 connected to the outer proxy 192.0.2.7, which
  // connected to 10.0.0.5, which connected to the app.
  const h = new Headers({ [PEER_ADDRESS_HEADER]: '10.0.0.5', 'x-forwarded-for': '6.6.6.6, 198.51.100.1, 192.0.2.7' });
  expect(clientAddress(h, proxies)).toBe('198.51.100.1');
});

it('behind a trusted proxy with no forwarded hops, or only trusted ones, falls back sensibly', () => {
  expect(clientAddress(new Headers({ [PEER_ADDRESS_HEADER]: '10.0.0.5' }), proxies)).toBe('10.0.0.5');
  expect(
    clientAddress(
      new Headers({ [PEER_ADDRESS_HEADER]: '10.0.0.5', 'x-forwarded-for': '10.9.9.9, 192.0.2.7' }),
      proxies,
    ),
  ).toBe('10.9.9.9');
  // Garbage in the header is skipped, not believed.
  expect(
    clientAddress(
      new Headers({ [PEER_ADDRESS_HEADER]: '10.0.0.5', 'x-forwarded-for': 'evil, 198.51.100.4, not-an-ip' }),
      proxies,
    ),
  ).toBe('198.51.100.4');
});

it('reads IPv4-mapped IPv6 peers and hops as the IPv4 address they are', () => {
  expect(normaliseAddress('::ffff:127.0.0.1')).toBe('127.0.0.1');
  expect(normaliseAddress('[::1]')).toBe('::1');
  expect(clientAddress(new Headers({ [PEER_ADDRESS_HEADER]: '::ffff:203.0.113.9' }), none)).toBe('203.0.113.9');
  // A mapped address of a trusted proxy is trusted; a mapped client hop is reported as IPv4.
  const h = new Headers({ [PEER_ADDRESS_HEADER]: '::ffff:10.0.0.5', 'x-forwarded-for': '::ffff:198.51.100.1' });
  expect(clientAddress(h, proxies)).toBe('198.51.100.1');
  expect(
    clientAddress(new Headers({ [PEER_ADDRESS_HEADER]: 'fd00::1', 'x-forwarded-for': '2001:db8::7' }), proxies),
  ).toBe('2001:db8::7');
});

it('follows WORLDSHEET_TRUSTED_PROXIES and refuses a malformed entry', () => {
  process.env.WORLDSHEET_TRUSTED_PROXIES = '127.0.0.1';
  expect(clientAddress(new Headers({ [PEER_ADDRESS_HEADER]: '127.0.0.1', 'x-forwarded-for': '198.51.100.1' }))).toBe(
    '198.51.100.1',
  );
  expect(() => parseTrustedProxies('10.0.0.0/33')).toThrow(/prefix length/);
  expect(() => parseTrustedProxies('proxy.example')).toThrow(/not an IP address/);
});

it('without the peer header (a request that did not come through the app server) says unknown', () => {
  expect(clientAddress(new Headers({ 'x-forwarded-for': '198.51.100.1' }), none)).toBe('unknown');
  // Node's header record form, as next-auth hands it over.
  expect(clientAddress({ [PEER_ADDRESS_HEADER]: '127.0.0.1', 'x-forwarded-for': ['6.6.6.6'] }, none)).toBe('127.0.0.1');
});
