// The account lock and the per-address limit, against the real database: counted and decided before
// any password is evaluated, atomically under real concurrency (21 CFR Part 11 §11.300(d); NIST SP
// 800-63B §5.2.2). The work is counted with the argon2 verification observer of lib/auth/password.ts,
// never timed.
import { sql, type Kysely } from 'kysely';
import { afterAll, afterEach, beforeEach, describe, expect, inject, it } from 'vitest';
import { createDb } from '../../db/index';
import type { Database } from '../../db/schema';
import type { Actor } from '../../lib/auth/actor';
import { changePassword } from '../../lib/auth/account';
import { AuthError } from '../../lib/auth/auth-error';
import { createEmailToken } from '../../lib/auth/email-tokens';
import { unlockWithToken } from '../../lib/auth/lockout';
import { hashPassword, observePasswordVerifications } from '../../lib/auth/password';
import { reauthenticateToSign } from '../../lib/auth/reauthenticate';
import { AUTH_SETTINGS } from '../../lib/auth/settings';
import { authenticateLink, authenticatePassword } from '../../lib/auth/sign-in';
import { changeUser } from '../../lib/projects/users';
import { makeSheet } from '../support/approved-sheet';
import { testDb } from '../support/database';
import { drainMailQueue, listMail, waitForMail } from '../support/mailbox';
import { makeProject, makeUser, PASSWORD } from '../support/people';
import { refusal } from '../support/refusal';

const L = AUTH_SETTINGS.lockAfterFailures;

// A pool as large as the bursts, so that every attempt of a burst is in PostgreSQL at the same time.
let burstDb: Kysely<Database>;
beforeEach(() => {
  burstDb ??= createDb(inject('databaseUrl'), { max: 40 });
});
afterAll(async () => {
  await burstDb?.destroy();
});

/** Hashes argon2 verified, while observing. */
let verified: string[] = [];
let stopObserving: () => void = () => undefined;
beforeEach(() => {
  verified = [];
  stopObserving = observePasswordVerifications((hash) => verified.push(hash));
});
afterEach(() => stopObserving());

async function attempt(
  email: string,
  password: string,
  ip = '10.0.0.1',
  db: Kysely<Database> = testDb(),
): Promise<string> {
  try {
    await authenticatePassword(db, { email, password, ip });
    return 'ok';
  } catch (error) {
    if (error instanceof AuthError) return error.code;
    throw error;
  }
}

async function userRow(id: string) {
  return testDb()
    .selectFrom('users')
    .select([
      'failed_sign_ins',
      'locked_at',
      'lock_expires_at',
      sql<number | null>`extract(epoch from lock_expires_at - locked_at)::float8`.as('lockSeconds'),
    ])
    .where('id', '=', id)
    .executeTakeFirstOrThrow();
}

async function failAndLock(email: string): Promise<void> {
  for (let i = 1; i <= L; i++)
    expect(await attempt(email, `wrong ${i}`, `10.1.0.${i}`)).toBe(i < L ? 'invalid' : 'locked');
}

