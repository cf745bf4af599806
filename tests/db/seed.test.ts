import { verify } from '@node-rs/argon2';
import { expect, it } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, seedDemo } from '../../db/seed';
import { versionContentSchema } from '../../lib/sheets/content';
import { contentHash } from '../../lib/sheets/content-hash';
import { testDb } from '../support/database';

async function counts() {
  const db = testDb();
  const count = async (table: 'users' | 'projects' | 'project_members' | 'sheets' | 'versions' | 'audit_events') =>
    Number((await db.selectFrom(table).select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow()).n);
  return {
    users: await count('users'),
    projects: await count('projects'),
    members: await count('project_members'),
    sheets: await count('sheets'),
    versions: await count('versions'),
    audit: await count('audit_events'),
  };
}

it('creates the demo world once and changes nothing when run again', async () => {
  const first = await seedDemo(testDb());
  expect(first).toEqual({ usersCreated: 6, projectCreated: true, membershipsCreated: 5, sheetsCreated: 3 });
  const after1 = await counts();
  expect(after1).toMatchObject({ users: 6, projects: 1, members: 5, sheets: 3, versions: 3 });

  const second = await seedDemo(testDb());
  expect(second).toEqual({ usersCreated: 0, projectCreated: false, membershipsCreated: 0, sheetsCreated: 0 });
  expect(await counts()).toEqual(after1);
});

it('gives every demo account the documented password, hashed with argon2id', async () => {
  await seedDemo(testDb());
  const users = await testDb().selectFrom('users').select(['email', 'password_hash', 'is_admin']).execute();
  expect(users.map((u) => u.email).sort()).toEqual(DEMO_ACCOUNTS.map((a) => a.email).sort());
  for (const u of users) {
    expect(u.password_hash).toMatch(/^\$argon2id\$/);
    expect(await verify(u.password_hash!, DEMO_PASSWORD)).toBe(true);
    expect(await verify(u.password_hash!, 'wrong password')).toBe(false);
  }
  expect(users.filter((u) => u.is_admin).map((u) => u.email)).toEqual(['admin@demo.test']);
});

it('stores each seeded version with the SHA-256 of its canonical content', async () => {
  await seedDemo(testDb());
  const versions = await testDb().selectFrom('versions').select(['content', 'content_hash']).execute();
  for (const v of versions) {
    const content = versionContentSchema.parse(v.content);
    expect(contentHash(content)).toBe(v.content_hash);
  }
});
