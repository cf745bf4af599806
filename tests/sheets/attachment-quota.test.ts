// The storage quota of a project's attachments (WORLDSHEET_PROJECT_STORAGE_QUOTA_MB), against the
// real database and the test object store: a clear 413, each distinct content counted once per
// project, and concurrent uploads checked one after the other under the project's row lock.
import { sql } from 'kysely';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { uploadAttachment } from '../../lib/attachments/attachments';
import {
  DEFAULT_PROJECT_STORAGE_QUOTA_MB,
  formatQuotaSize,
  projectStorageQuotaBytes,
  projectStorageUsed,
} from '../../lib/attachments/quota';
import { AppError } from '../../lib/errors/app-error';
import { createSheet } from '../../lib/sheets/sheets';
import { storageConfig } from '../../lib/storage/config';
import { createObjectStore } from '../../lib/storage/object-store';
import { testDb } from '../support/database';
import { makeProject, makeUser } from '../support/people';
import { refusal } from '../support/refusal';
import { until } from '../support/until';

const store = () => createObjectStore(storageConfig());
/** A well-formed PDF header padded to exactly `size` bytes; `tag` makes its content (and SHA-256) distinct. */
function pdf(size: number, tag: string): Uint8Array {
  const head = `%PDF-1.7\n% ${tag}\n`;
  return new TextEncoder().encode(head + 'x'.repeat(size - head.length));
}
/** The environment value for a quota of `bytes` (MiB; a power of two, so exact). */
const quotaOf = (bytes: number) => String(bytes / (1024 * 1024));

const saved = process.env.WORLDSHEET_PROJECT_STORAGE_QUOTA_MB;
beforeEach(() => {
  process.env.WORLDSHEET_PROJECT_STORAGE_QUOTA_MB = quotaOf(1000);
});
afterEach(() => {
  if (saved === undefined) delete process.env.WORLDSHEET_PROJECT_STORAGE_QUOTA_MB;
  else process.env.WORLDSHEET_PROJECT_STORAGE_QUOTA_MB = saved;
});

async function world() {
  const db = testDb();
  const author = await makeUser(db, 'author@example.test');
  const projectId = await makeProject(db, 'BEAM', [[author, 'originator']]);
  const otherId = await makeProject(db, 'OTHR', [[author, 'originator']]);
  const sheetOf = async (id: string, code: string, title: string) => ({
    id: (await createSheet(db, author, { id, code }, { title, safetyRelated: false, objective: '' })).id,
    project_id: id,
  });
  return {
    db,
    author,
    a: await sheetOf(projectId, 'BEAM', 'Scan A'),
    b: await sheetOf(projectId, 'BEAM', 'Scan B'),
    other: await sheetOf(otherId, 'OTHR', 'Elsewhere'),
  };
}

describe('the setting', () => {
  it('defaults to 2048 MiB and takes MiB, fractions included; anything else is a configuration error', () => {
    expect(DEFAULT_PROJECT_STORAGE_QUOTA_MB).toBe(2048);
    expect(projectStorageQuotaBytes({})).toBe(2048 * 1024 * 1024);
    expect(projectStorageQuotaBytes({ WORLDSHEET_PROJECT_STORAGE_QUOTA_MB: '0.5' })).toBe(512 * 1024);
    expect(projectStorageQuotaBytes({ WORLDSHEET_PROJECT_STORAGE_QUOTA_MB: '0' })).toBe(0);
    expect(() => projectStorageQuotaBytes({ WORLDSHEET_PROJECT_STORAGE_QUOTA_MB: 'lots' })).toThrow(
      /must be a number of MiB/,
    );
    expect(() => projectStorageQuotaBytes({ WORLDSHEET_PROJECT_STORAGE_QUOTA_MB: '-1' })).toThrow(
      /must be a number of MiB/,
    );
    expect([
      formatQuotaSize(1),
      formatQuotaSize(900),
      formatQuotaSize(2048 * 1024 * 1024),
      formatQuotaSize(1.5 * 1024 * 1024),
    ]).toEqual(['1 byte', '900 bytes', '2048 MiB', '1.5 MiB']);
  });
});

