// Password and link sign-in with rate limits and lockout (21 CFR Part 11 §11.300(d); NIST SP 800-63B
// §5.2.2). Two limits, both decided before any password is evaluated:
//  - per account (lib/auth/lockout.ts): lockAfterFailures wrong passwords in a row lock the account
//    for a while (longer each time), and its holder is e-mailed a single-use unlock link;
//  - per client address (lib/http/client-address.ts): failures only, a success never counts. After
//    ipFreeFailures failures in the window, each further attempt from that address must wait twice as
//    long as the one before after the address's latest failure (1, 2, 4… s), and is refused with
//    "try again in N s" meanwhile. The server never sleeps: it refuses at once.
// Every attempt is written down (sign_in_attempts) before the limit is read, as a failure until it
// succeeds, so that concurrent attempts from one address see each other: of a burst, at most the
// allowance is evaluated. An attempt refused by the address limit is not kept (it was not a guess).
//
// An address without an account is answered as a wrong password, after the same argon2 work
// (lib/auth/password.ts dummyPasswordHash), and after lockAfterFailures failures in lockMinutes as
// a locked account, so neither the answer nor its time tells whether the address has an account.
// A disabled account says so only to someone who gave its right password.
import { sql, type Kysely } from 'kysely';
import type { Database } from '@/db/schema';
import { AuthError } from './auth-error';
import { consumeEmailToken, hashToken } from './email-tokens';
import { checkAccountPassword, LOCK_ACTIVE, lockedMessage, lockMinutesFor } from './lockout';
import { verifyPasswordOrDummy } from './password';
import { AUTH_SETTINGS } from './settings';

export interface SignedInUser {
  id: string;
  email: string;
  name: string;
  isAdmin: boolean;
}

const INVALID = 'The e-mail address or the password is not right.';
const DISABLED = 'This account is disabled. Ask an administrator.';

/** The address a request came from could not be told (the app runs without its server, lib/ops/server.ts): no per-address limit then. */
const UNKNOWN_ADDRESS = 'unknown';

/** Seconds an address must wait after its latest failure, having had `failures` in the window. */
function addressDelaySeconds(failures: number): number {
  if (failures < AUTH_SETTINGS.ipFreeFailures) return 0;
  return Math.min(2 ** (failures - AUTH_SETTINGS.ipFreeFailures), AUTH_SETTINGS.rateWindowMinutes * 60);
}