describe('the account lock', () => {
  it(`is timed: ${L} wrong passwords lock for ${AUTH_SETTINGS.lockMinutes} minutes, the next ${L} for twice as long; then the right password works`, async () => {
    const ada = await makeUser(testDb(), 'ada@example.test');
    await failAndLock('ada@example.test');
    expect(await userRow(ada.userId)).toMatchObject({
      failed_sign_ins: L,
      lockSeconds: AUTH_SETTINGS.lockMinutes * 60,
    });
    expect(await attempt('ada@example.test', PASSWORD)).toBe('locked');
    // The lock runs out (moved into the past rather than waited for).
    await sql`update users set locked_at = locked_at - interval '1 day', lock_expires_at = now() - interval '1 second' where id = ${ada.userId}`.execute(
      testDb(),
    );
    for (let i = 1; i <= L; i++)
      expect(await attempt('ada@example.test', `again ${i}`, `10.2.0.${i}`)).toBe(i < L ? 'invalid' : 'locked');
    expect(await userRow(ada.userId)).toMatchObject({
      failed_sign_ins: 2 * L,
      lockSeconds: 2 * AUTH_SETTINGS.lockMinutes * 60,
    });
    await sql`update users set lock_expires_at = now() - interval '1 second' where id = ${ada.userId}`.execute(
      testDb(),
    );
    expect(await attempt('ada@example.test', PASSWORD)).toBe('ok');
    expect(await userRow(ada.userId)).toMatchObject({ failed_sign_ins: 0 });
  });

  it("is decided before the password: a locked account's right password is not even evaluated", async () => {
    await makeUser(testDb(), 'ada@example.test');
    await failAndLock('ada@example.test');
    verified = [];
    expect(await attempt('ada@example.test', PASSWORD, '10.3.0.1')).toBe('locked');
    expect(verified).toEqual([]);
  });

  it('e-mails the holder a single-use unlock link, audits the lock and the unlock, and says until when', async () => {
    const ada = await makeUser(testDb(), 'ada@example.test');
    for (let i = 1; i < L; i++) await attempt('ada@example.test', `wrong ${i}`, '192.0.2.7');
    const error = await refusal(
      authenticatePassword(testDb(), { email: 'ada@example.test', password: 'wrong last', ip: '192.0.2.7' }),
      AuthError,
    );
    expect(error.code).toBe('locked');
    expect(error.message).toMatch(
      new RegExp(
        `^This account is locked after ${L} failed sign-in attempts, until \\d{4}-\\d\\d-\\d\\d \\d\\d:\\d\\d UTC\\. Its holder has been e-mailed a link`,
      ),
    );
    await drainMailQueue();
    const mail = await waitForMail({ to: 'ada@example.test', kind: 'account-locked' });
    expect(mail.subject).toBe('Your Worldsheet account is locked');
    expect(mail.text).toContain('from the address 192.0.2.7');
    const link = mail.links.find((l) => l.includes('/unlock?token='))!;
    const token = new URL(link).searchParams.get('token')!;

    expect(await unlockWithToken(testDb(), token)).toEqual({ unlocked: true });
    expect(await userRow(ada.userId)).toMatchObject({ failed_sign_ins: 0, locked_at: null, lock_expires_at: null });
    expect((await refusal(unlockWithToken(testDb(), token))).code).toBe('bad_request');
    expect(await attempt('ada@example.test', PASSWORD)).toBe('ok');

    const events = await testDb()
      .selectFrom('audit_events')
      .select(['action', 'object_id', 'reason'])
      .where('action', 'in', ['user.lock', 'user.unlock'])
      .orderBy('id')
      .execute();
    expect(events).toEqual([
      {
        action: 'user.lock',
        object_id: ada.userId,
        reason: `${L} failed password attempts in a row (the last while signing in)`,
      },
      { action: 'user.unlock', object_id: ada.userId, reason: 'unlock link e-mailed to the holder' },
    ]);
  });

  it("can be set by an administrator until an administrator unlocks; the holder's unlock link does not lift it; all audited", async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    const ada = await makeUser(testDb(), 'ada@example.test');
    const token = await createEmailToken(testDb(), { userId: ada.userId, purpose: 'unlock', minutes: 15 });
    await changeUser(testDb(), admin, ada.userId, { action: 'lock', reason: 'left the project' });
    expect(await userRow(ada.userId)).toMatchObject({ lock_expires_at: null });
    expect(await attempt('ada@example.test', PASSWORD)).toBe('locked');
    expect((await refusal(unlockWithToken(testDb(), token))).code).toBe('conflict');
    expect((await refusal(changeUser(testDb(), admin, ada.userId, { action: 'lock', reason: 'twice' }))).code).toBe(
      'conflict',
    );
    await changeUser(testDb(), admin, ada.userId, { action: 'unlock', reason: 'back on the project' });
    expect(await attempt('ada@example.test', PASSWORD)).toBe('ok');
    const events = await testDb()
      .selectFrom('audit_events')
      .select(['action', 'actor_id', 'reason'])
      .where('action', 'in', ['user.lock', 'user.unlock'])
      .orderBy('id')
      .execute();
    expect(events).toEqual([
      { action: 'user.lock', actor_id: admin.userId, reason: 'left the project' },
      { action: 'user.unlock', actor_id: admin.userId, reason: 'back on the project' },
    ]);
  });

  it("an administrator's lock replaces a timed one, and unlocking a timed lock starts the count again", async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    const ada = await makeUser(testDb(), 'ada@example.test');
    await failAndLock('ada@example.test');
    await changeUser(testDb(), admin, ada.userId, { action: 'unlock', reason: 'she called' });
    expect(await userRow(ada.userId)).toMatchObject({ failed_sign_ins: 0, locked_at: null });
    await failAndLock('ada@example.test');
    await changeUser(testDb(), admin, ada.userId, { action: 'lock', reason: 'until we know more' });
    expect(await userRow(ada.userId)).toMatchObject({ lock_expires_at: null });
  });
});

