// Limits of sign-in, in one place. 21 CFR Part 11 §11.300(d): safeguards against unauthorised use,
// detecting and reporting attempts; NIST SP 800-63B §5.2.2: rate-limit failed attempts.
import { config } from '@/lib/config';

export const AUTH_SETTINGS = {
  /**
   * Consecutive failed passwords (at sign-in, at a signature's re-entry, at a password change) after
   * which the account locks for lockMinutes; every further lockAfterFailures failures lock it again
   * for twice as long (15, 30, 60 minutes…, at most lockMaxHours). A success, the e-mailed unlock
   * link or an administrator's unlock starts the count again. A lock an administrator sets has no
   * end until an administrator unlocks.
   */
  lockAfterFailures: 5,
  lockMinutes: config().WORLDSHEET_LOCK_MINUTES,
  lockMaxHours: 24,
  /**
   * Per client address (lib/http/client-address.ts), failed sign-ins only (a success never counts):
   * the first ipFreeFailures failures in the window cost nothing, then each further attempt from that
   * address must wait 2^(n - ipFreeFailures) seconds after its latest failure (1, 2, 4… s, at most
   * the window), and is refused with "try again in N s" until then. Nothing sleeps on the server.
   */
  ipFreeFailures: config().WORLDSHEET_SIGN_IN_FREE_FAILURES,
  rateWindowMinutes: 15,
  /** A session ends after this long without a request. */
  sessionIdleMinutes: config().WORLDSHEET_SESSION_IDLE_MINUTES,
  /** And after this long in any case. */
  sessionMaxHours: 12,
  signInLinkMinutes: 15,
  passwordResetMinutes: 30,
  invitationDays: 7,
} as const;