async function noteAttempt(
  db: Kysely<Database>,
  email: string,
  ip: string,
  method: 'password' | 'link',
): Promise<string> {
  const row = await db
    .insertInto('sign_in_attempts')
    .values({ email, ip, method, ok: false })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

async function succeeded(db: Kysely<Database>, attemptId: string): Promise<void> {
  await db.updateTable('sign_in_attempts').set({ ok: true }).where('id', '=', attemptId).execute();
}

/** Refuses (and forgets) this attempt when its address has to wait; see the top of the file. */
async function throttleAddress(db: Kysely<Database>, ip: string, attemptId: string): Promise<void> {
  if (ip === UNKNOWN_ADDRESS) return;
  const row = await db
    .selectFrom('sign_in_attempts')
    .select([
      (eb) => eb.fn.countAll<string>().as('failures'),
      sql<string | null>`extract(epoch from now() - max(at))::float8`.as('since_last'),
    ])
    .where('ip', '=', ip)
    .where('ok', '=', false)
    .where('id', '!=', attemptId)
    .where('at', '>', sql<Date>`now() - make_interval(mins => ${AUTH_SETTINGS.rateWindowMinutes})`)
    .executeTakeFirstOrThrow();
  const wait = addressDelaySeconds(Number(row.failures)) - Number(row.since_last ?? Infinity);
  if (wait > 0) {
    await db.deleteFrom('sign_in_attempts').where('id', '=', attemptId).execute();
    const seconds = Math.ceil(wait);
    throw new AuthError(
      'rate_limited',
      `Too many failed sign-in attempts from your network. Try again in ${seconds} ${seconds === 1 ? 'second' : 'seconds'}.`,
      seconds,
    );
  }
}

/**
 * An address without an account looks locked after as many failures as an account locks after:
 * the failures of the last lockMinutes before this attempt, oldest first.
 */
async function unknownAddressFailures(db: Kysely<Database>, email: string, attemptId: string): Promise<Date[]> {
  const rows = await db
    .selectFrom('sign_in_attempts')
    .select('at')
    .where('email', '=', email)
    .where('ok', '=', false)
    .where('id', '!=', attemptId)
    .where('at', '>', sql<Date>`now() - make_interval(mins => ${lockMinutesFor(AUTH_SETTINGS.lockAfterFailures)})`)
    .orderBy('at', 'asc')
    .execute();
  return rows.map((r) => r.at);
}

export async function authenticatePassword(
  db: Kysely<Database>,
  input: { email: string; password: string; ip: string },
): Promise<SignedInUser> {
  const email = input.email.trim().toLowerCase();
  const attemptId = await noteAttempt(db, email, input.ip, 'password');
  await throttleAddress(db, input.ip, attemptId);
  const user = await db
    .selectFrom('users')
    .select(['id', 'email', 'display_name', 'password_hash', 'is_admin', 'disabled_at'])
    .where('email', '=', email)
    .executeTakeFirst();
  if (!user) {
    // As an account: the lockAfterFailures-th failure is evaluated and answers "locked", later ones are not evaluated.
    const prior = await unknownAddressFailures(db, email, attemptId);
    const L = AUTH_SETTINGS.lockAfterFailures;
    const lockedFor = lockMinutesFor(L) * 60_000;
    if (prior.length >= L) throw new AuthError('locked', lockedMessage(new Date(prior[L - 1].getTime() + lockedFor)));
    await verifyPasswordOrDummy(null, input.password);
    if (prior.length === L - 1) throw new AuthError('locked', lockedMessage(new Date(Date.now() + lockedFor)));
    throw new AuthError('invalid', INVALID);
  }
  if (user.disabled_at || !user.password_hash) {
    // The same work as for any address; "disabled" only for the right password.
    const right = await verifyPasswordOrDummy(user.password_hash, input.password);
    throw right && user.disabled_at ? new AuthError('disabled', DISABLED) : new AuthError('invalid', INVALID);
  }
  const check = await checkAccountPassword(db, {
    userId: user.id,
    password: input.password,
    context: { where: 'sign-in', ip: input.ip },
  });
  switch (check.outcome) {
    case 'ok':
      await succeeded(db, attemptId);
      return { id: user.id, email: user.email, name: user.display_name, isAdmin: user.is_admin };
    case 'locked':
      throw new AuthError('locked', lockedMessage(check.until));
    case 'disabled':
      throw new AuthError('disabled', DISABLED);
    default:
      throw new AuthError('invalid', INVALID);
  }
}

/**
 * Signs in with a single-use e-mailed link, under the same address limit as passwords (checked
 * before the link is used; a link that does not work is a failure). A locked or disabled account
 * cannot use one, and its link is then left unused.
 */
export async function authenticateLink(
  db: Kysely<Database>,
  input: { token: string; ip: string },
): Promise<SignedInUser> {
  const holder = await db
    .selectFrom('email_tokens')
    .innerJoin('users', 'users.id', 'email_tokens.user_id')
    .select(['users.email'])
    .where('email_tokens.token_hash', '=', hashToken(input.token))
    .where('email_tokens.purpose', '=', 'sign-in')
    .executeTakeFirst();
  const attemptId = await noteAttempt(db, holder?.email ?? '', input.ip, 'link');
  await throttleAddress(db, input.ip, attemptId);
  if (holder) {
    const state = await db
      .selectFrom('users')
      .select(['disabled_at', 'lock_expires_at', LOCK_ACTIVE.as('locked')])
      .where('email', '=', holder.email)
      .executeTakeFirstOrThrow();
    if (state.disabled_at) throw new AuthError('disabled', DISABLED);
    if (state.locked) throw new AuthError('locked', lockedMessage(state.lock_expires_at));
  }
  const userId = await consumeEmailToken(db, { token: input.token, purpose: 'sign-in' });
  if (!userId)
    throw new AuthError('expired_link', 'This sign-in link has expired or was already used. Ask for a new one.');
  const user = await db
    .selectFrom('users')
    .select(['id', 'email', 'display_name', 'is_admin', 'disabled_at', 'lock_expires_at', LOCK_ACTIVE.as('locked')])
    .where('id', '=', userId)
    .executeTakeFirstOrThrow();
  // Disabled or locked between the look and the use.
  if (user.disabled_at) throw new AuthError('disabled', DISABLED);
  if (user.locked) throw new AuthError('locked', lockedMessage(user.lock_expires_at));
  await succeeded(db, attemptId);
  return { id: user.id, email: user.email, name: user.display_name, isAdmin: user.is_admin };
}
