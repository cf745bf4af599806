// API tokens for scripts and integrations: shown once, stored as SHA-256, sent as
// `Authorization: Bearer …`, carrying their owner's roles, revocable.
//
// Each token has an expiry (API_TOKEN_SETTINGS.defaultDays unless chosen at creation, at most
// maxDays) and a scope: 'read' (GET and HEAD only: the request guard in lib/http/route.ts refuses
// anything else) or 'read-write'. Signing, approving and issuing still need the password, whatever
// the scope. A token stops working when it expires or is revoked, and while its owner is locked or
// disabled (suspended: it works again after an unlock). A password reset revokes all of a person's
// tokens; a password change revokes them when asked to.
import { randomBytes } from 'node:crypto';
import { sql, type Kysely } from 'kysely';
import { z } from 'zod';
import type { ApiTokenScope, Database } from '@/db/schema';
import { recordAudit } from '@/lib/audit/record';
import { config } from '@/lib/config';
import { AppError } from '@/lib/errors/app-error';
import type { Actor } from './actor';
import { hashToken } from './email-tokens';

export const API_TOKEN_PREFIX = 'wst_';

const maxDays = config().WORLDSHEET_TOKEN_MAX_DAYS;

export const API_TOKEN_SETTINGS = {
  /** The longest lifetime a token may be given at creation, in days (WORLDSHEET_TOKEN_MAX_DAYS). */
  maxDays,
  /** The lifetime of a token when none is chosen (WORLDSHEET_TOKEN_DEFAULT_DAYS, at most maxDays). */
  defaultDays: Math.min(config().WORLDSHEET_TOKEN_DEFAULT_DAYS, maxDays),
} as const;

const API_TOKEN_SCOPES = ['read', 'read-write'] as const satisfies readonly ApiTokenScope[];

/** The body of POST /api/account/tokens. */
export const apiTokenInputSchema = z.object({
  name: z.string().trim().min(1, 'name the token').max(100),
  scope: z.enum(API_TOKEN_SCOPES).default('read-write').meta({
    description:
      '`read`: GET and HEAD requests only. `read-write`: also changes. Signing, approving and issuing need the password in any case.',
  }),
  expiresInDays: z
    .number()
    .int()
    .min(1)
    .max(API_TOKEN_SETTINGS.maxDays, `a token lasts at most ${API_TOKEN_SETTINGS.maxDays} days`)
    .default(API_TOKEN_SETTINGS.defaultDays)
    .meta({
      description: `Days until the token expires: ${API_TOKEN_SETTINGS.defaultDays} unless given, at most ${API_TOKEN_SETTINGS.maxDays}.`,
    }),
});

export interface CreatedApiToken {
  id: string;
  /** The secret, shown this once. */
  token: string;
  prefix: string;
  scope: ApiTokenScope;
  expires_at: Date;
}

export async function createApiToken(
  db: Kysely<Database>,
  actor: Actor,
  name: string,
  options: { scope?: ApiTokenScope; expiresInDays?: number } = {},
): Promise<CreatedApiToken> {
  const scope = options.scope ?? 'read-write';
  const days = options.expiresInDays ?? API_TOKEN_SETTINGS.defaultDays;
  if (!Number.isInteger(days) || days < 1 || days > API_TOKEN_SETTINGS.maxDays) {
    throw new AppError('bad_request', `A token lasts from 1 to ${API_TOKEN_SETTINGS.maxDays} days.`);
  }
  const token = `${API_TOKEN_PREFIX}${randomBytes(32).toString('base64url')}`;
  const prefix = token.slice(0, 12);
  return db.transaction().execute(async (trx) => {
    const row = await trx
      .insertInto('api_tokens')
      .values({
        user_id: actor.userId,
        name: name.trim(),
        token_hash: hashToken(token),
        prefix,
        scope,
        expires_at: sql<Date>`now() + make_interval(days => ${days})`,
      })
      .returning(['id', 'scope', 'expires_at'])
      .executeTakeFirstOrThrow();
    await recordAudit(trx, actor, {
      action: 'token.create',
      objectType: 'api_token',
      objectId: row.id,
      newValue: { name: name.trim(), prefix, scope: row.scope, expiresAt: row.expires_at.toISOString() },
    });
    return { id: row.id, token, prefix, scope: row.scope, expires_at: row.expires_at };
  });
}

export async function listApiTokens(db: Kysely<Database>, userId: string) {
  return db
    .selectFrom('api_tokens')
    .select([
      'id',
      'name',
      'prefix',
      'scope',
      'created_at',
      'expires_at',
      'last_used_at',
      'revoked_at',
      sql<boolean>`expires_at <= now()`.as('expired'),
    ])
    .where('user_id', '=', userId)
    .orderBy('created_at', 'desc')
    .execute();
}

/** Revokes every live token of a user (password reset, or a password change that asks to); the number revoked. */
export async function revokeUserApiTokens(db: Kysely<Database>, userId: string): Promise<number> {
  const revoked = await db
    .updateTable('api_tokens')
    .set({ revoked_at: sql`now()` })
    .where('user_id', '=', userId)
    .where('revoked_at', 'is', null)
    .returning('id')
    .execute();
  return revoked.length;
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
    await recordAudit(trx, actor, {
      action: 'token.revoke',
      objectType: 'api_token',
      objectId: row.id,
      oldValue: { name: row.name },
    });
  });
}

/**
 * The actor a bearer token stands for, with the token's scope; null when it is unknown, revoked or
 * expired, or while its owner is disabled or locked.
 */
export async function resolveApiToken(db: Kysely<Database>, token: string): Promise<Actor | null> {
  if (!token.startsWith(API_TOKEN_PREFIX) || token.length > 200) return null;
  const row = await db
    .selectFrom('api_tokens as t')
    .innerJoin('users as u', 'u.id', 't.user_id')
    .select([
      't.id',
      't.user_id',
      't.scope',
      'u.email',
      'u.display_name',
      'u.is_admin',
      'u.disabled_at',
      't.revoked_at',
      sql<boolean>`t.expires_at <= now()`.as('expired'),
      // Locked as lib/auth/lockout.ts defines it: an administrator's lock (no end) or a timed one in force.
      sql<boolean>`u.locked_at is not null and (u.lock_expires_at is null or u.lock_expires_at > now())`.as('locked'),
      sql<boolean>`t.last_used_at is null or t.last_used_at < now() - interval '1 minute'`.as('stale'),
    ])
    .where('t.token_hash', '=', hashToken(token))
    .executeTakeFirst();
  if (!row || row.revoked_at || row.expired || row.disabled_at || row.locked) return null;
  if (row.stale)
    await db
      .updateTable('api_tokens')
      .set({ last_used_at: sql`now()` })
      .where('id', '=', row.id)
      .execute();
  return {
    userId: row.user_id,
    email: row.email,
    name: row.display_name,
    isAdmin: row.is_admin,
    via: 'token',
    sessionId: null,
    tokenId: row.id,
    tokenScope: row.scope,
  };
}
