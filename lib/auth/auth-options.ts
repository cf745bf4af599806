// next-auth configuration. Sign-in methods: password, single-use e-mailed link and, when
// configured, the organisation's OpenID Connect provider. The signed cookie (JWT) only carries the
// id of a server-side session (lib/auth/sessions.ts), so sessions can end on inactivity, on
// sign-out and when a user is disabled.
import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import { getDb } from '@/db';
import { safeSameOriginPath } from '@/lib/http/same-origin';
import { httpsEnabled } from '@/lib/http/security-headers';
import { recordAudit } from '@/lib/audit/record';
import { config } from '@/lib/config';
import { clientAddress } from '@/lib/http/client-address';
import { authCookies } from './auth-cookies';
import { AuthError } from './auth-error';
import { oidcProviders, signInWithOidc } from './oidc';
import { signOutSession, startSession } from './sessions';
import { AUTH_SETTINGS } from './settings';
import { authenticateLink, authenticatePassword, type SignedInUser } from './sign-in';

type RequestLike = { headers?: Record<string, string | string[] | undefined> } | undefined;

/** The connection's address, or the right-most untrusted X-Forwarded-For hop behind configured proxies; never what a client wrote. */
function clientIp(req: RequestLike): string {
  return clientAddress(req?.headers);
}

function userAgent(req: RequestLike): string | null {
  const ua = req?.headers?.['user-agent'];
  return (Array.isArray(ua) ? ua[0] : ua) ?? null;
}

async function open(user: SignedInUser, method: 'password' | 'link', req: RequestLike) {
  const db = getDb();
  const sessionId = await startSession(db, { userId: user.id, method, ip: clientIp(req), userAgent: userAgent(req) });
  await recordAudit(
    db,
    {
      userId: user.id,
      email: user.email,
      name: user.name,
      isAdmin: user.isAdmin,
      via: 'session',
      sessionId,
      tokenId: null,
    },
    {
      action: 'auth.sign-in',
      objectType: 'session',
      objectId: sessionId,
      newValue: { method },
    },
  );
  return { id: user.id, email: user.email, name: user.name, sessionId };
}

function rethrow(error: unknown): never {
  // next-auth passes an error's message to the sign-in page; only our own messages are shown.
  if (error instanceof AuthError) throw new Error(error.message);
  console.error(error);
  throw new Error('Sign-in is not available right now.');
}

export const authOptions: NextAuthOptions = {
  secret: config().NEXTAUTH_SECRET,
  session: { strategy: 'jwt', maxAge: AUTH_SETTINGS.sessionMaxHours * 3600 },
  pages: { signIn: '/sign-in', error: '/sign-in' },
  // Secure, __Host- cookies when served over HTTPS (lib/auth/auth-cookies.ts).
  useSecureCookies: httpsEnabled(),
  cookies: authCookies(httpsEnabled()),
  providers: [
    CredentialsProvider({
      id: 'password',
      name: 'E-mail and password',
      credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
      async authorize(credentials, req) {
        try {
          const user = await authenticatePassword(getDb(), {
            email: credentials?.email ?? '',
            password: credentials?.password ?? '',
            ip: clientIp(req),
          });
          return await open(user, 'password', req);
        } catch (error) {
          rethrow(error);
        }
      },
    }),
    CredentialsProvider({
      id: 'link',
      name: 'Sign-in link',
      credentials: { token: { label: 'Token', type: 'text' } },
      async authorize(credentials, req) {
        try {
          const user = await authenticateLink(getDb(), { token: credentials?.token ?? '', ip: clientIp(req) });
          return await open(user, 'link', req);
        } catch (error) {
          rethrow(error);
        }
      },
    }),
    ...oidcProviders(),
  ],
  callbacks: {
    // Only a path on the app's own origin, as the URL parser resolves it (lib/http/same-origin.ts);
    // a value the parser refuses falls back to the home page instead of failing the request.
    async redirect({ url, baseUrl }) {
      return `${baseUrl}${safeSameOriginPath(url, baseUrl, '/')}`;
    },
    async signIn({ account, profile, user }) {
      if (account?.provider !== 'oidc') return true;
      const result = await signInWithOidc(getDb(), {
        profile: profile as Record<string, unknown> | undefined,
        account,
      });
      if (!result)
        return `/sign-in?error=${(profile as { email_verified?: unknown } | undefined)?.email_verified === false ? 'OidcEmailUnverified' : 'OidcNotAllowed'}`;
      Object.assign(user, result);
      return true;
    },
    async jwt({ token, user }) {
      const sid = (user as { sessionId?: string } | undefined)?.sessionId;
      if (sid) token.sid = sid;
      return token;
    },
    async session({ session, token }) {
      (session as { sid?: string }).sid = token.sid as string | undefined;
      return session;
    },
  },
  events: {
    // Ends the server-side session and records auth.sign-out (lib/auth/sessions.ts).
    async signOut({ token }) {
      const sid = token?.sid as string | undefined;
      if (sid) await signOutSession(getDb(), sid);
    },
  },
};
