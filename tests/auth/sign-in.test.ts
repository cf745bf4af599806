// Password sign-in: lockout after repeated failures (21 CFR Part 11 §11.300(d)), rate limits
// (NIST SP 800-63B §5.2.2), disabled accounts; the same answer for unknown addresses.
import { describe, expect, it } from 'vitest';
import { AuthError } from '../../lib/auth/auth-error';
import { AUTH_SETTINGS } from '../../lib/auth/settings';
import { authenticatePassword } from '../../lib/auth/sign-in';
import { testDb } from '../support/database';
import { makeUser, PASSWORD } from '../support/people';

async function attempt(email: string, password: string, ip = '10.0.0.1') {
  try {
    await authenticatePassword(testDb(), { email, password, ip });
    return 'ok';
  } catch (error) {
    return error instanceof AuthError ? error.code : String(error);
  }
}

describe('password sign-in', () => {
  it('signs in with the right password, case-insensitive on the address', async () => {
    await makeUser(testDb(), 'ada@example.test');
    expect(await attempt('ADA@example.test', PASSWORD)).toBe('ok');
  });

  it('answers an unknown address exactly like a wrong password', async () => {
    await makeUser(testDb(), 'ada@example.test');
    expect(await attempt('nobody@example.test', PASSWORD)).toBe('invalid');
    expect(await attempt('ada@example.test', 'wrong password!')).toBe('invalid');
  });

  it(`locks the account after ${AUTH_SETTINGS.lockAfterFailures} failures in a row, audits it, and refuses even the right password`, async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    for (let i = 1; i < AUTH_SETTINGS.lockAfterFailures; i++)
      expect(await attempt('ada@example.test', `wrong ${i}`)).toBe('invalid');
    expect(await attempt('ada@example.test', 'wrong last')).toBe('locked');
    expect(await attempt('ada@example.test', PASSWORD)).toBe('locked');
    const row = await testDb()
      .selectFrom('users')
      .select(['locked_at'])
      .where('id', '=', user.userId)
      .executeTakeFirstOrThrow();
    expect(row.locked_at).not.toBeNull();
    const events = await testDb()
      .selectFrom('audit_events')
      .select(['action', 'object_id'])
      .where('action', '=', 'user.lock')
      .execute();
    expect(events).toEqual([{ action: 'user.lock', object_id: user.userId }]);
  });

  it('resets the failure count after a successful sign-in', async () => {
    await makeUser(testDb(), 'ada@example.test');
    for (let i = 1; i < AUTH_SETTINGS.lockAfterFailures; i++) await attempt('ada@example.test', `wrong ${i}`);
    expect(await attempt('ada@example.test', PASSWORD)).toBe('ok');
    expect(await attempt('ada@example.test', 'wrong again')).toBe('invalid');
  });

  it('answers an address without an account as a locked account after as many failures (it never says which)', async () => {
    for (let i = 1; i < AUTH_SETTINGS.lockAfterFailures; i++)
      expect(await attempt('ghost@example.test', 'x', `10.0.1.${i}`)).toBe('invalid');
    expect(await attempt('ghost@example.test', 'x', '10.0.2.1')).toBe('locked');
  });

  it('slows down a client address after its failures (the limit lives in tests/auth/lockout.test.ts)', async () => {
    for (let i = 0; i < AUTH_SETTINGS.ipFreeFailures; i++)
      expect(await attempt(`p${i}@example.test`, 'x', '10.9.9.9')).toBe('invalid');
    expect(await attempt('another@example.test', 'x', '10.9.9.9')).toBe('rate_limited');
  });

  it('refuses a disabled account', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    await testDb().updateTable('users').set({ disabled_at: new Date() }).where('id', '=', user.userId).execute();
    expect(await attempt('ada@example.test', PASSWORD)).toBe('disabled');
  });
});
