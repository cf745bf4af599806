// Optional single sign-on through the organisation's OpenID Connect provider, configured by
// environment variables:
//   WORLDSHEET_OIDC_ISSUER          issuer URL (its /.well-known/openid-configuration is read)
//   WORLDSHEET_OIDC_CLIENT_ID       client id registered for Worldsheet
//   WORLDSHEET_OIDC_CLIENT_SECRET   client secret
//   WORLDSHEET_OIDC_NAME            label of the sign-in button (default "Organisation account")
//   WORLDSHEET_OIDC_GROUPS_CLAIM    claim holding the user's groups (default "groups")
//   WORLDSHEET_OIDC_ROLE_MAP        group=PROJECT:role pairs, separated by ";" or ",", e.g.
//                                   "calc-authors=TPT2:originator;calc-checkers=TPT2:checker"
// At each sign-in, for every (project, role) pair named in the map, the user holds the role exactly
// when they are in a group mapped to it; each change is audited. Roles not named in the map are
// left to the administrators.
import type { Account } from 'next-auth';
import type { OAuthConfig } from 'next-auth/providers/oauth';
import type { Kysely } from 'kysely';
import type { Database, ProjectRole } from '@/db/schema';
import { recordAudit } from '@/lib/audit/record';
import { config } from '@/lib/config';
import type { Actor } from './actor';
import { startSession } from './sessions';

const ROLES: readonly ProjectRole[] = ['originator', 'checker', 'approver', 'controller', 'viewer'];

export interface RoleMapping {
  group: string;
  projectCode: string;
  role: ProjectRole;
}

export function parseRoleMap(text: string | undefined): RoleMapping[] {
  if (!text) return [];
  return text
    .split(/[;,]/)
    .map((part) => part.trim())
    .filter(Boolean)
    .map((part) => {
      const m = /^([^=]+)=([A-Z][A-Z0-9]{1,9}):([a-z]+)$/.exec(part);
      if (!m || !ROLES.includes(m[3] as ProjectRole))
        throw new Error(`WORLDSHEET_OIDC_ROLE_MAP: cannot read "${part}" (expected group=PROJECT:role)`);
      return { group: m[1].trim(), projectCode: m[2], role: m[3] as ProjectRole };
    });
}

export function oidcConfigured(): boolean {
  const settings = config();
  return Boolean(settings.WORLDSHEET_OIDC_ISSUER && settings.WORLDSHEET_OIDC_CLIENT_ID);
}

export function oidcProviders(): OAuthConfig<Record<string, unknown>>[] {
  if (!oidcConfigured()) return [];
  const settings = config();
  const issuer = settings.WORLDSHEET_OIDC_ISSUER!.replace(/\/$/, '');
  return [
    {
      id: 'oidc',
      name: settings.WORLDSHEET_OIDC_NAME,
      type: 'oauth',
      wellKnown: `${issuer}/.well-known/openid-configuration`,
      issuer,
      clientId: settings.WORLDSHEET_OIDC_CLIENT_ID,
      clientSecret: settings.WORLDSHEET_OIDC_CLIENT_SECRET,
      authorization: { params: { scope: 'openid email profile' } },
      idToken: true,
      // With the code flow a conforming provider may put only `sub` in the ID token and give the
      // e-mail, name and groups at its userinfo endpoint (OpenID Connect Core 1.0, 5.4). Take the
      // ID token's claims, completed by userinfo (openid-client checks its `sub` is the same).
      userinfo: {
        async request({ tokens, client }) {
          // next-auth types the token set loosely; at run time it is openid-client's TokenSet.
          const set = tokens as Extract<Parameters<typeof client.userinfo>[0], object>;
          const claims = set.claims();
          if (!client.issuer.metadata.userinfo_endpoint || !set.access_token) return claims;
          return { ...(await client.userinfo(set)), ...claims };
        },
      },
      checks: ['pkce', 'state', 'nonce'],
      profile(profile) {
        return {
          id: String(profile.sub),
          email: profile.email as string,
          name: (profile.name as string) ?? (profile.email as string),
        };
      },
    },
  ];
}