describe('under concurrency', () => {
  it(`evaluates no more than ${L} of 30 concurrent wrong passwords, and the account ends locked`, async () => {
    const ada = await makeUser(testDb(), 'ada@example.test');
    const results = await Promise.all(
      Array.from({ length: 30 }, (_, i) => attempt('ada@example.test', `wrong ${i}`, `10.4.${i}.1`, burstDb)),
    );
    expect(verified.length).toBe(L);
    expect(results.filter((r) => r === 'invalid').length).toBe(L - 1);
    expect(results.filter((r) => r === 'locked').length).toBe(30 - (L - 1));
    expect(await userRow(ada.userId)).toMatchObject({
      failed_sign_ins: L,
      lockSeconds: AUTH_SETTINGS.lockMinutes * 60,
    });
    expect(
      await testDb().selectFrom('audit_events').select('action').where('action', '=', 'user.lock').execute(),
    ).toHaveLength(1);
  });

  it('gives no session to the right password sent in a burst of 40 after the burst locked the account', async () => {
    const ada = await makeUser(testDb(), 'ada@example.test');
    const burst = Promise.all(
      Array.from({ length: 40 }, (_, i) => attempt('ada@example.test', `wrong ${i}`, `10.5.${i}.1`, burstDb)),
    );
    // The moment the lock is booked, while the burst may still be in flight.
    for (;;) {
      const row = await userRow(ada.userId);
      if (row.lock_expires_at) break;
      await new Promise((r) => setTimeout(r, 1));
    }
    const right = await attempt('ada@example.test', PASSWORD, '10.6.0.1', burstDb);
    const results = await burst;
    expect(right).toBe('locked');
    expect(results).not.toContain('ok');
    expect(verified.length).toBe(L);
    expect(await testDb().selectFrom('sign_in_attempts').select('id').where('ok', '=', true).execute()).toEqual([]);
  });

  it(`evaluates no more than ${AUTH_SETTINGS.ipFreeFailures} of 30 concurrent failures from one address`, async () => {
    const results = await Promise.all(
      Array.from({ length: 30 }, (_, i) => attempt(`nobody${i}@example.test`, 'guess', '203.0.113.9', burstDb)),
    );
    expect(verified.length).toBeLessThanOrEqual(AUTH_SETTINGS.ipFreeFailures);
    expect(results.filter((r) => r === 'invalid').length).toBe(verified.length);
    expect(results.filter((r) => r === 'rate_limited').length).toBe(30 - verified.length);
  });
});

