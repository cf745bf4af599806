/** Who is acting, and through what: a browser session or an API token. */
export interface Actor {
  userId: string;
  email: string;
  name: string;
  isAdmin: boolean;
  via: 'session' | 'token' | 'system';
  sessionId: string | null;
  tokenId: string | null;
}

/** The demo seed and other start-up work act as the system, with no session or token. */
export const SYSTEM_ACTOR = null;
