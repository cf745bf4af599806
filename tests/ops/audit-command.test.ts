// `npm run -s audit -- verify` whether or not the app runs. As a process, on DATABASE_URL (the test
// database): one line on standard output, exit 0 when the chain is intact, 1 naming the first event a
// superuser edited behind the triggers' back, 2 for a wrong use. Then the command itself on a local
// cluster of its own with nothing running (the app stopped): it starts the cluster for the walk and
// leaves its stopping to the command's supervisor; on a cluster that already runs (the app started)
// it uses that one and stops nothing.
import { spawnSync } from 'node:child_process';
import { rmSync } from 'node:fs';
import { createServer } from 'node:net';
import pg from 'pg';
import { afterAll, describe, expect, inject, it } from 'vitest';
import { createDb } from '../../db/index';
import { LocalCluster, portIsFree } from '../../db/local-postgres';
import { migrateToLatest } from '../../db/migrate';
import { auditCommand } from '../../lib/ops/audit-command';
import { adminPool, testDb } from '../support/database';
import { makeUser } from '../support/people';

function audit(args: string[], env: Record<string, string> = {}) {
  const r = spawnSync('npm', ['run', '-s', 'audit', '--', ...args], {
    cwd: process.cwd(),
    encoding: 'utf8',
    timeout: 120_000,
    env: { ...process.env, ...env },
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** Three audit events after whatever is there; how many there are then, and the id of the second. */
async function threeEvents(db = testDb()): Promise<{ total: number; second: string }> {
  const { userId } = await makeUser(db, `audited-${Math.random().toString(36).slice(2, 8)}@example.test`);
  for (const reason of ['one', 'two', 'three'])
    await db
      .insertInto('audit_events')
      .values({ actor_id: userId, action: 'test.event', object_type: 'test', reason })
      .execute();
  const total = await db.selectFrom('audit_events').select(db.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
  const second = await db.selectFrom('audit_events').select('id').where('reason', '=', 'two').executeTakeFirstOrThrow();
  return { total: Number(total.n), second: second.id };
}

/** Edits an event with the triggers switched off, as only a superuser can (tests/db/audit-tamper.test.ts). */
async function tamper(query: (text: string) => Promise<unknown>): Promise<void> {
  await query('begin');
  await query('set local session_replication_role = replica');
  await query("update audit_events set reason = 'changed afterwards' where reason = 'two'");
  await query('commit');
}

describe('npm run -s audit -- verify, as a process', () => {
  it('prints that the chain is intact and exits 0; names the edited event and exits 1; usage exits 2', async () => {
    const { total, second } = await threeEvents();
    const env = { DATABASE_URL: inject('databaseUrl') };
    const intact = audit(['verify'], env);
    expect(intact.stdout).toBe(`audit chain intact: ${total} events\n`);
    expect(intact.code).toBe(0);

    const client = await adminPool().connect();
    try {
      await tamper((text) => client.query(text));
    } finally {
      client.release();
    }
    const broken = audit(['verify'], env);
    expect(broken.stdout).toMatch(
      new RegExp(
        `^audit chain broken at event ${second}: its content no longer matches its hash \\(\\d+ events read\\)\\n$`,
      ),
    );
    expect(broken.code).toBe(1);

    const usage = audit([], env);
    expect(usage.stderr).toContain('usage: npm run -s audit -- verify');
    expect(usage.stdout).toBe('');
    expect(usage.code).toBe(2);
  });
});

/** A free TCP port on 127.0.0.1, from the system. */
function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const port = (server.address() as { port: number }).port;
      server.close(() => resolve(port));
    });
  });
}

describe('the audit command on a local cluster', () => {
  const name = `${process.env.WORLDSHEET_TEST_CLUSTER ?? 'test'}-audit`;
  let ours: LocalCluster | null = null;

  afterAll(async () => {
    await ours?.stop();
    if (ours) rmSync(ours.clusterFolder, { recursive: true, force: true });
  });

  it('starts a stopped cluster for the walk and leaves it to be stopped; uses a running one and stops nothing', async () => {
    const port = await freePort();
    const quiet = () => undefined;
    ours = new LocalCluster({ name, port, projectRoot: process.cwd(), log: quiet });
    ours.prepare();
    // A fresh installation with three audit events, then stopped: the app is not running.
    rmSync(ours.clusterFolder, { recursive: true, force: true });
    ours.prepare();
    await ours.start();
    await ours.ensureDatabase('worldsheet');
    const setup = createDb(ours.appUrl('worldsheet'), { max: 1 });
    let events: { total: number; second: string };
    try {
      await migrateToLatest(setup);
      events = await threeEvents(setup);
    } finally {
      await setup.destroy();
    }
    await ours.stop();
    expect(await portIsFree(port)).toBe(true);

    const stops: Array<() => Promise<void>> = [];
    const stoppers = { add: (_name: string, stop: () => Promise<void>) => void stops.push(stop) };
    let out = '';
    let err = '';
    const io = { out: (t: string) => void (out += t), err: (t: string) => void (err += t) };
    const code = await auditCommand(stoppers, ['verify'], {
      cluster: new LocalCluster({ name, port, projectRoot: process.cwd(), log: quiet }),
      ...io,
    });
    expect({ code, out, err }).toEqual({ code: 0, out: `audit chain intact: ${events.total} events\n`, err: '' });
    // It started the cluster and registered its stop; the supervisor runs it when the command ends.
    expect(await portIsFree(port)).toBe(false);
    expect(stops).toHaveLength(1);
    await stops[0]();
    expect(await portIsFree(port)).toBe(true);

    // The app's cluster running (npm start): the command walks the chain on it and stops nothing.
    await ours.start();
    out = '';
    err = '';
    stops.length = 0;
    const running = await auditCommand(stoppers, ['verify'], {
      cluster: new LocalCluster({ name, port, projectRoot: process.cwd(), log: quiet }),
      ...io,
    });
    expect(running).toBe(0);
    expect(out).toBe(`audit chain intact: ${events.total} events\n`);
    expect(err).toBe(`[worldsheet] using the ${name} cluster that is already running\n`);
    for (const stop of stops) await stop();
    expect(await portIsFree(port)).toBe(false);

    // Tampered with behind the triggers' back: exit 1, naming the event.
    const admin = new pg.Client({ connectionString: ours.adminUrl('worldsheet') });
    await admin.connect();
    try {
      await tamper((text) => admin.query(text));
    } finally {
      await admin.end();
    }
    out = '';
    const broken = await auditCommand(stoppers, ['verify'], {
      cluster: new LocalCluster({ name, port, projectRoot: process.cwd(), log: quiet }),
      ...io,
    });
    expect(broken).toBe(1);
    expect(out).toMatch(
      new RegExp(
        `^audit chain broken at event ${events.second}: its content no longer matches its hash \\(\\d+ events read\\)\\n$`,
      ),
    );
  });
});
