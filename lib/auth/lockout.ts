// Failed passwords per account, and the lock they lead to. The same count serves sign-in, the
// password re-entry of a signature (lib/auth/reauthenticate.ts) and the current password of a
// password change (lib/auth/account.ts): guessing through any of them locks the account.
//
// Counting and locking are one UPDATE … RETURNING, taken BEFORE the password is checked: each attempt
// first books itself as a failure, and the attempt that books the lockAfterFailures-th failure sets the
// lock in the same statement. PostgreSQL applies concurrent UPDATEs of a row one after another and
// re-checks the WHERE of each against the row as the previous one left it, so once the lock is booked
// no further attempt is admitted and no further password is evaluated, however many arrive at once.
// A right password then takes its booking back (the count starts again at 0, and a lock booked by
// that very attempt is lifted); a wrong one keeps it, and the attempt that locked sends the holder
// the unlock link and records the lock, in one transaction. No connection is held while argon2 runs.
//
// A lock is active while locked_at is set and lock_expires_at is null (an administrator's lock, until
// an administrator unlocks) or in the future (a timed lock after failures: lockMinutes, doubled for
// each further lockAfterFailures failures without a success, at most lockMaxHours).
import { sql, type Kysely, type Transaction } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';
import { appUrl } from '@/lib/http/app-url';
import { enqueueMail } from '@/lib/mail/outbox';
import { consumeEmailToken, createEmailToken } from './email-tokens';
import { verifyPassword } from './password';
import { AUTH_SETTINGS } from './settings';

type Db = Kysely<Database> | Transaction<Database>;

/** SQL: the users row in hand is locked now. */
export const LOCK_ACTIVE = sql<boolean>`(locked_at is not null and (lock_expires_at is null or lock_expires_at > now()))`;

/** `2026-12-03 14:05 UTC`: the same on every machine. */
function formatUtcMinute(at: Date): string {
  return `${at.toISOString().slice(0, 10)} ${at.toISOString().slice(11, 16)} UTC`;
}

/** What a locked account is told (at sign-in, and at a signature or password change). */
export function lockedMessage(until: Date | null): string {
  return until
    ? `This account is locked after ${AUTH_SETTINGS.lockAfterFailures} failed sign-in attempts, until ${formatUtcMinute(until)}. ` +
        'Its holder has been e-mailed a link that unlocks it now; an administrator can unlock it too.'
    : 'This account is locked by an administrator. An administrator must unlock it.';
}

/** Minutes of the lock that the failure numbered `failures` (a multiple of lockAfterFailures) sets. */
export function lockMinutesFor(failures: number): number {
  const nth = Math.max(1, Math.floor(failures / AUTH_SETTINGS.lockAfterFailures));
  return Math.min(AUTH_SETTINGS.lockMinutes * 2 ** (nth - 1), AUTH_SETTINGS.lockMaxHours * 60);
}

interface Booking {
  userId: string;
  email: string;
  name: string;
  passwordHash: string;
  failures: number;
  /** This attempt booked the failure that locks the account (until lockExpiresAt). */
  locks: boolean;
  lockExpiresAt: Date | null;
}

/**
 * Books one failed attempt on the account, locking it when this is the lockAfterFailures-th, in one
 * statement; null when the account is locked, disabled or has no password (nothing was booked).
 */
async function bookAttempt(db: Db, userId: string): Promise<Booking | null> {
  const L = AUTH_SETTINGS.lockAfterFailures;
  const locks = sql<boolean>`(failed_sign_ins + 1) % ${L} = 0`;
  const minutes = sql<number>`least(${AUTH_SETTINGS.lockMinutes}::float8 * power(2, (failed_sign_ins + 1) / ${L} - 1), ${AUTH_SETTINGS.lockMaxHours * 60}::float8)`;
  const row = await db
    .updateTable('users')
    .set({
      failed_sign_ins: sql`failed_sign_ins + 1`,
      // An expired timed lock is cleared by the next attempt.
      locked_at: sql`case when ${locks} then now() when lock_expires_at <= now() then null else locked_at end`,
      lock_expires_at: sql`case when ${locks} then now() + interval '1 minute' * ${minutes} when lock_expires_at <= now() then null else lock_expires_at end`,
    })
    .where('id', '=', userId)
    .where('disabled_at', 'is', null)
    .where('password_hash', 'is not', null)
    .where(sql<boolean>`not ${LOCK_ACTIVE}`)
    .returning(['id', 'email', 'display_name', 'password_hash', 'failed_sign_ins', 'lock_expires_at'])
    .executeTakeFirst();
  if (!row) return null;
  return {
    userId: row.id,
    email: row.email,
    name: row.display_name,
    passwordHash: row.password_hash!,
    failures: row.failed_sign_ins,
    locks: row.failed_sign_ins % L === 0,
    lockExpiresAt: row.lock_expires_at,
  };
}

export type PasswordCheck =
  | { outcome: 'ok' }
  | { outcome: 'wrong' }
  /** `until` null: locked by an administrator. `lockedNow`: this attempt locked it. */
  | { outcome: 'locked'; until: Date | null; lockedNow: boolean }
  | { outcome: 'disabled' }
  | { outcome: 'no-password' };

export interface AttemptContext {
  /** Where the password was typed, for the e-mail and the audit trail. */
  where: 'sign-in' | 'signature' | 'password-change';
  /** The client's address, when known. */
  ip?: string;
  /** Who was signed in (a re-entry or a password change), for the audit event of the lock. */
  actor?: Actor | null;
}

