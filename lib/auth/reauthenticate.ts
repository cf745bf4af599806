// Re-authentication at the moment of signing (21 CFR Part 11 §11.200(a)(1)): whoever signs a record
// (prepared, checked, approved, issued) types their password again. A refusal is audited as
// "signature.refused" with the meaning that was not signed, and thrown as 403 with rule "password".
// Wrong passwords count toward the account's lock exactly as at sign-in.
import type { Kysely } from 'kysely';
import type { Database, SignatureMeaning } from '@/db/schema';
import type { Actor } from '@/lib/auth/actor';
import { checkAccountPassword, lockedMessage } from '@/lib/auth/lockout';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';

export const WRONG_PASSWORD_MESSAGE = 'The password is not correct; nothing was signed.';

/** What the signer is told when the account itself cannot sign; each signing screen words it. */
export interface ReauthenticationMessages {
  /** The account has no password (it signs in through single sign-on). */
  noPassword: string;
  /** The account is disabled (the password is then not checked). A locked account is told until when. */
  disabledOrLocked: string;
}

export async function reauthenticateToSign(
  db: Kysely<Database>,
  actor: Actor,
  input: {
    sheet: { id: string; project_id: string };
    meaning: SignatureMeaning;
    password: string;
    messages: ReauthenticationMessages;
  },
): Promise<void> {
  // A wrong password here counts toward the same lock as at sign-in (lib/auth/lockout.ts): a session
  // or an API token is no licence to guess. A locked account cannot sign, even with the right one.
  const check = await checkAccountPassword(db, {
    userId: actor.userId,
    password: input.password,
    context: { where: 'signature', actor },
  });
  const problem =
    check.outcome === 'ok'
      ? null
      : check.outcome === 'no-password'
        ? input.messages.noPassword
        : check.outcome === 'disabled'
          ? input.messages.disabledOrLocked
          : check.outcome === 'locked'
            ? `${lockedMessage(check.until)} Nothing was signed.`
            : WRONG_PASSWORD_MESSAGE;
  if (problem) {
    const { sheet, meaning } = input;
    await recordAudit(db, actor, {
      action: 'signature.refused',
      objectType: 'sheet',
      objectId: sheet.id,
      projectId: sheet.project_id,
      newValue: { meaning },
      reason: problem,
    });
    throw new AppError('forbidden', problem, { rule: 'password' });
  }
}
