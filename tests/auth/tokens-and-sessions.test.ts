import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import { confirmPasswordReset } from '../../lib/auth/account';
import { createApiToken, resolveApiToken, revokeApiToken } from '../../lib/auth/api-tokens';
import { consumeEmailToken, createEmailToken } from '../../lib/auth/email-tokens';
import { resumeSession, startSession } from '../../lib/auth/sessions';
import { AUTH_SETTINGS } from '../../lib/auth/settings';
import { authenticateLink, authenticatePassword } from '../../lib/auth/sign-in';
import { changeUser } from '../../lib/projects/users';
import { testDb } from '../support/database';
import { makeUser } from '../support/people';

describe('e-mailed tokens', () => {
  it('work once', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const token = await createEmailToken(testDb(), { userId: user.userId, purpose: 'sign-in', minutes: 15 });
    expect((await authenticateLink(testDb(), { token, ip: '10.0.0.1' })).id).toBe(user.userId);
    await expect(authenticateLink(testDb(), { token, ip: '10.0.0.1' })).rejects.toThrow(/expired or was already used/);
  });

  it('stop working when they expire', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const token = await createEmailToken(testDb(), { userId: user.userId, purpose: 'password-reset', minutes: 30 });
    await sql`update email_tokens set expires_at = now() - interval '1 second'`.execute(testDb());
    await expect(confirmPasswordReset(testDb(), { token, newPassword: 'a brand new password' })).rejects.toThrow(/expired or was already used/);
  });

  it('serve only their purpose, and are stored only as a hash', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const token = await createEmailToken(testDb(), { userId: user.userId, purpose: 'password-reset', minutes: 30 });
    expect(await consumeEmailToken(testDb(), { token, purpose: 'sign-in' })).toBeNull();
    const stored = await testDb().selectFrom('email_tokens').select('token_hash').executeTakeFirstOrThrow();
    expect(stored.token_hash).not.toContain(token);
    expect(stored.token_hash).toMatch(/^[0-9a-f]{64}$/);
  });

  it('reset the password, end every session, and the new password works', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const sessionId = await startSession(testDb(), { userId: user.userId, method: 'password', ip: null, userAgent: null });
    const token = await createEmailToken(testDb(), { userId: user.userId, purpose: 'password-reset', minutes: 30 });
    await confirmPasswordReset(testDb(), { token, newPassword: 'a brand new password' });
    expect(await resumeSession(testDb(), sessionId)).toBeNull();
    expect((await authenticatePassword(testDb(), { email: 'ada@example.test', password: 'a brand new password', ip: '10.0.0.1' })).id).toBe(user.userId);
  });
});

describe('sessions', () => {
  it(`end after ${AUTH_SETTINGS.sessionIdleMinutes} minutes without a request`, async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const sessionId = await startSession(testDb(), { userId: user.userId, method: 'password', ip: null, userAgent: null });
    expect((await resumeSession(testDb(), sessionId))?.userId).toBe(user.userId);
    await sql`update sessions set last_seen_at = now() - make_interval(mins => ${AUTH_SETTINGS.sessionIdleMinutes + 1})`.execute(testDb());
    expect(await resumeSession(testDb(), sessionId)).toBeNull();
    const row = await testDb().selectFrom('sessions').select(['ended_reason']).executeTakeFirstOrThrow();
    expect(row.ended_reason).toBe('inactivity');
  });

  it('end when the user is disabled, and the user keeps their record', async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    const user = await makeUser(testDb(), 'ada@example.test');
    const sessionId = await startSession(testDb(), { userId: user.userId, method: 'password', ip: null, userAgent: null });
    await changeUser(testDb(), admin, user.userId, { action: 'disable', reason: 'left the company' });
    expect(await resumeSession(testDb(), sessionId)).toBeNull();
    expect(await testDb().selectFrom('users').select('email').where('id', '=', user.userId).executeTakeFirst()).toEqual({ email: 'ada@example.test' });
  });
});

describe('API tokens', () => {
  it('are shown once, stored hashed, act as their owner, and stop when revoked', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const { id, token, prefix } = await createApiToken(testDb(), user, 'export script');
    expect(token).toMatch(/^wst_[A-Za-z0-9_-]{43}$/);
    expect(prefix).toBe(token.slice(0, 12));
    const stored = await testDb().selectFrom('api_tokens').select(['token_hash']).where('id', '=', id).executeTakeFirstOrThrow();
    expect(stored.token_hash).not.toContain(token.slice(4));
    const actor = await resolveApiToken(testDb(), token);
    expect(actor).toMatchObject({ userId: user.userId, via: 'token', tokenId: id });
    await revokeApiToken(testDb(), user, id);
    expect(await resolveApiToken(testDb(), token)).toBeNull();
    expect(await resolveApiToken(testDb(), 'wst_not-a-token')).toBeNull();
    const actions = (await testDb().selectFrom('audit_events').select('action').orderBy('id').execute()).map((e) => e.action);
    expect(actions).toEqual(['token.create', 'token.revoke']);
  });
});