describe('the per-address limit', () => {
  it('counts failures only: 60 successful sign-ins from one address do not hold back anyone', async () => {
    await Promise.all(['ada', 'bea', 'cy'].map((n) => makeUser(testDb(), `${n}@example.test`)));
    for (let i = 0; i < 60; i++) expect(await attempt('ada@example.test', PASSWORD, '198.51.100.1')).toBe('ok');
    expect(await attempt('bea@example.test', PASSWORD, '198.51.100.1')).toBe('ok');
    expect(await attempt('cy@example.test', 'a typo', '198.51.100.1')).toBe('invalid');
  });

  it(`slows an address down after ${AUTH_SETTINGS.ipFreeFailures} failures, doubling the wait with each further failure; other addresses go on`, async () => {
    await makeUser(testDb(), 'ada@example.test');
    const free = AUTH_SETTINGS.ipFreeFailures;
    for (let i = 0; i < free; i++)
      expect(await attempt(`nobody${i}@example.test`, 'guess', '203.0.113.5')).toBe('invalid');
    const waits: number[] = [];
    for (let n = 0; n < 3; n++) {
      // Refused at once, even with the right password of an account, and not counted as a failure.
      const error = await refusal(
        authenticatePassword(testDb(), { email: 'ada@example.test', password: PASSWORD, ip: '203.0.113.5' }),
        AuthError,
      );
      expect(error.code).toBe('rate_limited');
      expect(error.message).toMatch(
        /^Too many failed sign-in attempts from your network\. Try again in \d+ seconds?\.$/,
      );
      waits.push(error.retryAfterSeconds!);
      // The wait passes (the failures are moved back rather than waited for); one more failure.
      await sql`update sign_in_attempts set at = at - make_interval(secs => ${error.retryAfterSeconds! + 1}) where ip = '203.0.113.5'`.execute(
        testDb(),
      );
      expect(await attempt(`late${n}@example.test`, 'guess', '203.0.113.5')).toBe('invalid');
    }
    expect(waits).toEqual([1, 2, 4]);
    expect(await attempt('ada@example.test', PASSWORD, '203.0.113.6')).toBe('ok');
  });

  it('applies to sign-in links too, decided before the link is used; a link that does not work is a failure', async () => {
    const ada = await makeUser(testDb(), 'ada@example.test');
    const token = await createEmailToken(testDb(), { userId: ada.userId, purpose: 'sign-in', minutes: 15 });
    for (let i = 0; i < AUTH_SETTINGS.ipFreeFailures; i++) {
      expect(
        (await refusal(authenticateLink(testDb(), { token: `stolen-or-guessed-${i}`, ip: '203.0.113.7' }), AuthError))
          .code,
      ).toBe('expired_link');
    }
    const failures = await testDb()
      .selectFrom('sign_in_attempts')
      .select(['method', 'ok'])
      .where('ip', '=', '203.0.113.7')
      .execute();
    expect(failures).toEqual(
      Array.from({ length: AUTH_SETTINGS.ipFreeFailures }, () => ({ method: 'link', ok: false })),
    );
    expect((await refusal(authenticateLink(testDb(), { token, ip: '203.0.113.7' }), AuthError)).code).toBe(
      'rate_limited',
    );
    // The refusal did not use the link up.
    expect((await authenticateLink(testDb(), { token, ip: '203.0.113.8' })).id).toBe(ada.userId);
  });

  it('refuses the sign-in link of a locked account without using it up', async () => {
    const ada = await makeUser(testDb(), 'ada@example.test');
    const token = await createEmailToken(testDb(), { userId: ada.userId, purpose: 'sign-in', minutes: 15 });
    await failAndLock('ada@example.test');
    expect((await refusal(authenticateLink(testDb(), { token, ip: '10.7.0.1' }), AuthError)).code).toBe('locked');
    await sql`update users set lock_expires_at = now() - interval '1 second' where id = ${ada.userId}`.execute(
      testDb(),
    );
    expect((await authenticateLink(testDb(), { token, ip: '10.7.0.1' })).id).toBe(ada.userId);
  });
});

describe('an address without an account', () => {
  it('costs exactly one argon2 verification against a real argon2id hash with the parameters of stored ones', async () => {
    await makeUser(testDb(), 'ada@example.test');
    const stored = await hashPassword('any password at all');
    const parameters = (h: string) => h.split('$').slice(0, 4).join('$');
    expect(await attempt('nobody@example.test', 'guess')).toBe('invalid');
    expect(verified).toHaveLength(1);
    expect(parameters(verified[0])).toBe(parameters(stored));
    expect(parameters(stored)).toMatch(/^\$argon2id\$v=19\$m=\d+,t=\d+,p=\d+$/);
    // And the same as a known address with a wrong password.
    expect(await attempt('ada@example.test', 'guess')).toBe('invalid');
    expect(verified).toHaveLength(2);
    expect(parameters(verified[1])).toBe(parameters(stored));
  });

  it(`looks locked after ${L} failures, as an account would (and is then not evaluated either)`, async () => {
    for (let i = 1; i < L; i++)
      expect(await attempt('nobody@example.test', `guess ${i}`, `10.8.0.${i}`)).toBe('invalid');
    const error = await refusal(
      authenticatePassword(testDb(), { email: 'nobody@example.test', password: 'guess', ip: '10.8.1.1' }),
      AuthError,
    );
    expect(error.code).toBe('locked');
    expect(error.message).toMatch(new RegExp(`^This account is locked after ${L} failed sign-in attempts, until `));
    verified = [];
    expect(await attempt('nobody@example.test', 'guess', '10.8.1.2')).toBe('locked');
    expect(verified).toEqual([]);
    await drainMailQueue();
    expect(await listMail()).toEqual([]);
  });

  it('a disabled account says so only to the right password, after the same work', async () => {
    const ada = await makeUser(testDb(), 'ada@example.test');
    await testDb().updateTable('users').set({ disabled_at: new Date() }).where('id', '=', ada.userId).execute();
    expect(await attempt('ada@example.test', 'guess')).toBe('invalid');
    expect(await attempt('ada@example.test', PASSWORD)).toBe('disabled');
    expect(verified).toHaveLength(2);
  });
});