function groupsOf(profile: Record<string, unknown>): string[] {
  const claim = config().WORLDSHEET_OIDC_GROUPS_CLAIM;
  const value = profile[claim];
  if (Array.isArray(value)) return value.map(String);
  if (typeof value === 'string') return value.split(/[\s,]+/).filter(Boolean);
  return [];
}

/**
 * Finds or creates the user of an OIDC sign-in, applies the group-to-role map and opens a session.
 * Returns null when the account may not sign in (no e-mail, or disabled or locked).
 */
export async function signInWithOidc(
  db: Kysely<Database>,
  input: { profile: Record<string, unknown> | undefined; account: Account | null },
  mapping: RoleMapping[] = parseRoleMap(config().WORLDSHEET_OIDC_ROLE_MAP),
): Promise<{ id: string; email: string; name: string; sessionId: string } | null> {
  const profile = input.profile ?? {};
  const email = typeof profile.email === 'string' ? profile.email.trim().toLowerCase() : '';
  if (!email || profile.email_verified === false) return null;
  const name = (typeof profile.name === 'string' && profile.name.trim()) || email;
  const groups = new Set(groupsOf(profile));

  return db.transaction().execute(async (trx) => {
    let user = await trx
      .selectFrom('users')
      .select(['id', 'email', 'display_name', 'is_admin', 'disabled_at', 'locked_at', 'lock_expires_at'])
      .where('email', '=', email)
      .executeTakeFirst();
    if (!user) {
      user = await trx
        .insertInto('users')
        .values({ email, display_name: name, password_hash: null })
        .returning(['id', 'email', 'display_name', 'is_admin', 'disabled_at', 'locked_at', 'lock_expires_at'])
        .executeTakeFirstOrThrow();
      await recordAudit(trx, null, {
        action: 'user.create',
        objectType: 'user',
        objectId: user.id,
        newValue: { email, name, via: 'oidc' },
        reason: 'first sign-in through the organisation account',
      });
    }
    // A timed lock (after failed passwords) that has run out no longer holds (lib/auth/lockout.ts).
    const locked = user.locked_at !== null && (user.lock_expires_at === null || user.lock_expires_at > new Date());
    if (user.disabled_at || locked) return null;
    const sessionId = await startSession(trx as unknown as Kysely<Database>, {
      userId: user.id,
      method: 'oidc',
      ip: null,
      userAgent: null,
    });
    const actor: Actor = {
      userId: user.id,
      email: user.email,
      name: user.display_name,
      isAdmin: user.is_admin,
      via: 'session',
      sessionId,
      tokenId: null,
    };
    await recordAudit(trx, actor, {
      action: 'auth.sign-in',
      objectType: 'session',
      objectId: sessionId,
      newValue: { method: 'oidc' },
    });

    const codes = [...new Set(mapping.map((m) => m.projectCode))];
    const projects = codes.length
      ? await trx.selectFrom('projects').select(['id', 'code']).where('code', 'in', codes).execute()
      : [];
    for (const project of projects) {
      const pairs = mapping.filter((m) => m.projectCode === project.code);
      const held = new Set(
        (
          await trx
            .selectFrom('project_members')
            .select('role')
            .where('project_id', '=', project.id)
            .where('user_id', '=', user.id)
            .execute()
        ).map((r) => r.role),
      );
      for (const role of new Set(pairs.map((p) => p.role))) {
        const should = pairs.some((p) => p.role === role && groups.has(p.group));
        if (should && !held.has(role)) {
          await trx
            .insertInto('project_members')
            .values({ project_id: project.id, user_id: user.id, role, granted_by: null })
            .execute();
          await recordAudit(trx, null, {
            action: 'membership.grant',
            objectType: 'user',
            objectId: user.id,
            projectId: project.id,
            newValue: { role },
            reason: 'organisation group membership (single sign-on)',
          });
        } else if (!should && held.has(role)) {
          await trx
            .deleteFrom('project_members')
            .where('project_id', '=', project.id)
            .where('user_id', '=', user.id)
            .where('role', '=', role)
            .execute();
          await recordAudit(trx, null, {
            action: 'membership.revoke',
            objectType: 'user',
            objectId: user.id,
            projectId: project.id,
            oldValue: { role },
            reason: 'no longer in the organisation group (single sign-on)',
          });
        }
      }
    }
    return { id: user.id, email: user.email, name: user.display_name, sessionId };
  });
}
