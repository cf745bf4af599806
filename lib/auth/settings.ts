// Limits of sign-in, in one place. 21 CFR Part 11 §11.300(d): safeguards against unauthorised use,
// detecting and reporting attempts; NIST SP 800-63B §5.2.2: rate-limit failed attempts.
export const AUTH_SETTINGS = {
  /** Consecutive failed password attempts after which the account locks until an administrator unlocks it. */
  lockAfterFailures: 5,
  /** Attempts allowed per e-mail address, and per client address, in the window. */
  maxAttemptsPerEmail: 10,
  maxAttemptsPerIp: 50,
  rateWindowMinutes: 15,
  /** A session ends after this long without a request. */
  sessionIdleMinutes: Number(process.env.WORLDSHEET_SESSION_IDLE_MINUTES ?? 30),
  /** And after this long in any case. */
  sessionMaxHours: 12,
  signInLinkMinutes: 15,
  passwordResetMinutes: 30,
  invitationDays: 7,
} as const;
