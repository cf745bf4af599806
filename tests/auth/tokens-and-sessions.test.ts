import { sql } from 'kysely';
import { describe, expect, it } from 'vitest';
import { changePassword, confirmPasswordReset, passwordChangeSchema } from '../../lib/auth/account';
import type { Actor } from '../../lib/auth/actor';
import {
  API_TOKEN_SETTINGS,
  apiTokenInputSchema,
  createApiToken,
  listApiTokens,
  resolveApiToken,
  revokeApiToken,
} from '../../lib/auth/api-tokens';
import { consumeEmailToken, createEmailToken } from '../../lib/auth/email-tokens';
import { resumeSession, signOutSession, startSession } from '../../lib/auth/sessions';
import { AUTH_SETTINGS } from '../../lib/auth/settings';
import { authenticateLink, authenticatePassword } from '../../lib/auth/sign-in';
import { changeUser } from '../../lib/projects/users';
import { testDb } from '../support/database';
import { makeUser, PASSWORD } from '../support/people';

const newSession = (userId: string) =>
  startSession(testDb(), { userId, method: 'password', ip: null, userAgent: null });

async function endedReasons(userId: string): Promise<Record<string, string | null>> {
  const rows = await testDb()
    .selectFrom('sessions')
    .select(['id', 'ended_reason'])
    .where('user_id', '=', userId)
    .execute();
  return Object.fromEntries(rows.map((r) => [r.id, r.ended_reason]));
}

async function auditOf(action: string) {
  return testDb()
    .selectFrom('audit_events')
    .select(['actor_id', 'session_id', 'object_id', 'new_value'])
    .where('action', '=', action)
    .orderBy('id')
    .execute();
}

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
    await expect(confirmPasswordReset(testDb(), { token, newPassword: 'a brand new password' })).rejects.toThrow(
      /expired or was already used/,
    );
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
    const sessionId = await startSession(testDb(), {
      userId: user.userId,
      method: 'password',
      ip: null,
      userAgent: null,
    });
    const token = await createEmailToken(testDb(), { userId: user.userId, purpose: 'password-reset', minutes: 30 });
    await confirmPasswordReset(testDb(), { token, newPassword: 'a brand new password' });
    expect(await resumeSession(testDb(), sessionId)).toBeNull();
    expect(
      (
        await authenticatePassword(testDb(), {
          email: 'ada@example.test',
          password: 'a brand new password',
          ip: '10.0.0.1',
        })
      ).id,
    ).toBe(user.userId);
  });
});

describe('sessions', () => {
  it(`end after ${AUTH_SETTINGS.sessionIdleMinutes} minutes without a request`, async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const sessionId = await startSession(testDb(), {
      userId: user.userId,
      method: 'password',
      ip: null,
      userAgent: null,
    });
    expect((await resumeSession(testDb(), sessionId))?.userId).toBe(user.userId);
    await sql`update sessions set last_seen_at = now() - make_interval(mins => ${AUTH_SETTINGS.sessionIdleMinutes + 1})`.execute(
      testDb(),
    );
    expect(await resumeSession(testDb(), sessionId)).toBeNull();
    const row = await testDb().selectFrom('sessions').select(['ended_reason']).executeTakeFirstOrThrow();
    expect(row.ended_reason).toBe('inactivity');
  });

  it('end when the user is disabled, and the user keeps their record', async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    const user = await makeUser(testDb(), 'ada@example.test');
    const sessionId = await startSession(testDb(), {
      userId: user.userId,
      method: 'password',
      ip: null,
      userAgent: null,
    });
    await changeUser(testDb(), admin, user.userId, { action: 'disable', reason: 'left the company' });
    expect(await resumeSession(testDb(), sessionId)).toBeNull();
    expect(await testDb().selectFrom('users').select('email').where('id', '=', user.userId).executeTakeFirst()).toEqual(
      { email: 'ada@example.test' },
    );
  });
});

