// A real OpenID Connect identity provider for the single sign-on tests: oidc-provider on
// 127.0.0.1 and a free port, over plain http, with one confidential client (Worldsheet), PKCE
// required, an in-memory account store whose groups a test can change between sign-ins, and
// oidc-provider's development interaction pages (a login form that takes any password, and a
// consent page). Nothing here is fit for anything but a test.
import { generateKeyPairSync, randomBytes } from 'node:crypto';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import Provider, { type Account } from 'oidc-provider';

export interface TestAccount {
  /** What the test types in the provider's login form; also the account's `sub`. */
  login: string;
  name: string;
  email: string;
  emailVerified: boolean;
  groups: string[];
}

export interface IdentityProvider {
  /** http://127.0.0.1:<port>, as WORLDSHEET_OIDC_ISSUER. */
  issuer: string;
  clientId: string;
  clientSecret: string;
  /** Changes an account's groups; the next token or userinfo request carries them. */
  setGroups(login: string, groups: string[]): void;
  /** Errors the provider reported (its `*.error` and `server_error` events); a test expects none. */
  errors: string[];
  stop(): Promise<void>;
}

// The provider's events that report a failed request (docs/events.md of oidc-provider).
const ERROR_EVENTS = [
  'server_error',
  'authorization.error',
  'grant.error',
  'userinfo.error',
  'discovery.error',
  'jwks.error',
  'end_session.error',
  'introspection.error',
  'revocation.error',
  'check_session_origin.error',
  'registration_create.error',
];

export async function startIdentityProvider(options: {
  redirectUri: string;
  accounts: TestAccount[];
}): Promise<IdentityProvider> {
  const accounts = new Map(options.accounts.map((a) => [a.login, { ...a, groups: [...a.groups] }]));
  const errors: string[] = [];

  // Listen first, on a port the system chooses, so the issuer URL (which holds the port) is known
  // before the provider is made; requests are handed to the provider once it exists.
  let handle: ((req: IncomingMessage, res: ServerResponse) => void) | null = null;
  const server = createServer((req, res) => {
    // Browsers ask every origin for a favicon; answer it here rather than with the provider's 404.
    if (req.url === '/favicon.ico') {
      res.writeHead(204).end();
      return;
    }
    if (!handle) {
      res.writeHead(503).end();
      return;
    }
    handle(req, res);
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => resolve());
  });
  const { port } = server.address() as AddressInfo;
  const issuer = `http://127.0.0.1:${port}`;

  const clientId = 'worldsheet-test';
  const clientSecret = randomBytes(24).toString('base64url');
  const { privateKey } = generateKeyPairSync('rsa', { modulusLength: 2048 });

  const provider = new Provider(issuer, {
    clients: [
      {
        client_id: clientId,
        client_secret: clientSecret,
        redirect_uris: [options.redirectUri],
        grant_types: ['authorization_code'],
        response_types: ['code'],
        // next-auth v4's openid-client sends the secret in the Authorization header by default.
        token_endpoint_auth_method: 'client_secret_basic',
      },
    ],
    // Worldsheet asks for "openid email profile"; the groups travel with the profile scope.
    claims: { openid: ['sub'], email: ['email', 'email_verified'], profile: ['name', 'groups'] },
    // PKCE for every client, not only public ones (the default).
    pkce: { required: () => true },
    features: { devInteractions: { enabled: true }, userinfo: { enabled: true } },
    jwks: { keys: [{ ...privateKey.export({ format: 'jwk' }), kid: 'test-signing-key', use: 'sig', alg: 'RS256' }] },
    // Signed cookies. On plain http the provider sets them without the Secure flag by itself
    // (it follows the request: ctx.secure is false on http).
    cookies: { keys: [randomBytes(32).toString('base64url')] },
    // Lifetimes in seconds, long enough for a test run.
    ttl: { Interaction: 600, Session: 3600, Grant: 3600, AccessToken: 600, IdToken: 600 },
    async findAccount(_ctx: unknown, sub: string): Promise<Account | undefined> {
      if (!accounts.has(sub)) return undefined;
      return {
        accountId: sub,
        // Read at the time of each token and userinfo request, so setGroups() takes effect at the
        // next sign-in. The provider releases only the claims of the granted scopes.
        claims: () => {
          const a = accounts.get(sub)!;
          return { sub, email: a.email, email_verified: a.emailVerified, name: a.name, groups: [...a.groups] };
        },
      };
    },
  });
  // Nothing stands in front of the provider: it must not trust X-Forwarded-* headers, and its
  // issuer is the address the browser and the app reach it at.
  provider.proxy = false;
  for (const event of ERROR_EVENTS) {
    provider.on(event, (...args: unknown[]) => {
      const error = args.find((a) => a instanceof Error) as (Error & { error_description?: string }) | undefined;
      errors.push(
        `${event}: ${error ? `${error.message}${error.error_description ? ` (${error.error_description})` : ''}` : 'no detail'}`,
      );
    });
  }
  handle = provider.callback();

  return {
    issuer,
    clientId,
    clientSecret,
    errors,
    setGroups(login, groups) {
      const account = accounts.get(login);
      if (!account) throw new Error(`no test account ${login}`);
      account.groups = [...groups];
    },
    async stop() {
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
    },
  };
}
