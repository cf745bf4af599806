// Electronic signatures on a version under check (21 CFR Part 11 §11.50 name, time and meaning;
// §11.70 bound to the version's SHA-256; §11.200 the password asked again at signing), and the
// list of a sheet's signatures.
import type { Kysely, Transaction } from 'kysely';
import type { Database, SignatureMeaning } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { reauthenticateToSign } from '@/lib/auth/reauthenticate';
import { recordAudit } from '@/lib/audit/record';

type Db = Kysely<Database> | Transaction<Database>;

/** Re-authentication at the moment of signing (21 CFR Part 11 §11.200(a)(1)). Refusals are audited. */
export function confirmPassword(
  db: Kysely<Database>,
  actor: Actor,
  sheet: { id: string; project_id: string },
  meaning: SignatureMeaning,
  given: string,
): Promise<void> {
  return reauthenticateToSign(db, actor, {
    sheet,
    meaning,
    password: given,
    messages: {
      noPassword:
        'Your account has no password (you sign in through single sign-on); set one on your account page to sign records.',
      disabledOrLocked: 'Your account is disabled or locked and cannot sign.',
    },
  });
}

export async function sign(
  trx: Transaction<Database>,
  actor: Actor,
  v: { sheetId: string; projectId: string; number: number; sha256: string },
  meaning: SignatureMeaning,
  checkId: string | null,
) {
  const u = await trx
    .selectFrom('users')
    .select('display_name')
    .where('id', '=', actor.userId)
    .executeTakeFirstOrThrow();
  const row = await trx
    .insertInto('signatures')
    .values({
      sheet_id: v.sheetId,
      version_number: v.number,
      version_sha256: v.sha256,
      check_id: checkId,
      user_id: actor.userId,
      printed_name: u.display_name,
      meaning,
    })
    .returning(['id', 'signed_at'])
    .executeTakeFirstOrThrow();
  await recordAudit(trx, actor, {
    action: 'signature.sign',
    objectType: 'sheet',
    objectId: v.sheetId,
    projectId: v.projectId,
    newValue: {
      meaning,
      version: v.number,
      sha256: v.sha256,
      printedName: u.display_name,
      signedAt: new Date(row.signed_at).toISOString(),
      signatureId: row.id,
    },
  });
}

export async function listSignatures(db: Db, sheetId: string) {
  const rows = await db
    .selectFrom('signatures')
    .select(['id', 'version_number', 'version_sha256', 'printed_name', 'meaning', 'signed_at', 'check_id', 'user_id'])
    .where('sheet_id', '=', sheetId)
    .orderBy('signed_at')
    .execute();
  return rows.map((r) => ({
    id: r.id,
    versionNumber: r.version_number,
    sha256: r.version_sha256,
    printedName: r.printed_name,
    meaning: r.meaning,
    signedAt: new Date(r.signed_at).toISOString(),
    checkId: r.check_id,
    userId: r.user_id,
  }));
}
