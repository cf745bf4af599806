// The app's HTTP server: Next.js's own request handler (its documented custom-server API) behind a
// thin layer that owns what only the connection knows.
//
//   node --import tsx lib/ops/server.ts [--dev] [-H host] [-p port]
//
// On every request it
//   - replaces any client-sent PEER_ADDRESS_HEADER with the socket's peer address, which
//     lib/http/client-address.ts reads (Next.js exposes no socket address to route handlers, and keeps
//     a client-sent X-Forwarded-For);
//   - drops client-sent X-Forwarded-* headers unless the peer is a trusted proxy
//     (WORLDSHEET_TRUSTED_PROXIES), so Next.js fills them from the connection itself;
//   - sets a Content-Security-Policy with a fresh nonce on the request (Next.js gives its scripts the
//     nonce it finds there) and on the response, and HSTS when served over HTTPS
//     (lib/http/security-headers.ts).
// The build folder follows WORLDSHEET_DIST_DIR through next.config.mjs, as for `next start`.
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import v8 from 'node:v8';
import next from 'next';
import { checkProduction, config, ConfigError, defaultNodeEnv } from '../config';
import { startDraining } from '../health/draining';
import { isTrustedProxy, parseTrustedProxies, PEER_ADDRESS_HEADER } from '../http/client-address';
import { edgeHeaders, httpsEnabled, newNonce } from '../http/security-headers';

