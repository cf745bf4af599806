// Downloading an issued revision: the original PDF, byte for byte and checked against its recorded
// SHA-256, while it is current (or when document control asks); a superseded or withdrawn revision
// comes as a copy stamped with its status (lib/issue/stamp.ts), made once for each status and kept.
import { createHash } from 'node:crypto';
import type { Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import { AppError } from '@/lib/errors/app-error';
import { stampIssuedPdf } from './stamp';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import type { ObjectStore } from '@/lib/storage/object-store';
import { getRevision } from './register';

export const downloadQuerySchema = z.object({ original: z.enum(['0', '1']).default('0') });

/**
 * The PDF of a revision. The original file, byte for byte, while it is current (or when document
 * control asks for it); a superseded or withdrawn revision comes as a copy stamped on every page
 * with its status, made once for each status and kept beside the original.
 */
export async function revisionPdf(db: Kysely<Database>, store: ObjectStore, revisionId: string, original: boolean) {
  const r = await getRevision(db, revisionId);
  if (!r) throw new AppError('not_found', 'No such revision.');
  const name = `${formatSheetNumber(r.project_code, r.sheet_number)}-rev-${r.code}`;
  const bytes = await store.get(r.pdf_key);
  if (!bytes)
    throw new AppError(
      'unavailable',
      'The issued PDF is missing from the file store; report this to your administrator.',
    );
  if (createHash('sha256').update(bytes).digest('hex') !== r.pdf_sha256) {
    throw new AppError(
      'unavailable',
      'The stored PDF no longer matches its recorded SHA-256; it is not served. Report this to your administrator.',
    );
  }
  if (original || r.status === 'current') return { fileName: `${name}.pdf`, bytes, stamped: false };
  // A copy is stamped once for each status (a superseded revision later withdrawn gets a new one).
  const keyPrefix = `revisions/stamped-${r.id}-${r.status}-`;
  if (r.stamped_key && r.stamped_sha256 && r.stamped_key.startsWith(keyPrefix)) {
    const stamped = await store.get(r.stamped_key);
    if (stamped && createHash('sha256').update(stamped).digest('hex') === r.stamped_sha256)
      return { fileName: `${name}-${r.status}.pdf`, bytes: stamped, stamped: true };
  }
  const label =
    r.status === 'withdrawn'
      ? `WITHDRAWN ${r.withdrawn_at ? new Date(r.withdrawn_at).toISOString().slice(0, 10) : ''}: ${r.withdrawn_reason ?? ''}`
      : `SUPERSEDED by revision ${r.superseded_by_code} issued ${r.superseded_by_issued_at ? new Date(r.superseded_by_issued_at).toISOString().slice(0, 10) : ''}`;
  // The copy is an incremental update of the issued file (lib/issue/stamp.ts): the original's
  // signature still verifies, and document control signs the stamp over the whole file.
  const stamped = await stampIssuedPdf(bytes, {
    status: r.status,
    headline: label,
    note: 'Not for use. Copy of an issued revision, stamped and signed by document control; the original stays in the register.',
    signingTime: new Date(),
  });
  const sha = createHash('sha256').update(stamped).digest('hex');
  const key = `${keyPrefix}${sha}.pdf`;
  await store.putOnce(key, stamped, 'application/pdf');
  await db
    .updateTable('revisions')
    .set({ stamped_key: key, stamped_sha256: sha })
    .where('id', '=', r.id)
    .where('status', '=', r.status)
    .where((eb) => eb.or([eb('stamped_sha256', 'is', null), eb('stamped_key', 'not like', `${keyPrefix}%`)]))
    .execute()
    .catch(() => undefined);
  return { fileName: `${name}-${r.status}.pdf`, bytes: Buffer.from(stamped), stamped: true };
}
