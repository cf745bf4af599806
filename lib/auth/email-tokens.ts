// Single-use tokens sent by e-mail (sign-in links, password resets, invitations). Only their
// SHA-256 is stored; a token works once and only until it expires.
import { createHash, randomBytes } from 'node:crypto';
import { sql, type Kysely, type Transaction } from 'kysely';
import type { Database, EmailTokenPurpose } from '@/db/schema';

export const hashToken = (token: string) => createHash('sha256').update(token, 'utf8').digest('hex');

export async function createEmailToken(
  db: Kysely<Database> | Transaction<Database>,
  input: { userId: string; purpose: EmailTokenPurpose; minutes: number },
): Promise<string> {
  const token = randomBytes(32).toString('base64url');
  await db
    .insertInto('email_tokens')
    .values({
      user_id: input.userId,
      purpose: input.purpose,
      token_hash: hashToken(token),
      expires_at: sql<Date>`now() + make_interval(mins => ${input.minutes})` as unknown as Date,
    })
    .execute();
  return token;
}

/** Marks the token used and returns its user, or null when it is unknown, expired or used. */
export async function consumeEmailToken(
  db: Kysely<Database> | Transaction<Database>,
  input: { token: string; purpose: EmailTokenPurpose },
): Promise<string | null> {
  const row = await db
    .updateTable('email_tokens')
    .set({ used_at: sql`now()` })
    .where('token_hash', '=', hashToken(input.token))
    .where('purpose', '=', input.purpose)
    .where('used_at', 'is', null)
    .where('expires_at', '>', sql<Date>`now()`)
    .returning('user_id')
    .executeTakeFirst();
  return row?.user_id ?? null;
}