describe('API tokens', () => {
  it('are shown once, stored hashed, act as their owner, and stop when revoked', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const { id, token, prefix } = await createApiToken(testDb(), user, 'export script');
    expect(token).toMatch(/^wst_[A-Za-z0-9_-]{43}$/);
    expect(prefix).toBe(token.slice(0, 12));
    const stored = await testDb()
      .selectFrom('api_tokens')
      .select(['token_hash'])
      .where('id', '=', id)
      .executeTakeFirstOrThrow();
    expect(stored.token_hash).not.toContain(token.slice(4));
    const actor = await resolveApiToken(testDb(), token);
    expect(actor).toMatchObject({ userId: user.userId, via: 'token', tokenId: id });
    await revokeApiToken(testDb(), user, id);
    expect(await resolveApiToken(testDb(), token)).toBeNull();
    expect(await resolveApiToken(testDb(), 'wst_not-a-token')).toBeNull();
    const actions = (await testDb().selectFrom('audit_events').select('action').orderBy('id').execute()).map(
      (e) => e.action,
    );
    expect(actions).toEqual(['token.create', 'token.revoke']);
  });
});

describe('a password change', () => {
  it("ends the person's other sessions, keeps the one that changed it, and keeps the tokens unless asked", async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const other = await makeUser(testDb(), 'bob@example.test');
    const current = await newSession(user.userId);
    const elsewhere = await newSession(user.userId);
    const bobs = await newSession(other.userId);
    const { token } = await createApiToken(testDb(), user, 'export script');
    const actor: Actor = { ...user, sessionId: current };

    expect(
      await changePassword(testDb(), actor, { currentPassword: PASSWORD, newPassword: 'a brand new password' }),
    ).toEqual({ endedSessions: 1, revokedTokens: 0 });
    expect((await resumeSession(testDb(), current))?.userId).toBe(user.userId);
    expect(await resumeSession(testDb(), elsewhere)).toBeNull();
    expect((await resumeSession(testDb(), bobs))?.userId).toBe(other.userId);
    expect(await endedReasons(user.userId)).toEqual({ [current]: null, [elsewhere]: 'password changed' });
    expect((await resolveApiToken(testDb(), token))?.userId).toBe(user.userId);
    const [event] = await auditOf('user.password-change');
    expect(event).toMatchObject({
      actor_id: user.userId,
      session_id: current,
      new_value: { endedSessions: 1, revokedTokens: 0, tokensRevokeAsked: false },
    });
  });

  it('revokes every API token of the person when asked', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const other = await makeUser(testDb(), 'bob@example.test');
    const current = await newSession(user.userId);
    const one = await createApiToken(testDb(), user, 'one');
    const two = await createApiToken(testDb(), user, 'two', { scope: 'read' });
    const bobs = await createApiToken(testDb(), other, 'bob');

    const result = await changePassword(
      testDb(),
      { ...user, sessionId: current },
      { currentPassword: PASSWORD, newPassword: 'a brand new password', revokeTokens: true },
    );
    expect(result).toEqual({ endedSessions: 0, revokedTokens: 2 });
    expect(await resolveApiToken(testDb(), one.token)).toBeNull();
    expect(await resolveApiToken(testDb(), two.token)).toBeNull();
    expect((await resolveApiToken(testDb(), bobs.token))?.userId).toBe(other.userId);
    expect((await listApiTokens(testDb(), user.userId)).every((t) => t.revoked_at !== null)).toBe(true);
    expect((await auditOf('user.password-change'))[0].new_value).toEqual({
      endedSessions: 0,
      revokedTokens: 2,
      tokensRevokeAsked: true,
    });
  });

  it('takes revokeTokens in its body, false unless given', () => {
    const body = { currentPassword: 'x', newPassword: 'a brand new password' };
    expect(passwordChangeSchema.parse(body).revokeTokens).toBe(false);
    expect(passwordChangeSchema.parse({ ...body, revokeTokens: true }).revokeTokens).toBe(true);
    expect(passwordChangeSchema.safeParse({ ...body, revokeTokens: 'yes' }).success).toBe(false);
  });
});

