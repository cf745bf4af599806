// Accounts, as administrators manage them: invite, disable and enable (never delete: signatures
// must stay readable), lock (until an administrator unlocks), unlock, and send a password-reset link.
import { sql, type Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { mailLink, tooManyLinks } from '@/lib/auth/account';
import { createEmailToken } from '@/lib/auth/email-tokens';
import { LOCK_ACTIVE } from '@/lib/auth/lockout';
import { endUserSessions } from '@/lib/auth/sessions';
import { AUTH_SETTINGS } from '@/lib/auth/settings';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';
import { appUrl } from '@/lib/http/app-url';
import { enqueueMail } from '@/lib/mail/outbox';

export const inviteSchema = z.object({
  email: z.string().trim().toLowerCase().email('enter an e-mail address').max(254),
  name: z.string().trim().min(1, 'enter the printed name used on signatures').max(200),
  isAdmin: z.boolean().default(false),
});

export const userChangeSchema = z.object({
  action: z.enum(['disable', 'enable', 'lock', 'unlock', 'send-password-reset']),
  reason: z.string().trim().min(3, 'give a reason').max(1000),
});

export async function listUsers(db: Kysely<Database>) {
  return db
    .selectFrom('users')
    .select([
      'id',
      'email',
      'display_name as name',
      'is_admin as isAdmin',
      'disabled_at as disabledAt',
      // Only a lock in force; lockedUntil null with lockedAt set: until an administrator unlocks.
      sql<Date | null>`case when ${LOCK_ACTIVE} then locked_at end`.as('lockedAt'),
      sql<Date | null>`case when ${LOCK_ACTIVE} then lock_expires_at end`.as('lockedUntil'),
      'created_at as createdAt',
      sql<boolean>`password_hash is not null`.as('hasPassword'),
    ])
    .orderBy('display_name')
    .execute();
}

export async function inviteUser(
  db: Kysely<Database>,
  actor: Actor,
  input: z.infer<typeof inviteSchema>,
): Promise<{ id: string }> {
  return db.transaction().execute(async (trx) => {
    const existing = await trx.selectFrom('users').select('id').where('email', '=', input.email).executeTakeFirst();
    if (existing) throw new AppError('conflict', 'There is an account with this e-mail address already.');
    const user = await trx
      .insertInto('users')
      .values({ email: input.email, display_name: input.name, password_hash: null, is_admin: input.isAdmin })
      .returning('id')
      .executeTakeFirstOrThrow();
    const token = await createEmailToken(trx, {
      userId: user.id,
      purpose: 'invitation',
      minutes: AUTH_SETTINGS.invitationDays * 24 * 60,
    });
    await enqueueMail(trx, {
      kind: 'invitation',
      to: input.email,
      subject: 'You are invited to Worldsheet',
      text: [
        `Hello ${input.name},`,
        '',
        `${actor.name} has given you an account on Worldsheet. Choose your password here (the link works once, for ${AUTH_SETTINGS.invitationDays} days):`,
        '',
        `${appUrl()}/reset-password?token=${token}&invitation=1`,
      ].join('\n'),
    });
    await recordAudit(trx, actor, {
      action: 'user.invite',
      objectType: 'user',
      objectId: user.id,
      newValue: { email: input.email, name: input.name, isAdmin: input.isAdmin },
    });
    return user;
  });
}

export async function changeUser(
  db: Kysely<Database>,
  actor: Actor,
  userId: string,
  input: z.infer<typeof userChangeSchema>,
): Promise<void> {
  if (userId === actor.userId && input.action === 'disable')
    throw new AppError('conflict', 'You cannot disable your own account.');
  await db.transaction().execute(async (trx) => {
    const user = await trx
      .selectFrom('users')
      .select(['id', 'email', 'display_name', 'disabled_at', 'lock_expires_at', LOCK_ACTIVE.as('locked')])
      .where('id', '=', userId)
      .forUpdate()
      .executeTakeFirst();
    if (!user) throw new AppError('not_found', 'No such user.');
    if (input.action === 'disable') {
      if (user.disabled_at) throw new AppError('conflict', 'The account is disabled already.');
      await trx
        .updateTable('users')
        .set({ disabled_at: sql`now()` })
        .where('id', '=', userId)
        .execute();
      await endUserSessions(trx as unknown as Kysely<Database>, userId, 'user disabled');
      await trx
        .updateTable('api_tokens')
        .set({ revoked_at: sql`now()` })
        .where('user_id', '=', userId)
        .where('revoked_at', 'is', null)
        .execute();
    } else if (input.action === 'enable') {
      if (!user.disabled_at) throw new AppError('conflict', 'The account is not disabled.');
      await trx.updateTable('users').set({ disabled_at: null }).where('id', '=', userId).execute();
    } else if (input.action === 'lock') {
      // An administrator's lock has no end (lock_expires_at null): it lasts until an administrator
      // unlocks, and the holder's e-mailed unlock links do not lift it. A timed lock becomes one.
      if (user.locked && user.lock_expires_at === null)
        throw new AppError('conflict', 'The account is locked already.');
      await trx
        .updateTable('users')
        .set({ locked_at: sql`now()`, lock_expires_at: null })
        .where('id', '=', userId)
        .execute();
      // Its sessions end now; its API tokens are refused while the lock lasts (lib/auth/api-tokens.ts).
      await endUserSessions(trx, userId, 'user locked');
    } else if (input.action === 'send-password-reset') {
      // The link is mailed to the account's own address and never shown to the administrator, so it
      // lets nobody act as someone else; sending one to oneself is audited like any other.
      if (user.disabled_at) throw new AppError('conflict', 'The account is disabled: enable it first.');
      if (await tooManyLinks(trx, userId, 'password-reset'))
        throw new AppError(
          'too_many_requests',
          'Three reset links went to this account in the last 15 minutes; wait before sending another.',
        );
      await mailLink(trx, {
        userId,
        email: user.email,
        name: user.display_name,
        purpose: 'password-reset',
        sentBy: actor.name,
      });
    } else {
      if (!user.locked) throw new AppError('conflict', 'The account is not locked.');
      await trx
        .updateTable('users')
        .set({ locked_at: null, lock_expires_at: null, failed_sign_ins: 0 })
        .where('id', '=', userId)
        .execute();
    }
    await recordAudit(trx, actor, {
      action: `user.${input.action}`,
      objectType: 'user',
      objectId: userId,
      oldValue: {
        disabled: Boolean(user.disabled_at),
        locked: Boolean(user.locked),
        lockedUntil: user.locked ? (user.lock_expires_at?.toISOString() ?? null) : null,
      },
      newValue: input.action === 'send-password-reset' ? { mailedTo: user.email } : undefined,
      reason: input.reason,
    });
  });
}
