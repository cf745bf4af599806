// The address of the client that sent a request, for rate limits, lockouts and the audit trail.
//
// A client writes its own X-Forwarded-For, so that header is believed only as far as it was written
// by proxies the operator configured (WORLDSHEET_TRUSTED_PROXIES: addresses or CIDR ranges,
// comma-separated; none by default). The connection's own address reaches the app in
// PEER_ADDRESS_HEADER, which the app's server (lib/ops/server.ts) overwrites on every request, so a
// client cannot set it. Walking X-Forwarded-For from the right, the first hop that is not a trusted
// proxy is the client (the right-most untrusted hop): entries left of it were written by the client.
import { BlockList, isIP } from 'node:net';
import { config } from '@/lib/config';

export const PEER_ADDRESS_HEADER = 'x-worldsheet-peer-address';

type HeaderSource = Headers | Record<string, string | string[] | undefined> | undefined | null;

function header(headers: HeaderSource, name: string): string | undefined {
  if (!headers) return undefined;
  if (typeof (headers as Headers).get === 'function') return (headers as Headers).get(name) ?? undefined;
  const value = (headers as Record<string, string | string[] | undefined>)[name];
  return Array.isArray(value) ? value.join(',') : value;
}

/** Strips an IPv4-mapped IPv6 prefix (::ffff:127.0.0.1 → 127.0.0.1) and brackets. */
export function normaliseAddress(address: string): string {
  const a = address.trim().replace(/^\[(.*)\]$/, '$1');
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(a);
  return mapped ? mapped[1] : a;
}

/** Parses "10.0.0.0/8, 192.0.2.7, fd00::/8" into a BlockList; throws on an entry that is not an address or range. */
export function parseTrustedProxies(setting: string | undefined): BlockList {
  const list = new BlockList();
  for (const raw of (setting ?? '')
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean)) {
    const [addr, bits] = raw.split('/');
    const address = normaliseAddress(addr);
    const family = isIP(address);
    if (!family) throw new Error(`WORLDSHEET_TRUSTED_PROXIES: "${raw}" is not an IP address or CIDR range`);
    const type = family === 6 ? 'ipv6' : 'ipv4';
    if (bits === undefined) list.addAddress(address, type);
    else {
      const prefix = Number(bits);
      if (!Number.isInteger(prefix) || prefix < 0 || prefix > (family === 6 ? 128 : 32)) {
        throw new Error(`WORLDSHEET_TRUSTED_PROXIES: "${raw}" has a prefix length out of range`);
      }
      list.addSubnet(address, prefix, type);
    }
  }
  return list;
}

let cached: { setting: string | undefined; list: BlockList } | null = null;

function trustedProxies(): BlockList {
  const setting = config().WORLDSHEET_TRUSTED_PROXIES;
  if (!cached || cached.setting !== setting) cached = { setting, list: parseTrustedProxies(setting) };
  return cached.list;
}

export function isTrustedProxy(address: string, list: BlockList = trustedProxies()): boolean {
  const a = normaliseAddress(address);
  const family = isIP(a);
  return family !== 0 && list.check(a, family === 6 ? 'ipv6' : 'ipv4');
}

/**
 * The client's address: the connection's peer, or, when the peer is a trusted proxy, the right-most
 * X-Forwarded-For hop that is not a trusted proxy. "unknown" when the request did not come through
 * the app's server (which sets the peer header).
 */
export function clientAddress(headers: HeaderSource, list: BlockList = trustedProxies()): string {
  const peerRaw = header(headers, PEER_ADDRESS_HEADER);
  if (!peerRaw) return 'unknown';
  const peer = normaliseAddress(peerRaw);
  if (!isTrustedProxy(peer, list)) return peer;
  const hops = (header(headers, 'x-forwarded-for') ?? '')
    .split(',')
    .map((h) => normaliseAddress(h))
    .filter((h) => isIP(h) !== 0);
  for (let i = hops.length - 1; i >= 0; i--) {
    if (!isTrustedProxy(hops[i], list)) return hops[i];
  }
  // Every hop is a trusted proxy: the left-most is the nearest we know to the client.
  return hops[0] ?? peer;
}