describe('a password reset', () => {
  it('ends every session and revokes every API token, audited with how many', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const a = await newSession(user.userId);
    const b = await newSession(user.userId);
    const { token } = await createApiToken(testDb(), user, 'export script');
    const link = await createEmailToken(testDb(), { userId: user.userId, purpose: 'password-reset', minutes: 30 });
    await confirmPasswordReset(testDb(), { token: link, newPassword: 'a brand new password' });
    expect(await resolveApiToken(testDb(), token)).toBeNull();
    expect(await endedReasons(user.userId)).toEqual({ [a]: 'password reset', [b]: 'password reset' });
    const [event] = await auditOf('user.password-reset');
    expect(event).toMatchObject({ object_id: user.userId, new_value: { endedSessions: 2, revokedTokens: 1 } });
  });
});

describe('a locked account', () => {
  it('has its sessions refused and ended while a timed lock lasts, and not after it ran out', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const first = await newSession(user.userId);
    await testDb()
      .updateTable('users')
      .set({ locked_at: sql`now()`, lock_expires_at: sql`now() + interval '15 minutes'` })
      .where('id', '=', user.userId)
      .execute();
    expect(await resumeSession(testDb(), first)).toBeNull();
    expect((await endedReasons(user.userId))[first]).toBe('user locked');
    // The lock has run out: a new session works (the ended one stays ended).
    await testDb()
      .updateTable('users')
      .set({ lock_expires_at: sql`now() - interval '1 second'` })
      .where('id', '=', user.userId)
      .execute();
    const second = await newSession(user.userId);
    expect((await resumeSession(testDb(), second))?.userId).toBe(user.userId);
    expect(await resumeSession(testDb(), first)).toBeNull();
  });

  it('by an administrator ends the sessions at once, and suspends the tokens until unlocked (revoked ones stay revoked)', async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    const user = await makeUser(testDb(), 'ada@example.test');
    const session = await newSession(user.userId);
    const kept = await createApiToken(testDb(), user, 'kept');
    const revoked = await createApiToken(testDb(), user, 'revoked');
    await changeUser(testDb(), admin, user.userId, { action: 'lock', reason: 'lost laptop' });
    // Ended in the lock's transaction, before any request of the session comes.
    expect(await endedReasons(user.userId)).toEqual({ [session]: 'user locked' });
    expect(await resolveApiToken(testDb(), kept.token)).toBeNull();
    await revokeApiToken(testDb(), user, revoked.id);
    await changeUser(testDb(), admin, user.userId, { action: 'unlock', reason: 'laptop found' });
    expect((await resolveApiToken(testDb(), kept.token))?.tokenId).toBe(kept.id);
    expect(await resolveApiToken(testDb(), revoked.token)).toBeNull();
    expect(await resumeSession(testDb(), session)).toBeNull();
  });

  it('by failed passwords (a timed lock) suspends the tokens while it lasts', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const { token } = await createApiToken(testDb(), user, 'export script');
    await testDb()
      .updateTable('users')
      .set({ locked_at: sql`now()`, lock_expires_at: sql`now() + interval '15 minutes'` })
      .where('id', '=', user.userId)
      .execute();
    expect(await resolveApiToken(testDb(), token)).toBeNull();
    await testDb()
      .updateTable('users')
      .set({ lock_expires_at: sql`now() - interval '1 second'` })
      .where('id', '=', user.userId)
      .execute();
    expect((await resolveApiToken(testDb(), token))?.userId).toBe(user.userId);
  });

  it('disabled: its tokens are refused', async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    const user = await makeUser(testDb(), 'ada@example.test');
    const { token } = await createApiToken(testDb(), user, 'export script');
    await changeUser(testDb(), admin, user.userId, { action: 'disable', reason: 'left the company' });
    expect(await resolveApiToken(testDb(), token)).toBeNull();
  });
});