describe('password re-entry and password change', () => {
  async function signingWorld(): Promise<{ ada: Actor; sheet: { id: string; project_id: string } }> {
    const ada = await makeUser(testDb(), 'ada@example.test');
    const projectId = await makeProject(testDb(), 'LCK', [[ada, 'originator']]);
    const sheet = await makeSheet(testDb(), ada, { id: projectId, code: 'LCK' }, { title: 'Lock test' });
    return { ada, sheet };
  }

  const messages = { noPassword: 'no password', disabledOrLocked: 'disabled' };

  it('15 wrong re-entries when signing, then the right one: refused, the account locked after the fifth', async () => {
    const { ada, sheet } = await signingWorld();
    const outcomes: string[] = [];
    for (let i = 1; i <= 15; i++) {
      const e = await refusal(
        reauthenticateToSign(testDb(), ada, { sheet, meaning: 'prepared', password: `guess ${i}`, messages }),
      );
      outcomes.push(
        e.message.startsWith('This account is locked')
          ? 'locked'
          : e.message === 'The password is not correct; nothing was signed.'
            ? 'wrong'
            : e.message,
      );
    }
    expect(outcomes).toEqual([...Array(L - 1).fill('wrong'), ...Array(15 - (L - 1)).fill('locked')]);
    const right = await refusal(
      reauthenticateToSign(testDb(), ada, { sheet, meaning: 'prepared', password: PASSWORD, messages }),
    );
    expect(right).toMatchObject({ code: 'forbidden', details: { rule: 'password' } });
    expect(right.message).toMatch(
      /^This account is locked after 5 failed sign-in attempts, until .* Nothing was signed\.$/,
    );
    expect(verified).toHaveLength(L);
    // And signing in is refused too: it is one lock.
    expect(await attempt('ada@example.test', PASSWORD)).toBe('locked');
    const lock = await testDb()
      .selectFrom('audit_events')
      .select(['actor_id', 'reason'])
      .where('action', '=', 'user.lock')
      .execute();
    expect(lock).toEqual([
      { actor_id: ada.userId, reason: `${L} failed password attempts in a row (the last while signing a record)` },
    ]);
  });

  it('a right re-entry starts the count again', async () => {
    const { ada, sheet } = await signingWorld();
    for (let i = 1; i < L; i++)
      await refusal(
        reauthenticateToSign(testDb(), ada, { sheet, meaning: 'prepared', password: `guess ${i}`, messages }),
      );
    await reauthenticateToSign(testDb(), ada, { sheet, meaning: 'prepared', password: PASSWORD, messages });
    expect(await userRow(ada.userId)).toMatchObject({ failed_sign_ins: 0, locked_at: null });
  });

  it('a wrong current password of a password change is audited and counts toward the lock', async () => {
    const ada = await makeUser(testDb(), 'ada@example.test');
    for (let i = 1; i < L; i++) {
      expect(
        await refusal(
          changePassword(testDb(), ada, { currentPassword: `guess ${i}`, newPassword: 'a brand new password' }),
        ),
      ).toMatchObject({
        code: 'bad_request',
        message: 'The current password is not right.',
      });
    }
    const locked = await refusal(
      changePassword(testDb(), ada, { currentPassword: 'guess last', newPassword: 'a brand new password' }),
    );
    expect(locked.code).toBe('forbidden');
    expect(
      (await refusal(changePassword(testDb(), ada, { currentPassword: PASSWORD, newPassword: 'a brand new password' })))
        .code,
    ).toBe('forbidden');
    expect(verified).toHaveLength(L);
    const refused = await testDb()
      .selectFrom('audit_events')
      .select(['actor_id', 'object_id', 'new_value'])
      .where('action', '=', 'user.password-change-refused')
      .orderBy('id')
      .execute();
    expect(refused.map((e) => (e.new_value as { outcome: string }).outcome)).toEqual([
      ...Array(L - 1).fill('wrong'),
      'locked',
      'locked',
    ]);
    expect(refused.every((e) => e.actor_id === ada.userId && e.object_id === ada.userId)).toBe(true);
    expect(
      await testDb().selectFrom('audit_events').select('id').where('action', '=', 'user.password-change').execute(),
    ).toEqual([]);
  });
});
