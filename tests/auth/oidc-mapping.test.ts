import { describe, expect, it } from 'vitest';
import { parseRoleMap, signInWithOidc } from '../../lib/auth/oidc';
import { testDb } from '../support/database';
import { makeProject } from '../support/people';

describe('single sign-on role mapping', () => {
  it('reads the group map and refuses what it cannot read', () => {
    expect(parseRoleMap('authors=TPT2:originator; checkers=TPT2:checker')).toEqual([
      { group: 'authors', projectCode: 'TPT2', role: 'originator' },
      { group: 'checkers', projectCode: 'TPT2', role: 'checker' },
    ]);
    expect(() => parseRoleMap('authors=TPT2:boss')).toThrow(/cannot read/);
  });

  it('creates the user on first sign-in and gives exactly the mapped roles of their groups', async () => {
    const projectId = await makeProject(testDb(), 'TPT2');
    const mapping = parseRoleMap('authors=TPT2:originator;checkers=TPT2:checker');
    const first = await signInWithOidc(
      testDb(),
      { profile: { sub: 'u1', email: 'Sam@Org.test', name: 'Sam Org', groups: ['authors', 'other'] }, account: null },
      mapping,
    );
    expect(first?.email).toBe('sam@org.test');
    const roles = async () =>
      (await testDb().selectFrom('project_members').select('role').where('project_id', '=', projectId).execute())
        .map((r) => r.role)
        .sort();
    expect(await roles()).toEqual(['originator']);
    await signInWithOidc(
      testDb(),
      { profile: { sub: 'u1', email: 'sam@org.test', name: 'Sam Org', groups: ['checkers'] }, account: null },
      mapping,
    );
    expect(await roles()).toEqual(['checker']);
    const actions = (await testDb().selectFrom('audit_events').select('action').orderBy('id').execute()).map(
      (e) => e.action,
    );
    expect(actions).toEqual([
      'user.create',
      'auth.sign-in',
      'membership.grant',
      'auth.sign-in',
      'membership.revoke',
      'membership.grant',
    ]);
  });

  it('refuses an unverified address and a disabled account', async () => {
    expect(
      await signInWithOidc(
        testDb(),
        { profile: { sub: 'u2', email: 'x@org.test', email_verified: false }, account: null },
        [],
      ),
    ).toBeNull();
    await testDb()
      .insertInto('users')
      .values({ email: 'off@org.test', display_name: 'Off', password_hash: null, disabled_at: new Date() })
      .execute();
    expect(
      await signInWithOidc(testDb(), { profile: { sub: 'u3', email: 'off@org.test' }, account: null }, []),
    ).toBeNull();
  });

  it('refuses a locked account while the lock holds, and not after a timed lock ran out', async () => {
    const hour = 3600_000;
    await testDb()
      .insertInto('users')
      .values({
        email: 'held@org.test',
        display_name: 'Held',
        password_hash: null,
        locked_at: new Date(),
        lock_expires_at: new Date(Date.now() + hour),
      })
      .execute();
    await testDb()
      .insertInto('users')
      .values({
        email: 'admin-held@org.test',
        display_name: 'Admin held',
        password_hash: null,
        locked_at: new Date(),
        lock_expires_at: null,
      })
      .execute();
    await testDb()
      .insertInto('users')
      .values({
        email: 'was-held@org.test',
        display_name: 'Was held',
        password_hash: null,
        locked_at: new Date(Date.now() - 2 * hour),
        lock_expires_at: new Date(Date.now() - hour),
      })
      .execute();
    expect(
      await signInWithOidc(testDb(), { profile: { sub: 'u4', email: 'held@org.test' }, account: null }, []),
    ).toBeNull();
    expect(
      await signInWithOidc(testDb(), { profile: { sub: 'u5', email: 'admin-held@org.test' }, account: null }, []),
    ).toBeNull();
    expect(
      (await signInWithOidc(testDb(), { profile: { sub: 'u6', email: 'was-held@org.test' }, account: null }, []))
        ?.email,
    ).toBe('was-held@org.test');
  });
});
