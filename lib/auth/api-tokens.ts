// API tokens for scripts and integrations: shown once, stored as SHA-256, sent as
// `Authorization: Bearer …`, carrying their owner's roles, revocable.
import { randomBytes } from 'node:crypto';
import { sql, type Kysely } from 'kysely';
import { z } from 'zod';
import type { Database } from '@/db/schema';
import { recordAudit } from '@/lib/audit/record';
import { AppError } from '@/lib/errors/app-error';
import type { Actor } from './actor';
import { hashToken } from './email-tokens';

export const API_TOKEN_PREFIX = 'wst_';

/** The body of POST /api/account/tokens. */
export const apiTokenInputSchema = z.object({ name: z.string().trim().min(1, 'name the token').max(100) });

export async function createApiToken(db: Kysely<Database>, actor: Actor, name: string): Promise<{ id: string; token: string; prefix: string }> {
  const token = `${API_TOKEN_PREFIX}${randomBytes(32).toString('base64url')}`;
  const prefix = token.slice(0, 12);
  return db.transaction().execute(async (trx) => {
    const row = await trx
      .insertInto('api_tokens')
      .values({ user_id: actor.userId, name: name.trim(), token_hash: hashToken(token), prefix })
      .returning('id')
      .executeTakeFirstOrThrow();
    await recordAudit(trx, actor, { action: 'token.create', objectType: 'api_token', objectId: row.id, newValue: { name: name.trim(), prefix } });
    return { id: row.id, token, prefix };
  });
}

export async function listApiTokens(db: Kysely<Database>, userId: string) {
  return db
    .selectFrom('api_tokens')
    .select(['id', 'name', 'prefix', 'created_at', 'last_used_at', 'revoked_at'])
    .where('user_id', '=', userId)
    .orderBy('created_at', 'desc')
    .execute();
}

export async function revokeApiToken(db: Kysely<Database>, actor: Actor, tokenId: string): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const row = await trx
      .updateTable('api_tokens')
      .set({ revoked_at: sql`now()` })
      .where('id', '=', tokenId)
      .where('user_id', '=', actor.userId)
      .where('revoked_at', 'is', null)
      .returning(['id', 'name'])
      .executeTakeFirst();
    if (!row) throw new AppError('not_found', 'No such token.');
    await recordAudit(trx, actor, { action: 'token.revoke', objectType: 'api_token', objectId: row.id, oldValue: { name: row.name } });
  });
}

/** The actor a bearer token stands for, or null when it is unknown, revoked or its owner disabled. */
export async function resolveApiToken(db: Kysely<Database>, token: string): Promise<Actor | null> {
  if (!token.startsWith(API_TOKEN_PREFIX) || token.length > 200) return null;
  const row = await db
    .selectFrom('api_tokens as t')
    .innerJoin('users as u', 'u.id', 't.user_id')
    .select(['t.id', 't.user_id', 'u.email', 'u.display_name', 'u.is_admin', 'u.disabled_at', 't.revoked_at', sql<boolean>`t.last_used_at is null or t.last_used_at < now() - interval '1 minute'`.as('stale')])
    .where('t.token_hash', '=', hashToken(token))
    .executeTakeFirst();
  if (!row || row.revoked_at || row.disabled_at) return null;
  if (row.stale) await db.updateTable('api_tokens').set({ last_used_at: sql`now()` }).where('id', '=', row.id).execute();
  return { userId: row.user_id, email: row.email, name: row.display_name, isAdmin: row.is_admin, via: 'token', sessionId: null, tokenId: row.id };
}
