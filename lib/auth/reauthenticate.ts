// Re-authentication at the moment of signing (21 CFR Part 11 §11.200(a)(1)): whoever signs a record
// (prepared, checked, approved, issued) types their password again. A refusal is audited as
// "signature.refused" with the meaning that was not signed, and thrown as 403 with rule "password".
import type { Kysely } from 'kysely';
import type { Database, SignatureMeaning } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { verifyPassword } from '@/lib/auth/password';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';

export const WRONG_PASSWORD_MESSAGE = 'The password is not correct; nothing was signed.';

/** What the signer is told when the account itself cannot sign; each signing screen words it. */
export interface ReauthenticationMessages {
  /** The account has no password (it signs in through single sign-on). */
  noPassword: string;
  /** The account is disabled or locked (the password is then not checked). */
  disabledOrLocked: string;
}

export async function reauthenticateToSign(
  db: Kysely<Database>,
  actor: Actor,
  input: { sheet: { id: string; project_id: string }; meaning: SignatureMeaning; password: string; messages: ReauthenticationMessages },
): Promise<void> {
  const u = await db.selectFrom('users').select(['password_hash', 'disabled_at', 'locked_at']).where('id', '=', actor.userId).executeTakeFirstOrThrow();
  const problem = !u.password_hash
    ? input.messages.noPassword
    : u.disabled_at || u.locked_at
      ? input.messages.disabledOrLocked
      : (await verifyPassword(u.password_hash, input.password))
        ? null
        : WRONG_PASSWORD_MESSAGE;
  if (problem) {
    const { sheet, meaning } = input;
    await recordAudit(db, actor, { action: 'signature.refused', objectType: 'sheet', objectId: sheet.id, projectId: sheet.project_id, newValue: { meaning }, reason: problem });
    throw new AppError('forbidden', problem, { rule: 'password' });
  }
}
