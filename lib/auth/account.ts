// What people do with their own account: change the password, reset a forgotten one through an
// e-mailed link, ask for a sign-in link. Requests for unknown addresses answer the same as for known
// ones, so the form does not reveal who has an account.
import { sql, type Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';
import { enqueueMail } from '@/lib/mail/outbox';
import { appUrl } from '@/lib/http/app-url';
import type { Actor } from './actor';
import { revokeUserApiTokens } from './api-tokens';
import { consumeEmailToken, createEmailToken } from './email-tokens';
import { checkAccountPassword, lockedMessage } from './lockout';
import { hashPassword, passwordProblem } from './password';
import { endUserSessions } from './sessions';
import { AUTH_SETTINGS } from './settings';

const newPassword = z.string().superRefine((value, ctx) => {
  const problem = passwordProblem(value);
  if (problem) ctx.addIssue({ code: 'custom', message: problem });
});

export const passwordChangeSchema = z.object({
  currentPassword: z.string().min(1, 'enter your current password'),
  newPassword,
  revokeTokens: z
    .boolean()
    .default(false)
    .meta({ description: 'Also revoke every API token of the account. The other browser sessions end in any case.' }),
});
export const resetRequestSchema = z.object({
  email: z.string().trim().toLowerCase().email('enter an e-mail address').max(254),
});
export const resetConfirmSchema = z.object({ token: z.string().min(10).max(200), newPassword });

/**
 * Changes the password of the actor's account. The account's other sessions end (the one that made
 * the change goes on), and its API tokens are revoked when `revokeTokens` asks; the audit event says
 * how many of each.
 */
export async function changePassword(
  db: Kysely<Database>,
  actor: Actor,
  input: z.input<typeof passwordChangeSchema>,
): Promise<{ endedSessions: number; revokedTokens: number }> {
  await checkCurrentPassword(db, actor, input.currentPassword);
  const hashed = await hashPassword(input.newPassword);
  return db.transaction().execute(async (trx) => {
    await trx
      .updateTable('users')
      .set({ password_hash: hashed, password_changed_at: sql`now()` })
      .where('id', '=', actor.userId)
      .execute();
    const endedSessions = await endUserSessions(trx, actor.userId, 'password changed', actor.sessionId);
    const revokedTokens = input.revokeTokens ? await revokeUserApiTokens(trx, actor.userId) : 0;
    await recordAudit(trx, actor, {
      action: 'user.password-change',
      objectType: 'user',
      objectId: actor.userId,
      newValue: { endedSessions, revokedTokens, tokensRevokeAsked: Boolean(input.revokeTokens) },
    });
    return { endedSessions, revokedTokens };
  });
}

/**
 * The current password of a password change counts toward the account's lock like a sign-in
 * (lib/auth/lockout.ts); a refusal is audited (user.password-change-refused) and answered 400, or 403
 * when the account is locked.
 */
async function checkCurrentPassword(db: Kysely<Database>, actor: Actor, currentPassword: string): Promise<void> {
  const check = await checkAccountPassword(db, {
    userId: actor.userId,
    password: currentPassword,
    context: { where: 'password-change', actor },
  });
  if (check.outcome === 'ok') return;
  const refusal =
    check.outcome === 'locked'
      ? new AppError('forbidden', lockedMessage(check.until))
      : check.outcome === 'no-password'
        ? new AppError('bad_request', 'Your account has no password yet; set one through a reset link.')
        : check.outcome === 'disabled'
          ? new AppError('forbidden', 'This account is disabled.')
          : new AppError('bad_request', 'The current password is not right.');
  await recordAudit(db, actor, {
    action: 'user.password-change-refused',
    objectType: 'user',
    objectId: actor.userId,
    newValue: { outcome: check.outcome },
    reason: refusal.message,
  });
  throw refusal;
}

async function requestLink(db: Kysely<Database>, email: string, purpose: 'password-reset' | 'sign-in'): Promise<void> {
  const user = await db
    .selectFrom('users')
    .select(['id', 'display_name', 'disabled_at'])
    .where('email', '=', email)
    .executeTakeFirst();
  if (!user || user.disabled_at) return;
  if (await tooManyLinks(db, user.id, purpose)) return;
  await db.transaction().execute(async (trx) => {
    await mailLink(trx, { userId: user.id, email, name: user.display_name, purpose });
    await recordAudit(trx, null, {
      action: purpose === 'sign-in' ? 'auth.link-request' : 'auth.reset-request',
      objectType: 'user',
      objectId: user.id,
    });
  });
}

/**
 * At most three links of a kind per account in a quarter of an hour, whoever asks (the holder or an
 * administrator): neither form can be used to flood someone's mailbox.
 */
export async function tooManyLinks(
  db: Kysely<Database>,
  userId: string,
  purpose: 'password-reset' | 'sign-in',
): Promise<boolean> {
  const recent = await db
    .selectFrom('email_tokens')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where('user_id', '=', userId)
    .where('purpose', '=', purpose)
    .where('created_at', '>', sql<Date>`now() - interval '15 minutes'`)
    .executeTakeFirstOrThrow();
  return Number(recent.n) >= 3;
}

/**
 * Makes a single-use link and queues it to the account's own address, in the caller's transaction.
 * The link goes only into that mail: `sentBy` (an administrator's printed name) is said in it, so the
 * holder knows who sent a link they did not ask for.
 */
export async function mailLink(
  trx: Kysely<Database>,
  input: { userId: string; email: string; name: string; purpose: 'password-reset' | 'sign-in'; sentBy?: string },
): Promise<void> {
  const { purpose } = input;
  const minutes = purpose === 'sign-in' ? AUTH_SETTINGS.signInLinkMinutes : AUTH_SETTINGS.passwordResetMinutes;
  const token = await createEmailToken(trx, { userId: input.userId, purpose, minutes });
  const link =
    purpose === 'sign-in' ? `${appUrl()}/sign-in/link?token=${token}` : `${appUrl()}/reset-password?token=${token}`;
  const what =
    purpose === 'sign-in'
      ? `Sign in to Worldsheet with this link. It works once, for ${minutes} minutes:`
      : `Choose a new Worldsheet password with this link. It works once, for ${minutes} minutes:`;
  await enqueueMail(trx, {
    kind: purpose,
    to: input.email,
    subject: purpose === 'sign-in' ? 'Your Worldsheet sign-in link' : 'Reset your Worldsheet password',
    text: [
      `Hello ${input.name},`,
      '',
      ...(input.sentBy ? [`${input.sentBy}, an administrator of Worldsheet, sent you this link.`, ''] : []),
      what,
      '',
      link,
      '',
      input.sentBy
        ? 'If you did not expect it, tell your administrator; your password stays as it is until the link is used.'
        : 'If you did not ask for it, ignore this message.',
    ].join('\n'),
  });
}

export const requestPasswordReset = (db: Kysely<Database>, email: string) => requestLink(db, email, 'password-reset');
export const requestSignInLink = (db: Kysely<Database>, email: string) => requestLink(db, email, 'sign-in');

/**
 * Sets a new password from a reset or invitation link; the link works once. Ends every session and
 * revokes every API token of the account (whoever knew the old password may have made them); the
 * audit event says how many of each.
 */
export async function confirmPasswordReset(
  db: Kysely<Database>,
  input: z.infer<typeof resetConfirmSchema>,
): Promise<void> {
  const hashed = await hashPassword(input.newPassword);
  await db.transaction().execute(async (trx) => {
    const userId =
      (await consumeEmailToken(trx, { token: input.token, purpose: 'password-reset' })) ??
      (await consumeEmailToken(trx, { token: input.token, purpose: 'invitation' }));
    if (!userId) throw new AppError('bad_request', 'This link has expired or was already used. Ask for a new one.');
    await trx
      .updateTable('users')
      .set({ password_hash: hashed, password_changed_at: sql`now()`, failed_sign_ins: 0 })
      .where('id', '=', userId)
      .execute();
    const endedSessions = await endUserSessions(trx, userId, 'password reset');
    const revokedTokens = await revokeUserApiTokens(trx, userId);
    await recordAudit(trx, null, {
      action: 'user.password-reset',
      objectType: 'user',
      objectId: userId,
      newValue: { endedSessions, revokedTokens },
    });
  });
}