describe('uploads against the quota', { timeout: 90_000 }, () => {
  it('refuses with 413 an upload that would go over, saying the quota, what is used and who can raise it; nothing is recorded', async () => {
    const { db, author, a } = await world();
    await uploadAttachment(db, store(), author, a, {
      name: 'first.pdf',
      type: 'application/pdf',
      bytes: pdf(600, 'first'),
    });
    const e = await refusal(
      uploadAttachment(db, store(), author, a, {
        name: 'second.pdf',
        type: 'application/pdf',
        bytes: pdf(600, 'second'),
      }),
    );
    expect(e.status).toBe(413);
    expect(e.message).toBe(
      "This project's attachments may take at most 1000 bytes; 600 bytes are used and this file needs 600 bytes more. " +
        'The administrator of this Worldsheet installation can raise the quota (the setting WORLDSHEET_PROJECT_STORAGE_QUOTA_MB).',
    );
    expect(e.details).toEqual({ quotaBytes: 1000, usedBytes: 600, fileBytes: 600 });
    expect((await db.selectFrom('attachments').select('name').execute()).map((r) => r.name)).toEqual(['first.pdf']);
    expect(
      await db.selectFrom('audit_events').select('action').where('action', '=', 'attachment.upload').execute(),
    ).toHaveLength(1);
    // Up to the quota exactly is allowed.
    await uploadAttachment(db, store(), author, a, {
      name: 'fits.pdf',
      type: 'application/pdf',
      bytes: pdf(400, 'fits'),
    });
    expect(await projectStorageUsed(db, a.project_id)).toBe(1000);
  });

  it('counts each content once per project: the same bytes on another sheet or under another name cost nothing more; other projects have their own', async () => {
    const { db, author, a, b, other } = await world();
    const bytes = pdf(700, 'shared');
    await uploadAttachment(db, store(), author, a, { name: 'spec.pdf', type: 'application/pdf', bytes });
    await uploadAttachment(db, store(), author, a, { name: 'spec-copy.pdf', type: 'application/pdf', bytes });
    await uploadAttachment(db, store(), author, b, { name: 'spec.pdf', type: 'application/pdf', bytes });
    expect(
      await db.selectFrom('attachments').select('id').where('project_id', '=', a.project_id).execute(),
    ).toHaveLength(3);
    expect(await projectStorageUsed(db, a.project_id)).toBe(700);
    expect(
      (
        await refusal(
          uploadAttachment(db, store(), author, b, {
            name: 'new.pdf',
            type: 'application/pdf',
            bytes: pdf(301, 'new'),
          }),
        )
      ).status,
    ).toBe(413);
    // Another project's quota is its own, even for the same bytes.
    await uploadAttachment(db, store(), author, other, { name: 'spec.pdf', type: 'application/pdf', bytes });
    await uploadAttachment(db, store(), author, other, {
      name: 'more.pdf',
      type: 'application/pdf',
      bytes: pdf(300, 'more'),
    });
    expect(await projectStorageUsed(db, other.project_id)).toBe(1000);
  });

  it('lets only one of two concurrent uploads through when only one fits', async () => {
    const { db, author, a, b } = await world();
    const results = await Promise.allSettled([
      uploadAttachment(db, store(), author, a, { name: 'left.pdf', type: 'application/pdf', bytes: pdf(600, 'left') }),
      uploadAttachment(db, store(), author, b, {
        name: 'right.pdf',
        type: 'application/pdf',
        bytes: pdf(600, 'right'),
      }),
    ]);
    expect(results.map((r) => r.status).sort()).toEqual(['fulfilled', 'rejected']);
    const rejected = results.find((r) => r.status === 'rejected') as PromiseRejectedResult;
    expect(rejected.reason).toBeInstanceOf(AppError);
    expect((rejected.reason as AppError).status).toBe(413);
    expect(await projectStorageUsed(db, a.project_id)).toBe(600);
  });

  it('decides under the project row lock: an upload waits for a transaction holding it, then counts what that one stored', async () => {
    const { db, author, a } = await world();
    let release!: () => void;
    const released = new Promise<void>((resolve) => (release = resolve));
    let upload: Promise<unknown> | null = null;
    const holder = db.transaction().execute(async (trx) => {
      await trx.selectFrom('projects').select('id').where('id', '=', a.project_id).forNoKeyUpdate().execute();
      // Another upload's row, not yet committed, filling the quota.
      await trx
        .insertInto('attachments')
        .values({
          sheet_id: a.id,
          project_id: a.project_id,
          name: 'held.pdf',
          media_type: 'application/pdf',
          size: 900,
          sha256: 'e'.repeat(64),
          storage_key: `attachments/sha256/${'e'.repeat(64)}`,
          table_data: null,
          uploaded_by: author.userId,
        })
        .execute();
      upload = uploadAttachment(db, store(), author, a, {
        name: 'late.pdf',
        type: 'application/pdf',
        bytes: pdf(600, 'late'),
      }).catch((e: unknown) => e);
      await released;
    });
    try {
      // The upload's deciding check waits on the lock (seen in pg_stat_activity), never past it.
      await until(
        'the upload to wait for the project row lock',
        async () =>
          Number(
            (
              await sql<{
                n: string;
              }>`select count(*) as n from pg_stat_activity where datname = current_database() and wait_event_type = 'Lock'`.execute(
                db,
              )
            ).rows[0].n,
          ) > 0,
        10_000,
      );
    } finally {
      release();
      await holder;
    }
    const e = await upload!;
    expect(e).toBeInstanceOf(AppError);
    expect((e as AppError).message).toMatch(
      /^This project's attachments may take at most 1000 bytes; 900 bytes are used and this file needs 600 bytes more\./,
    );
  });
});
