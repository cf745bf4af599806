import { spawnSync } from 'node:child_process';
import { sql } from 'kysely';
import { describe, expect, inject, it } from 'vitest';
import { verifyAuditChain } from '../../lib/audit/verify';
import { createProject, grantRole } from '../../lib/projects/projects';
import { adminPool, testDb } from '../support/database';
import { makeUser } from '../support/people';

function auditCli() {
  const r = spawnSync('npm', ['run', '-s', 'audit', '--', 'verify'], {
    cwd: process.cwd(),
    encoding: 'utf8',
    env: { ...process.env, DATABASE_URL: inject('databaseUrl') },
    timeout: 60_000,
  });
  return { code: r.status, out: `${r.stdout}${r.stderr}` };
}

describe('audit trail', () => {
  it('writes the event in the same transaction as the change: a failed change leaves none', async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    const user = await makeUser(testDb(), 'ada@example.test');
    const project = await createProject(testDb(), admin, {
      code: 'AUD',
      name: 'Audit',
      legalOwner: 'Fixture Ltd',
      revisionScheme: 'letters',
    });
    await grantRole(testDb(), admin, project.id, {
      userId: user.userId,
      role: 'checker',
      reason: 'needed for the review',
    });
    await expect(
      grantRole(testDb(), admin, project.id, { userId: user.userId, role: 'checker', reason: 'again' }),
    ).rejects.toThrow(/holds this role already/);
    await expect(
      createProject(testDb(), admin, {
        code: 'AUD',
        name: 'Twice',
        legalOwner: 'Fixture Ltd',
        revisionScheme: 'letters',
      }),
    ).rejects.toThrow(/exists already/);
    const events = await testDb()
      .selectFrom('audit_events')
      .select(['action', 'reason', 'actor_id'])
      .orderBy('id')
      .execute();
    expect(events).toEqual([
      { action: 'project.create', reason: null, actor_id: admin.userId },
      { action: 'membership.grant', reason: 'needed for the review', actor_id: admin.userId },
    ]);
  });

  it('is intact when untouched, and `npm run -s audit -- verify` says so', async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    for (const code of ['AA', 'BB', 'CC'])
      await createProject(testDb(), admin, { code, name: code, legalOwner: 'Fixture Ltd', revisionScheme: 'numbers' });
    expect(await verifyAuditChain(testDb())).toEqual({ ok: true, events: 3, firstBroken: null });
    const cli = auditCli();
    expect(cli.code).toBe(0);
    expect(cli.out).toContain('audit chain intact: 3 events');
  });

  it('names the first broken event after a raw SQL edit in the middle of the chain', async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    for (const code of ['AA', 'BB', 'CC', 'DD'])
      await createProject(testDb(), admin, { code, name: code, legalOwner: 'Fixture Ltd', revisionScheme: 'numbers' });
    const client = await adminPool().connect();
    try {
      await client.query('begin');
      await client.query('set local session_replication_role = replica');
      await client.query(`update audit_events set new_value = '{"code":"ZZ"}' where id = 2`);
      await client.query('commit');
    } finally {
      client.release();
    }
    expect(await verifyAuditChain(testDb())).toMatchObject({
      ok: false,
      firstBroken: { id: '2', problem: 'its content no longer matches its hash' },
    });
    const cli = auditCli();
    expect(cli.code).toBe(1);
    expect(cli.out).toContain('audit chain broken at event 2');
  });

  it('keeps the hashes of events recorded before the session and token columns existed', async () => {
    // Events without a session or token hash exactly as before the accounts migration.
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    await createProject(testDb(), admin, {
      code: 'OLD',
      name: 'Old',
      legalOwner: 'Fixture Ltd',
      revisionScheme: 'numbers',
    });
    const row = await sql<{ payload: string }>`select audit_event_payload(e) as payload from audit_events e`.execute(
      testDb(),
    );
    expect(row.rows[0].payload).not.toContain('"session"');
    expect(row.rows[0].payload).not.toContain('"token"');
  });
});