const WHERE_TEXT: Record<AttemptContext['where'], string> = {
  'sign-in': 'signing in',
  signature: 'signing a record',
  'password-change': 'changing the password',
};

/**
 * Checks `password` against the account's, counting a failure toward the lock (see the top of the
 * file). The lock is decided before the password is evaluated: a locked account's password is never
 * checked.
 */
export async function checkAccountPassword(
  db: Kysely<Database>,
  input: { userId: string; password: string; context: AttemptContext },
): Promise<PasswordCheck> {
  const booking = await bookAttempt(db, input.userId);
  if (!booking) {
    const u = await db
      .selectFrom('users')
      .select(['disabled_at', 'password_hash', 'lock_expires_at', LOCK_ACTIVE.as('locked')])
      .where('id', '=', input.userId)
      .executeTakeFirstOrThrow();
    if (u.disabled_at) return { outcome: 'disabled' };
    if (!u.password_hash) return { outcome: 'no-password' };
    // Locked (or, in a race, unlocked a moment ago: refused all the same, without evaluating).
    return { outcome: 'locked', until: u.locked ? u.lock_expires_at : null, lockedNow: false };
  }
  const ok = await verifyPassword(booking.passwordHash, input.password);
  if (ok) {
    await db
      .updateTable('users')
      .set({
        failed_sign_ins: 0,
        // Lift the lock this attempt booked, unless another attempt or an administrator came since.
        locked_at: sql`case when ${booking.locks} and failed_sign_ins = ${booking.failures} and lock_expires_at is not null then null else locked_at end`,
        lock_expires_at: sql`case when ${booking.locks} and failed_sign_ins = ${booking.failures} and lock_expires_at is not null then null else lock_expires_at end`,
      })
      .where('id', '=', booking.userId)
      .execute();
    return { outcome: 'ok' };
  }
  if (!booking.locks) return { outcome: 'wrong' };
  await announceLock(db, booking, input.context);
  return { outcome: 'locked', until: booking.lockExpiresAt, lockedNow: true };
}

/** The lock's audit event and the holder's e-mail with a single-use unlock link, in one transaction. */
async function announceLock(db: Kysely<Database>, booking: Booking, context: AttemptContext): Promise<void> {
  const until = booking.lockExpiresAt!;
  const minutes = Math.max(1, Math.ceil((until.getTime() - Date.now()) / 60_000));
  await db.transaction().execute(async (trx) => {
    await recordAudit(trx, context.actor ?? null, {
      action: 'user.lock',
      objectType: 'user',
      objectId: booking.userId,
      newValue: {
        locked: true,
        until: until.toISOString(),
        failedAttempts: booking.failures,
        where: context.where,
        ip: context.ip ?? null,
      },
      reason: `${booking.failures} failed password attempts in a row (the last while ${WHERE_TEXT[context.where]})`,
    });
    const token = await createEmailToken(trx, { userId: booking.userId, purpose: 'unlock', minutes });
    await enqueueMail(trx, {
      kind: 'account-locked',
      to: booking.email,
      subject: 'Your Worldsheet account is locked',
      text: [
        `Hello ${booking.name},`,
        '',
        `Your Worldsheet account is locked after ${booking.failures} wrong passwords in a row, the last one while ${WHERE_TEXT[context.where]}` +
          `${context.ip && context.ip !== 'unknown' ? ` from the address ${context.ip}` : ''}. It unlocks by itself at ${formatUtcMinute(until)}.`,
        '',
        'If that was you, you can unlock it now with this link (it works once):',
        '',
        `${appUrl()}/unlock?token=${token}`,
        '',
        'If it was not you, someone may be guessing your password: unlock the account, consider changing your password, and tell an administrator.',
      ].join('\n'),
    });
  });
}

export const unlockSchema = z.object({ token: z.string().min(10).max(200) });

/** The e-mailed unlock link: lifts a timed lock (not an administrator's) and starts the count again. Audited. */
export async function unlockWithToken(db: Kysely<Database>, token: string): Promise<{ unlocked: boolean }> {
  return db.transaction().execute(async (trx) => {
    const userId = await consumeEmailToken(trx, { token, purpose: 'unlock' });
    if (!userId)
      throw new AppError(
        'bad_request',
        'This unlock link has expired or was already used. Sign in, or ask an administrator.',
      );
    const user = await trx
      .selectFrom('users')
      .select(['locked_at', 'lock_expires_at', LOCK_ACTIVE.as('locked')])
      .where('id', '=', userId)
      .forUpdate()
      .executeTakeFirstOrThrow();
    if (user.locked && user.lock_expires_at === null) {
      throw new AppError(
        'conflict',
        'An administrator has locked this account since; only an administrator can unlock it.',
      );
    }
    await trx
      .updateTable('users')
      .set({ locked_at: null, lock_expires_at: null, failed_sign_ins: 0 })
      .where('id', '=', userId)
      .execute();
    await recordAudit(trx, null, {
      action: 'user.unlock',
      objectType: 'user',
      objectId: userId,
      oldValue: { locked: Boolean(user.locked), until: user.lock_expires_at?.toISOString() ?? null },
      reason: 'unlock link e-mailed to the holder',
    });
    return { unlocked: Boolean(user.locked) };
  });
}