describe('API token expiry and scope', () => {
  async function lifetimeDays(id: string): Promise<number> {
    const row = await testDb()
      .selectFrom('api_tokens')
      .select(sql<number>`extract(epoch from expires_at - created_at) / 86400`.as('days'))
      .where('id', '=', id)
      .executeTakeFirstOrThrow();
    return Math.round(Number(row.days) * 1000) / 1000;
  }

  it(`expire after ${API_TOKEN_SETTINGS.defaultDays} days unless chosen, at most ${API_TOKEN_SETTINGS.maxDays}, and the expiry is returned and listed`, async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const usual = await createApiToken(testDb(), user, 'usual');
    const short = await createApiToken(testDb(), user, 'short', { expiresInDays: 7 });
    expect(await lifetimeDays(usual.id)).toBe(API_TOKEN_SETTINGS.defaultDays);
    expect(await lifetimeDays(short.id)).toBe(7);
    expect(usual.expires_at).toBeInstanceOf(Date);
    const listed = await listApiTokens(testDb(), user.userId);
    expect(listed.find((t) => t.id === short.id)).toMatchObject({
      scope: 'read-write',
      expired: false,
      expires_at: short.expires_at,
    });
    await expect(
      createApiToken(testDb(), user, 'too long', { expiresInDays: API_TOKEN_SETTINGS.maxDays + 1 }),
    ).rejects.toThrow(/at most|from 1 to/);
    await expect(createApiToken(testDb(), user, 'none', { expiresInDays: 0 })).rejects.toThrow(/from 1 to/);
    expect(apiTokenInputSchema.parse({ name: 'x' })).toEqual({
      name: 'x',
      scope: 'read-write',
      expiresInDays: API_TOKEN_SETTINGS.defaultDays,
    });
    expect(apiTokenInputSchema.safeParse({ name: 'x', expiresInDays: API_TOKEN_SETTINGS.maxDays + 1 }).success).toBe(
      false,
    );
    expect(apiTokenInputSchema.safeParse({ name: 'x', expiresInDays: 1.5 }).success).toBe(false);
    expect(apiTokenInputSchema.safeParse({ name: 'x', scope: 'admin' }).success).toBe(false);
    const [created] = await auditOf('token.create');
    expect(created.new_value).toMatchObject({
      name: 'usual',
      scope: 'read-write',
      expiresAt: usual.expires_at.toISOString(),
    });
  });

  it('are refused once expired, and listed as expired', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const { id, token } = await createApiToken(testDb(), user, 'old');
    expect((await resolveApiToken(testDb(), token))?.tokenId).toBe(id);
    await testDb()
      .updateTable('api_tokens')
      .set({ expires_at: sql`now() - interval '1 second'` })
      .where('id', '=', id)
      .execute();
    expect(await resolveApiToken(testDb(), token)).toBeNull();
    expect((await listApiTokens(testDb(), user.userId))[0]).toMatchObject({ id, expired: true, revoked_at: null });
  });

  it('carry their scope into the actor: read only, or read and write', async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const read = await createApiToken(testDb(), user, 'reader', { scope: 'read' });
    const write = await createApiToken(testDb(), user, 'writer', { scope: 'read-write' });
    expect(read.scope).toBe('read');
    expect(await resolveApiToken(testDb(), read.token)).toMatchObject({ tokenId: read.id, tokenScope: 'read' });
    expect(await resolveApiToken(testDb(), write.token)).toMatchObject({ tokenId: write.id, tokenScope: 'read-write' });
    const stored = await testDb().selectFrom('api_tokens').select(['id', 'scope']).orderBy('name').execute();
    expect(stored).toEqual([
      { id: read.id, scope: 'read' },
      { id: write.id, scope: 'read-write' },
    ]);
  });
});

describe('sign-out', () => {
  it("ends the session and is audited once (auth.sign-out), through next-auth's signOut event", async () => {
    const user = await makeUser(testDb(), 'ada@example.test');
    const sid = await newSession(user.userId);
    const { authOptions } = await import('../../lib/auth/auth-options');
    await authOptions.events!.signOut!({ token: { sid }, session: null } as never);
    expect(await resumeSession(testDb(), sid)).toBeNull();
    expect(await endedReasons(user.userId)).toEqual({ [sid]: 'signed out' });
    // A second sign-out of the same (ended) session records nothing more.
    await signOutSession(testDb(), sid);
    expect(await auditOf('auth.sign-out')).toEqual([
      { actor_id: user.userId, session_id: sid, object_id: sid, new_value: null },
    ]);
  });
});
