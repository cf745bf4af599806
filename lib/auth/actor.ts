import type { ApiTokenScope } from '@/db/schema';

/** Who is acting, and through what: a browser session or an API token. */
export interface Actor {
  userId: string;
  email: string;
  name: string;
  isAdmin: boolean;
  via: 'session' | 'token' | 'system';
  sessionId: string | null;
  tokenId: string | null;
  /** For an API token: what it may do ('read': GET and HEAD only). Absent for sessions. */
  tokenScope?: ApiTokenScope;
}