const root = path.join(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

const FORWARDED_HEADERS = [
  'x-forwarded-for',
  'x-forwarded-host',
  'x-forwarded-proto',
  'x-forwarded-port',
  'x-real-ip',
  'forwarded',
];

/**
 * Rewrites the request's headers as described above and returns the headers for its response. The
 * request must come straight from a socket (req.socket.remoteAddress is its peer).
 */
export function prepareRequest(
  req: IncomingMessage,
  options: { dev: boolean; https: boolean },
): Record<string, string> {
  delete req.headers[PEER_ADDRESS_HEADER];
  const peer = req.socket.remoteAddress;
  if (peer) req.headers[PEER_ADDRESS_HEADER] = peer;
  if (!peer || !isTrustedProxy(peer)) for (const name of FORWARDED_HEADERS) delete req.headers[name];
  const headers = edgeHeaders({ nonce: newNonce(), dev: options.dev, https: options.https });
  req.headers['content-security-policy'] = headers['Content-Security-Policy'];
  delete req.headers['content-security-policy-report-only'];
  return headers;
}

/**
 * How far the old generation of a heap may grow above what stayed live after a full collection before
 * V8 collects again, in percent (V8's --heap-growing-percent). Left alone, V8 picks the factor from
 * how fast it collects against how fast the program allocates, up to 4 times for a heap limit of
 * 2 GiB or more (4 GiB on a machine with 24 GiB): under the load benchmark (50 connections on 2 CPUs)
 * the main thread kept 100–145 MiB live and let its heap grow to 410–430 MiB between full collections,
 * the largest part of the app server's resident memory. At 50 % it stays at 200–220 MiB
 * (tests/bench/README.md, Load). Safe: it changes only when the collector runs, never what a program
 * computes; the heap limit is unchanged, so a request that needs much memory is served as before.
 */
const HEAP_GROWING_PERCENT = 50;

/**
 * Sets HEAP_GROWING_PERCENT for this process. V8's flags are per process, so the evaluation workers
 * and the signature parser's thread get the same 50 % (V8 caps its own factor lower for their small
 * heap limits, so for them it may be a little more room, not less); the benchmark's figures include
 * them. V8 reads the flag at every full collection and Node.js leaves V8's flags writable after start,
 * so setting it here, before Next.js loads the app, covers every collection that matters.
 */
function limitHeapGrowth(): void {
  v8.setFlagsFromString(`--heap-growing-percent=${HEAP_GROWING_PERCENT}`);
}

function argument(args: string[], names: string[]): string | undefined {
  const i = args.findIndex((a) => names.includes(a));
  return i >= 0 ? args[i + 1] : undefined;
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const dev = args.includes('--dev');
  if (!dev) defaultNodeEnv('production');
  // A malformed setting, or a deployment without its secret, signing key and certificate or mail
  // service, stops the server here rather than at the first request that needs it.
  const settings = dev ? config() : checkProduction();
  const hostname = argument(args, ['-H', '--hostname']) ?? settings.WORLDSHEET_HOST;
  const port = Number(argument(args, ['-p', '--port']) ?? settings.PORT);
  if (!Number.isInteger(port) || port < 0 || port > 65535) throw new Error(`not a port: ${port}`);
  // A mistyped proxy list stops the server here rather than at the first sign-in.
  parseTrustedProxies(settings.WORLDSHEET_TRUSTED_PROXIES);
  const https = httpsEnabled();

  // tsx, which loads this file, turns Node's source maps on for the whole process; Node then keeps
  // the map of every server chunk Next.js loads, with the sources in it (about 30 MiB of strings in
  // the heap; under the load benchmark the peak was about 150 MiB lower without them,
  // tests/bench/README.md). In production the chunks' stacks stay as compiled, as under
  // `next start`; `--dev` keeps them mapped.
  if (!dev) process.setSourceMapsEnabled(false);
  // Production collects sooner (above); --dev keeps V8's own heap growth.
  if (!dev) limitHeapGrowth();
  const server = createServer();
  let closing = false;
  const app = next({ dev, dir: root, hostname, port, httpServer: server });
  const handle = app.getRequestHandler();
  await app.prepare();

  server.on('request', (req: IncomingMessage, res: ServerResponse) => {
    let headers: Record<string, string>;
    try {
      headers = prepareRequest(req, { dev, https });
    } catch (error) {
      console.error(error);
      res.statusCode = 500;
      res.end();
      return;
    }
    for (const [name, value] of Object.entries(headers)) res.setHeader(name, value);
    // Once the server stops accepting, each kept-alive connection closes after its response.
    if (closing) res.setHeader('Connection', 'close');
    handle(req, res).catch((error: unknown) => {
      console.error(error);
      if (!res.headersSent) res.statusCode = 500;
      res.end();
    });
  });
  // next start's figures: idle keep-alive sockets outlive a typical proxy's own timeout.
  server.keepAliveTimeout = 65_000;
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, hostname, () => resolve());
  });
  console.log(
    `[worldsheet] app server (${dev ? 'development' : 'production'}) listening on http://${hostname}:${port}${https ? ', served to browsers over HTTPS' : ''}`,
  );

  // Stopping (SIGTERM from a process manager, SIGINT from a terminal) drains: readiness (GET
  // /api/health) answers 503 at once; after WORLDSHEET_DRAIN_DELAY_MS (for a load balancer to see it)
  // the server stops accepting connections and answers what is in flight, closing each kept-alive
  // connection after its response; at WORLDSHEET_DRAIN_TIMEOUT_MS whatever is left is cut off.
  const drainDelayMs = settings.WORLDSHEET_DRAIN_DELAY_MS;
  const drainTimeoutMs = settings.WORLDSHEET_DRAIN_TIMEOUT_MS;
  let stopping = false;
  const stop = (signal: NodeJS.Signals) => {
    if (stopping) return;
    stopping = true;
    startDraining();
    console.log(
      `[worldsheet] ${signal}: draining (not ready; closing in ${drainDelayMs} ms, at most ${drainTimeoutMs} ms in all)`,
    );
    const exitCode = signal === 'SIGINT' ? 130 : 0;
    const force = setTimeout(() => {
      console.log('[worldsheet] drain time is up: closing the connections left');
      server.closeAllConnections();
      process.exit(exitCode);
    }, drainTimeoutMs);
    force.unref();
    setTimeout(() => {
      closing = true;
      server.close(() => {
        app
          .close()
          .catch(() => undefined)
          .finally(() => process.exit(exitCode));
      });
      server.closeIdleConnections();
    }, drainDelayMs);
  };
  process.on('SIGTERM', () => stop('SIGTERM'));
  process.on('SIGINT', () => stop('SIGINT'));
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main().catch((error) => {
    console.error(error instanceof ConfigError ? `[worldsheet] ${error.message}` : error);
    process.exit(1);
  });
}
