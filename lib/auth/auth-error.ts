/** Why a sign-in was refused. The message is safe to show on the sign-in page. */
export type AuthErrorCode = 'invalid' | 'locked' | 'disabled' | 'rate_limited' | 'expired_link';

export class AuthError extends Error {
  constructor(
    readonly code: AuthErrorCode,
    message: string,
    /** For 'rate_limited': seconds until the next attempt may be made. */
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
    this.name = 'AuthError';
  }
}
