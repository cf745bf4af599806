// Whether this app instance is draining: set by the server (lib/ops/server.ts) when it is told to
// stop, read by the readiness check (GET /api/health answers 503 from then on, so a load balancer
// sends new requests to the other instances while this one finishes the requests it has). Kept on
// globalThis: the server and the route handlers Next.js bundles load this module separately.
const KEY = Symbol.for('worldsheet.draining');

type Holder = { [KEY]?: boolean };

export function startDraining(): void {
  (globalThis as Holder)[KEY] = true;
}

export function isDraining(): boolean {
  return (globalThis as Holder)[KEY] === true;
}
