// The OpenAPI 3.1 document of the HTTP API, served at GET /api/openapi.json. Every request body and
// query here is the very zod schema the route handler validates with, converted by zod's own
// z.toJSONSchema (JSON Schema 2020-12, the dialect of OpenAPI 3.1), so the document cannot drift from
// what the server accepts. tests/api/openapi.test.ts fails when a route file has no entry in
// OPERATIONS, or an entry has no route file.
import { z, type ZodObject, type ZodType } from 'zod';
import { attachmentSchema } from '@/lib/attachments/attachments';
import { auditQuerySchema } from '@/lib/audit/query';
import { passwordChangeSchema, resetConfirmSchema, resetRequestSchema } from '@/lib/auth/account';
import { API_TOKEN_PREFIX, API_TOKEN_SETTINGS, apiTokenInputSchema } from '@/lib/auth/api-tokens';
import { unlockSchema } from '@/lib/auth/lockout';
import { evaluateRequestSchema } from '@/lib/calc/evaluate-request';
import { sheetFileSchema } from '@/lib/calc/sheet-file';
import { ENGINE_VERSION } from '@/lib/calc/version';
import { errorBodySchema } from '@/lib/errors/app-error';
import { cspReportBodySchema } from '@/lib/http/csp-reports';
import { PATH_PARAMS } from '@/lib/http/params';
import { projectInputSchema, roleChangeSchema } from '@/lib/projects/projects';
import { inviteSchema, userChangeSchema } from '@/lib/projects/users';
import { compareQuerySchema } from '@/lib/sheets/compare';
import { exportQuerySchema, importQuerySchema } from '@/lib/sheets/sheet-files';
import { startFromSchema } from '@/lib/sheets/start-from';
import { softwareImpactQuerySchema } from '@/lib/sheets/software-impact';
import { createSheetSchema, saveVersionSchema } from '@/lib/sheets/sheets';
import { voidSheetSchema } from '@/lib/sheets/void';
import { issueRequestSchema } from '@/lib/issue/request';
import { registerQuerySchema } from '@/lib/issue/register';
import { downloadQuerySchema } from '@/lib/issue/download';
import { withdrawSchema } from '@/lib/issue/withdraw';
import { verifyCodeSchema } from '@/lib/issue/verification';
import {
  checkWorkSchema,
  commentSchema,
  decisionSchema,
  queueQuerySchema,
  resolveSchema,
  submitSchema,
} from '@/lib/checks/workflow';
import { APP_VERSION } from '@/lib/version';
import * as res from './openapi-schemas';

type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

/** Who may call: anyone, a browser session or an API token, or a browser session only. */
type Auth = 'none' | 'session or API token' | 'session';

type Tag =
  | 'meta'
  | 'sign-in'
  | 'account'
  | 'admin'
  | 'projects'
  | 'sheets'
  | 'attachments'
  | 'checks'
  | 'revisions'
  | 'calculation';

/** A body: a zod schema, or raw bytes of a media type. */
type BodySchema = ZodType | 'binary';

interface ResponseSpec {
  description: string;
  /** Media type → body; none for an empty body. */
  content?: Record<string, BodySchema>;
}

export interface Operation {
  method: HttpMethod;
  /** OpenAPI style: `/api/sheets/{sheetId}/versions`. */
  path: string;
  operationId: string;
  summary: string;
  description?: string;
  tags: Tag[];
  auth: Auth;
  /** Every `{name}` of the path, with its schema. */
  params?: Record<string, { description: string; schema: ZodType }>;
  /** The schema the handler passes to parseValue with the query string. */
  query?: ZodObject;
  /** The schema the handler passes to parseJson (or safeParse); JSON unless `contentType` says otherwise. */
  body?: { schema: BodySchema; contentType?: string; description?: string };
  responses: Record<number, ResponseSpec>;
}

const json = (description: string, schema: ZodType): ResponseSpec => ({
  description,
  content: { 'application/json': schema },
});

const ERROR_TEXT: Record<number, string> = {
  400: 'The request is not valid; `details` lists the first problems.',
  401: 'Not signed in: no live session and no valid API token.',
  403: 'Signed in without the role this needs; or a change with a read-only token, or with the session cookie from another origin.',
  404: 'No such object, or one of a project the caller is not a member of.',
  409: 'Conflicts with the current state; `details` says with what.',
  413: 'The body is larger than allowed.',
  415: 'The media type is not accepted (a change with the session cookie takes JSON, or multipart/form-data where a file is sent).',
  429: 'Too many requests from this caller just now; the `Retry-After` header says after how many seconds to try again.',
  503: 'A service the request needs is unavailable.',
};

/** Error responses, each with the one error body; `overrides` words a status for this operation. */
function errors(statuses: number[], overrides: Record<number, string> = {}): Record<number, ResponseSpec> {
  return Object.fromEntries(statuses.map((s) => [s, json(overrides[s] ?? ERROR_TEXT[s], errorBodySchema)]));
}

const uuidParam = (what: string) => ({ description: `The ${what}'s id (UUID).`, schema: z.uuid() });
const projectParam = {
  projectId: { description: "The project's id (UUID) or its code, e.g. `TPT2`.", schema: PATH_PARAMS.projectId.schema },
};
const projectIdParam = { projectId: uuidParam('project') };
const sheetParam = { sheetId: uuidParam('sheet') };

const member = 'Members of the project; 404 for anyone else, administrators included.';

export const OPERATIONS: Operation[] = [
  // meta
  {
    method: 'GET',
    path: '/api/health',
    operationId: 'getHealth',
    summary: 'Readiness: the app and its database',
    description:
      'For a load balancer: 200 while this instance takes requests; 503 while its database cannot be reached or while it drains after SIGTERM (status `draining`).',
    tags: ['meta'],
    auth: 'none',
    responses: {
      200: json('Up, with the latest migration and the app version.', res.healthSchema),
      503: json('The database cannot be reached, or this instance is draining.', res.healthSchema),
    },
  },
  {
    method: 'GET',
    path: '/api/health/live',
    operationId: 'getLiveness',
    summary: 'Liveness: the process answers (asks nothing of the database)',
    tags: ['meta'],
    auth: 'none',
    responses: {
      200: json('The process answers.', res.livenessSchema),
    },
  },
  {
    method: 'GET',
    path: '/api/openapi.json',
    operationId: 'getOpenApiDocument',
    summary: 'This document',
    description:
      'The OpenAPI 3.1 document of the API, generated from the zod schemas the route handlers validate with.',
    tags: ['meta'],
    auth: 'none',
    responses: {
      200: { description: 'The OpenAPI document.', content: { 'application/json': res.openApiDocumentSchema } },
    },
  },
  {
    method: 'POST',
    path: '/api/csp-report',
    operationId: 'reportCspViolation',
    summary: 'Where browsers report Content-Security-Policy violations',
    description:
      "Anyone (browsers post here by themselves, as the policy's `report-uri` and, over HTTPS, `report-to` say). Takes " +
      '`application/csp-report`, `application/reports+json` or `application/json`, at most 64 KiB and 20 reports a body; kept in ' +
      '`csp_reports` for 30 days. Each client address may send 60 reports in 10 minutes, all addresses together 10,000 a day: 429 beyond.',
    tags: ['meta'],
    auth: 'none',
    body: { schema: cspReportBodySchema, contentType: 'application/csp-report' },
    responses: { 204: { description: 'Stored.' }, ...errors([400, 413, 415, 429]) },
  },

  // sign-in
  {
    method: 'GET',
    path: '/api/auth/{nextauth}',
    operationId: 'nextAuthGet',
    summary: 'Sign-in endpoints (next-auth): session, providers, CSRF token, sign-in and sign-out pages, callbacks',
    description:
      'Handled by next-auth. `{nextauth}` is the rest of the path and may hold slashes: `session`, `providers`, `csrf`, `signin`, `signout`, ' +
      '`callback/oidc` (the redirect URI registered at the OpenID Connect provider), `error`. A successful sign-in sets the session cookie.',
    tags: ['sign-in'],
    auth: 'none',
    params: {
      nextauth: {
        description: 'The next-auth action, e.g. `session`, `providers`, `csrf`, `callback/oidc`.',
        schema: z.string(),
      },
    },
    responses: {
      200: json("The action's answer (JSON for `session`, `providers` and `csrf`).", res.nextAuthBodySchema),
      302: { description: 'A redirect (sign-in page, provider, callback), always to a path of the app itself.' },
      ...errors([400], { 400: 'The `callbackUrl` parameter or cookie is not a valid URL.' }),
    },
  },
  {
    method: 'POST',
    path: '/api/auth/{nextauth}',
    operationId: 'nextAuthPost',
    summary: 'Sign in and out (next-auth)',
    description:
      'Handled by next-auth, with its CSRF token (from `GET /api/auth/csrf`) in the form: `callback/password` (fields `email`, `password`), ' +
      '`callback/link` (field `token`, from an e-mailed sign-in link), `signin/oidc` (single sign-on), `signout`. ' +
      'Five failed passwords in a row (at sign-in, a signature or a password change) lock the account for a while, longer each time, and e-mail its holder an unlock link; ' +
      'failed attempts from one client address are slowed down with growing waits.',
    tags: ['sign-in'],
    auth: 'none',
    params: {
      nextauth: {
        description: 'The next-auth action, e.g. `callback/password`, `callback/link`, `signin/oidc`, `signout`.',
        schema: z.string(),
      },
    },
    body: {
      schema: res.nextAuthFormSchema,
      contentType: 'application/x-www-form-urlencoded',
      description: 'next-auth form fields, with `csrfToken`.',
    },
    responses: {
      200: json('JSON answer when asked for one (`json=true`).', res.nextAuthBodySchema),
      302: {
        description:
          'Redirect after sign-in, a refused sign-in (to the error page) or sign-out, always to a path of the app itself.',
      },
      ...errors([400], { 400: 'The `callbackUrl` parameter or cookie is not a valid URL.' }),
    },
  },
  {
    method: 'POST',
    path: '/api/auth/password-reset',
    operationId: 'requestPasswordReset',
    summary: 'Send a password reset link',
    description:
      'Sends a reset link if the address has an account; the answer is the same either way. At most 3 per account per 15 minutes.',
    tags: ['sign-in'],
    auth: 'none',
    body: { schema: resetRequestSchema },
    responses: {
      202: json('Accepted (whether or not the address has an account).', res.acceptedSchema),
      ...errors([400, 413]),
    },
  },
  {
    method: 'POST',
    path: '/api/auth/password-reset/confirm',
    operationId: 'confirmPasswordReset',
    summary: 'Set a new password with a reset token',
    tags: ['sign-in'],
    auth: 'none',
    body: { schema: resetConfirmSchema },
    responses: {
      200: json("The password is changed, the account's sessions ended and its API tokens revoked.", res.okSchema),
      ...errors([400, 413], {
        400: 'Invalid body, a password that is too weak, or an unknown, used or expired token.',
      }),
    },
  },
  {
    method: 'POST',
    path: '/api/auth/unlock',
    operationId: 'unlockAccount',
    summary: 'Unlock an account with the e-mailed unlock link',
    description:
      'The link is e-mailed to the holder when failed passwords lock the account; it works once, and not on a lock set by an administrator.',
    tags: ['sign-in'],
    auth: 'none',
    body: { schema: unlockSchema },
    responses: {
      200: json('The account is unlocked and its count of failed passwords starts again.', res.okSchema),
      ...errors([400, 409, 413], {
        400: 'Invalid body, or an unknown, used or expired link.',
        409: 'An administrator has locked the account since.',
      }),
    },
  },
  {
    method: 'POST',
    path: '/api/auth/sign-in-link',
    operationId: 'requestSignInLink',
    summary: 'Send a single-use sign-in link',
    description: 'Sends a sign-in link if the address has an account; the answer is the same either way.',
    tags: ['sign-in'],
    auth: 'none',
    body: { schema: resetRequestSchema },
    responses: {
      202: json('Accepted (whether or not the address has an account).', res.acceptedSchema),
      ...errors([400, 413]),
    },
  },

  // account
  {
    method: 'GET',
    path: '/api/account',
    operationId: 'getAccount',
    summary: 'Who the caller is',
    tags: ['account'],
    auth: 'session or API token',
    responses: { 200: json('The signed-in user.', res.accountSchema), ...errors([401]) },
  },
  {
    method: 'POST',
    path: '/api/account/password',
    operationId: 'changePassword',
    summary: 'Change the password',
    description: 'From a browser session only: an API token gets 403.',
    tags: ['account'],
    auth: 'session',
    body: { schema: passwordChangeSchema },
    responses: {
      200: json(
        'Changed; the other sessions are ended, and the API tokens revoked when `revokeTokens` asked.',
        res.okSchema,
      ),
      ...errors([400, 401, 403, 413]),
    },
  },
  {
    method: 'GET',
    path: '/api/account/tokens',
    operationId: 'listApiTokens',
    summary: "The caller's API tokens (never their secrets)",
    tags: ['account'],
    auth: 'session or API token',
    responses: {
      200: json('Newest first, revoked and expired ones included.', res.apiTokenListSchema),
      ...errors([401]),
    },
  },
  {
    method: 'POST',
    path: '/api/account/tokens',
    operationId: 'createApiToken',
    summary: 'Create an API token',
    description:
      `From a browser session only: a token cannot create tokens. The secret (\`${API_TOKEN_PREFIX}…\`) is in this response only. ` +
      `A token has a scope (\`read\`: GET and HEAD only, anything else answers 403; \`read-write\`) and expires after \`expiresInDays\` ` +
      `(${API_TOKEN_SETTINGS.defaultDays} unless given, at most ${API_TOKEN_SETTINGS.maxDays}). It is refused while its owner is locked or disabled, ` +
      'and revoked by a password reset.',
    tags: ['account'],
    auth: 'session',
    body: { schema: apiTokenInputSchema },
    responses: { 201: json('The token, with its secret.', res.apiTokenCreatedSchema), ...errors([400, 401, 403, 413]) },
  },
  {
    method: 'DELETE',
    path: '/api/account/tokens/{tokenId}',
    operationId: 'revokeApiToken',
    summary: "Revoke one of the caller's API tokens",
    tags: ['account'],
    auth: 'session or API token',
    params: { tokenId: uuidParam('token') },
    responses: { 200: json('Revoked.', res.okSchema), ...errors([401, 404]) },
  },

  // admin
  {
    method: 'GET',
    path: '/api/admin/users',
    operationId: 'listUsers',
    summary: 'Every account',
    tags: ['admin'],
    auth: 'session or API token',
    description: 'Administrators only.',
    responses: { 200: json('Accounts by name.', res.userListSchema), ...errors([401, 403]) },
  },
  {
    method: 'POST',
    path: '/api/admin/users',
    operationId: 'inviteUser',
    summary: 'Invite a user by e-mail',
    description: 'Administrators only. The account is created and a link to choose a password is sent.',
    tags: ['admin'],
    auth: 'session or API token',
    body: { schema: inviteSchema },
    responses: { 201: json('The new account.', res.createdIdSchema), ...errors([400, 401, 403, 409, 413]) },
  },
  {
    method: 'PATCH',
    path: '/api/admin/users/{userId}',
    operationId: 'changeUser',
    summary: 'Disable, enable, lock or unlock an account, or send it a password-reset link, with a reason',
    description:
      "Administrators only. Accounts are never deleted: signatures must stay readable. An administrator's lock lasts until an administrator unlocks. A reset link is mailed to the account's own address only (at most three in 15 minutes, then 429), never returned.",
    tags: ['admin'],
    auth: 'session or API token',
    params: { userId: uuidParam('user') },
    body: { schema: userChangeSchema },
    responses: { 200: json('Changed and audited.', res.okSchema), ...errors([400, 401, 403, 404, 409, 413, 429]) },
  },

  // projects
  {
    method: 'GET',
    path: '/api/projects',
    operationId: 'listProjects',
    summary: 'Projects the caller is a member of (administrators: all)',
    tags: ['projects'],
    auth: 'session or API token',
    responses: { 200: json("Projects by code, with the caller's roles.", res.projectListSchema), ...errors([401]) },
  },
  {
    method: 'POST',
    path: '/api/projects',
    operationId: 'createProject',
    summary: 'Create a project',
    description: 'Administrators only.',
    tags: ['projects'],
    auth: 'session or API token',
    body: { schema: projectInputSchema },
    responses: { 201: json('The new project.', res.projectCreatedSchema), ...errors([400, 401, 403, 409, 413]) },
  },
  {
    method: 'GET',
    path: '/api/projects/{projectId}',
    operationId: 'getProject',
    summary: "A project, the caller's roles in it and its members",
    description: member,
    tags: ['projects'],
    auth: 'session or API token',
    params: projectParam,
    responses: { 200: json('The project.', res.projectSchema), ...errors([401, 404]) },
  },
  {
    method: 'GET',
    path: '/api/projects/{projectId}/members',
    operationId: 'listMembers',
    summary: 'The members of a project and their roles',
    description: 'Members of the project, and administrators (who give the id, not the code).',
    tags: ['projects'],
    auth: 'session or API token',
    params: projectParam,
    responses: { 200: json('Members by name.', res.memberListSchema), ...errors([401, 404]) },
  },
  {
    method: 'POST',
    path: '/api/projects/{projectId}/members',
    operationId: 'grantRole',
    summary: 'Give a user a role in the project, with a reason',
    description: 'Administrators only.',
    tags: ['projects'],
    auth: 'session or API token',
    params: projectIdParam,
    body: { schema: roleChangeSchema },
    responses: { 201: json('Given and audited.', res.okSchema), ...errors([400, 401, 403, 404, 409, 413]) },
  },
  {
    method: 'DELETE',
    path: '/api/projects/{projectId}/members',
    operationId: 'revokeRole',
    summary: 'Take a role away, with a reason',
    description: 'Administrators only. The body names the user and the role.',
    tags: ['projects'],
    auth: 'session or API token',
    params: projectIdParam,
    body: { schema: roleChangeSchema },
    responses: { 200: json('Taken away and audited.', res.okSchema), ...errors([400, 401, 403, 404, 413]) },
  },
  {
    method: 'GET',
    path: '/api/projects/{projectId}/audit',
    operationId: 'listProjectAudit',
    summary: "The project's audit trail, filtered, as JSON or CSV",
    description: 'Originators, checkers, approvers and document controllers of the project; viewers get 403.',
    tags: ['projects'],
    auth: 'session or API token',
    params: projectParam,
    query: auditQuerySchema,
    responses: {
      200: {
        description: 'Events, newest first; with `format=csv` a CSV download.',
        content: { 'application/json': res.auditEventListSchema, 'text/csv': z.string() },
      },
      ...errors([400, 401, 403, 404]),
    },
  },

  // sheets
  {
    method: 'GET',
    path: '/api/projects/{projectId}/sheets',
    operationId: 'listSheets',
    summary: "The project's register of sheets",
    description: member,
    tags: ['sheets'],
    auth: 'session or API token',
    params: projectParam,
    responses: { 200: json('Sheets by number.', res.sheetRegisterSchema), ...errors([401, 404]) },
  },
  {
    method: 'POST',
    path: '/api/projects/{projectId}/sheets',
    operationId: 'createSheet',
    summary: 'Create a sheet, numbered by the server, with version 1',
    description: 'Originators of the project.',
    tags: ['sheets'],
    auth: 'session or API token',
    params: projectParam,
    body: { schema: createSheetSchema },
    responses: { 201: json('The new sheet.', res.sheetCreatedSchema), ...errors([400, 401, 403, 404, 413]) },
  },
  {
    method: 'POST',
    path: '/api/projects/{projectId}/sheets/import',
    operationId: 'importSheetFile',
    summary: 'Import a sheet file as a new sheet',
    description:
      'Originators of the project. Version 1 is the sheet as created, version 2 holds the file. At most 32 MiB. ' +
      'Attachments the file carries (`contentBase64`) are checked against their size and SHA-256 and stored on the new sheet; a mismatch refuses the whole import (400). ' +
      "Attachments listed without their bytes are not imported (named in the answer). `title` replaces the file's title. The screen shows POST …/import/preview first.",
    tags: ['sheets'],
    auth: 'session or API token',
    params: projectParam,
    query: importQuerySchema,
    body: { schema: sheetFileSchema, description: 'A sheet file, e.g. one from GET /api/sheets/{sheetId}/export.' },
    responses: {
      201: json('The new sheet and the version holding the file.', res.sheetImportedSchema),
      ...errors([400, 401, 403, 404, 413]),
    },
  },
  {
    method: 'GET',
    path: '/api/projects/{projectId}/sheets/start-from',
    operationId: 'listStartCandidates',
    summary: 'What a new sheet can be started from',
    description:
      'Originators of the project. Starter sheets (their latest version) and the newest approved version of each sheet, in every project the caller is a member of; void sheets are left out.',
    tags: ['sheets'],
    auth: 'session or API token',
    params: projectParam,
    responses: {
      200: json('Starters first, then approved versions.', res.startCandidatesSchema),
      ...errors([401, 403, 404]),
    },
  },
  {
    method: 'POST',
    path: '/api/projects/{projectId}/sheets/start-from',
    operationId: 'startSheetFrom',
    summary: 'Start a new sheet from an approved version or a starter',
    description:
      'Originators of the project. Version 2 of the new sheet copies the content of the given version (cells, record, settings, the attachments it cites) under the new title; ' +
      "the sheet records the exact version it was started from, for ever. 404 when the caller is not a member of the source's project or the version does not exist; " +
      "409 when the source is void, or the version is neither approved nor the latest version of a starter. The new sheet is a draft: nothing of the source's checks carries over.",
    tags: ['sheets'],
    auth: 'session or API token',
    params: projectParam,
    body: { schema: startFromSchema },
    responses: {
      201: json('The new sheet and the version holding the copy.', res.sheetStartedSchema),
      ...errors([400, 401, 403, 404, 409, 413]),
    },
  },
  {
    method: 'POST',
    path: '/api/projects/{projectId}/sheets/import/preview',
    operationId: 'previewSheetFileImport',
    summary: 'Check a sheet file and say what importing it would create, creating nothing',
    description:
      'Originators of the project. The same checks as the import (attachments against their SHA-256); the confirmation before an import.',
    tags: ['sheets'],
    auth: 'session or API token',
    params: projectParam,
    body: { schema: sheetFileSchema, description: 'A sheet file.' },
    responses: {
      200: json('What the import would create.', res.importPreviewSchema),
      ...errors([400, 401, 403, 404, 413]),
    },
  },
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}',
    operationId: 'getSheet',
    summary: 'A sheet with its latest version',
    description: member,
    tags: ['sheets'],
    auth: 'session or API token',
    params: sheetParam,
    responses: {
      200: json('The sheet, and its latest version with content, results and hash.', res.sheetWithVersionSchema),
      ...errors([401, 404]),
    },
  },
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}/versions',
    operationId: 'listVersions',
    summary: 'The versions of a sheet',
    description: member,
    tags: ['sheets'],
    auth: 'session or API token',
    params: sheetParam,
    responses: { 200: json('Newest first.', res.versionListSchema), ...errors([401, 404]) },
  },
  {
    method: 'POST',
    path: '/api/sheets/{sheetId}/versions',
    operationId: 'saveVersion',
    summary: 'Save a new version',
    description:
      'Originators of the project. The content is evaluated by the server and stored with its SHA-256 (RFC 8785 canonical form) and results. ' +
      'Refused with 409 when `parentNumber` is not the latest version; `details` then holds `latestNumber` and `latestSha256`. At most 4 MiB.',
    tags: ['sheets'],
    auth: 'session or API token',
    params: sheetParam,
    body: { schema: saveVersionSchema },
    responses: { 201: json('The new version.', res.versionSavedSchema), ...errors([400, 401, 403, 404, 409, 413]) },
  },
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}/versions/{number}',
    operationId: 'getVersion',
    summary: 'One version, with the results recorded when it was saved',
    description: member,
    tags: ['sheets'],
    auth: 'session or API token',
    params: {
      ...sheetParam,
      number: { description: 'The version number, from 1.', schema: PATH_PARAMS.number.schema },
    },
    responses: { 200: json('The version.', z.object({ version: res.versionSchema })), ...errors([401, 404]) },
  },
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}/versions/{number}/studies/{cellIndex}/{line}',
    operationId: 'downloadStudyTable',
    summary: 'Download the table of a sweep recorded in a version, as CSV',
    description:
      `${member} The sweep on line \`line\` of the cell whose result has index \`cellIndex\` (\`results.cells[].index\`, from 0). ` +
      'RFC 4180 CSV with CRLF line ends: a header `name [unit]` per column (the form data-table attachments use), then one row per step with every number at full double precision; ' +
      'when a step failed its values are empty and a last column `error` says why. The file is named `<sheet number>-v<n>-cell<cell number from 1>-line<line>.csv`.',
    tags: ['sheets'],
    auth: 'session or API token',
    params: {
      ...sheetParam,
      number: { description: 'The version number, from 1.', schema: PATH_PARAMS.number.schema },
      cellIndex: {
        description: 'The index of the cell in the version (`results.cells[].index`), from 0.',
        schema: PATH_PARAMS.cellIndex.schema,
      },
      line: {
        description: 'The line of the `sweep(…)` statement in the cell, from 1.',
        schema: PATH_PARAMS.line.schema,
      },
    },
    responses: {
      200: {
        description: 'The table as a download (`content-disposition: attachment`).',
        content: { 'text/csv': 'binary' },
      },
      ...errors([401, 404], {
        404: 'No such sheet, version, cell or line, a statement that is not a sweep, or a project the caller is not a member of.',
      }),
    },
  },
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}/compare',
    operationId: 'compareVersions',
    summary: 'Compare any two versions: cells, results, calculation record, attachments',
    description:
      `${member} Any two versions (\`base\` may be later than \`target\`); without \`base\`, the whole target version as a first check. ` +
      'Besides cells and results: the calculation record (objective, method, conclusions, references, design inputs with their source revisions, ' +
      'assumptions and their verification marks), the significant figures, the safety flag, and the attachments added, removed and replaced ' +
      '(name, size, SHA-256; a row/column diff of CSV tables). The check view uses the same comparison.',
    tags: ['sheets'],
    auth: 'session or API token',
    params: sheetParam,
    query: compareQuerySchema,
    responses: { 200: json('The comparison.', res.comparisonSchema), ...errors([400, 401, 404]) },
  },
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}/impact',
    operationId: 'sheetImpact',
    summary: "What depends on the sheet's revisions, and its own superseded inputs",
    description:
      `${member} For each issued revision of the sheet, the sheets whose versions cite it (\`fromRevision\`), then those citing revisions issued from ` +
      'those versions, and so on, each with its depth and whether its latest version still cites a superseded revision. `supersededInputs` lists ' +
      "the revisions the sheet's latest version cites that are no longer current, with the cited values then and now.",
    tags: ['sheets'],
    auth: 'session or API token',
    params: sheetParam,
    responses: { 200: json('The impact.', res.sheetImpactSchema), ...errors([401, 404]) },
  },
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}/export',
    operationId: 'exportSheetFile',
    summary: 'Download a version as a sheet file',
    description: `${member} The latest version, or \`version\`. The command-line evaluator and the import read this file. With \`attachments=include\` it carries each attachment's bytes (413 when the file would exceed what an import reads).`,
    tags: ['sheets'],
    auth: 'session or API token',
    params: sheetParam,
    query: exportQuerySchema,
    responses: {
      200: {
        description: 'The sheet file, as a download (`content-disposition: attachment`).',
        content: { 'application/json': res.exportedSheetFileSchema },
      },
      ...errors([400, 401, 404, 413, 503]),
    },
  },
  {
    method: 'POST',
    path: '/api/sheets/{sheetId}/void',
    operationId: 'voidSheet',
    summary: 'Void a sheet never issued, with a reason',
    description:
      'The originator who created the sheet, or a document controller of the project. The sheet stays in the register as void, with its versions; ' +
      'it takes no new version, check or revision. 409 when the sheet has an issued revision, a check in progress (in check, or checked and awaiting approval), or is already void.',
    tags: ['sheets'],
    auth: 'session or API token',
    params: sheetParam,
    body: { schema: voidSheetSchema },
    responses: { 200: json('Voided.', res.sheetVoidedSchema), ...errors([400, 401, 403, 404, 409]) },
  },

  // attachments
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}/attachments',
    operationId: 'listAttachments',
    summary: 'The files attached to a sheet',
    description: member,
    tags: ['attachments'],
    auth: 'session or API token',
    params: sheetParam,
    responses: { 200: json('The attachments.', res.attachmentListSchema), ...errors([401, 404]) },
  },
  {
    method: 'POST',
    path: '/api/sheets/{sheetId}/attachments',
    operationId: 'uploadAttachment',
    summary: 'Upload a file to attach to a sheet',
    description:
      'Originators of the project. Accepted: PDF documents (up to 20 MiB), PNG or JPEG images (up to 10 MiB) and CSV tables (up to 2 MiB), ' +
      'recognised by their content; the name and the declared type must agree with it. The file is stored by its SHA-256; the next version ' +
      'cites it by the returned reference in `content.attachments`. A CSV file is read as a table of numbers that cells can use.',
    tags: ['attachments'],
    auth: 'session or API token',
    params: sheetParam,
    body: {
      schema: res.attachmentUploadFormSchema,
      contentType: 'multipart/form-data',
      description: 'One part named `file`.',
    },
    responses: {
      201: json("The stored file's reference, and the table read from a CSV file.", attachmentSchema),
      ...errors([400, 401, 403, 404, 413, 415], {
        400: 'Not multipart, no `file` part, an empty file, or a CSV file that is not a table of numbers (the message says where).',
        413: 'The file is larger than allowed.',
        415: 'A media type that is not accepted, or content that does not match its declared type.',
      }),
    },
  },
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}/attachments/{sha256}',
    operationId: 'downloadAttachment',
    summary: 'Download an attached file',
    description: member,
    tags: ['attachments'],
    auth: 'session or API token',
    params: {
      ...sheetParam,
      sha256: {
        description: 'The SHA-256 of the file, lowercase hexadecimal.',
        schema: z.string().regex(/^[0-9a-f]{64}$/),
      },
    },
    responses: {
      200: {
        description:
          "The file's bytes, checked against their SHA-256, always as a download (`content-disposition: attachment`).",
        content: { 'application/pdf': 'binary', 'image/png': 'binary', 'image/jpeg': 'binary', 'text/csv': 'binary' },
      },
      ...errors([401, 404, 503], {
        503: 'The stored file is missing or no longer matches its SHA-256; it is not served.',
      }),
    },
  },

  // checks
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}/checks',
    operationId: 'sheetWorkflow',
    summary: 'Where a sheet stands: its checks, signatures and eligible checkers',
    description: member,
    tags: ['checks'],
    auth: 'session or API token',
    params: sheetParam,
    responses: {
      200: json("The sheet's status, checks and signatures.", res.sheetWorkflowSchema),
      ...errors([401, 404]),
    },
  },
  {
    method: 'POST',
    path: '/api/sheets/{sheetId}/checks',
    operationId: 'submitForCheck',
    summary: 'Submit one version for check by a named checker',
    description:
      'Originators of the project. Signs the version "prepared": the password is asked again (21 CFR Part 11 §11.200). The checker must hold ' +
      'the checker role, must not have saved any version since the last approved one, later ones included (ASME NQA-1 Requirement 3 §500), and ' +
      'must not be the submitter or anyone who submitted this version before; a refusal names the rule in `details.rule` and is audited. ' +
      "One open check per sheet. When the sheet's latest earlier check was returned, its verification method, notes, alternate calculation and tolerance " +
      'are carried over to the new check, marked as from that check until the checker edits or confirms them (audited `check.carry_over`). ' +
      'A version with any cell error, failed design criterion, engine (lint) warning, or design input whose value does not match the cell it names is refused (400, ' +
      "`details.acknowledgementsNeeded`: each item's key, kind, cell and message) until `acknowledgements` gives written text for each key; they are stored with the check, " +
      'audited with `check.submit`, never changed, and shown to the checker, the approver and in the issued PDF.',
    tags: ['checks'],
    auth: 'session or API token',
    params: sheetParam,
    body: { schema: submitSchema },
    responses: {
      201: json('The check.', res.submittedCheckSchema),
      ...errors([400, 401, 403, 404, 409], {
        403: 'Not an originator, an ineligible checker (`details.rule`), or a wrong password.',
        409: 'A check of this sheet is already open, or the version is older than the last approved one.',
      }),
    },
  },
  {
    method: 'GET',
    path: '/api/checks',
    operationId: 'checkQueue',
    summary: 'My checks, or my approvals',
    description:
      'Any signed-in user: `queue=check` lists the open checks naming the caller as checker; `queue=approval` the checked versions awaiting approval in projects where the caller is an approver, each saying whether the caller may approve it.',
    tags: ['checks'],
    auth: 'session or API token',
    query: queueQuerySchema,
    responses: { 200: json('The queue.', res.checkQueueSchema), ...errors([400, 401]) },
  },
  {
    method: 'GET',
    path: '/api/checks/{checkId}',
    operationId: 'getCheck',
    summary:
      'A check: the version against the last approved one (and, for a re-check, against the version returned), comments, signatures',
    description: member,
    tags: ['checks'],
    auth: 'session or API token',
    params: { checkId: uuidParam('check') },
    responses: { 200: json('The check.', res.checkDetailSchema), ...errors([401, 404]) },
  },
  {
    method: 'PATCH',
    path: '/api/checks/{checkId}',
    operationId: 'saveCheckWork',
    summary:
      "Record the checker's work: verification method, notes, alternate calculation, tolerance; confirm work carried over",
    description:
      'The checker named on the check, while it is in check. Alternate calculation cells are evaluated by the server. `tolerance` is relative ("1e-6", "0.1 %", "5 ppm"; ' +
      'greater than 0, at most 10 %; null clears it). `confirmCarriedOver: true` confirms the work carried over from the returned check of an earlier version ' +
      '(409 when there is none); a field saved with a different value is no longer marked as carried over. Audited (`check.work`) with the old and new values.',
    tags: ['checks'],
    auth: 'session or API token',
    params: { checkId: uuidParam('check') },
    body: { schema: checkWorkSchema },
    responses: {
      200: json("Saved; the alternate calculation's results.", res.checkWorkResultSchema),
      ...errors([400, 401, 403, 404, 409]),
    },
  },
  {
    method: 'POST',
    path: '/api/checks/{checkId}/comments',
    operationId: 'addCheckComment',
    summary: 'Comment on a cell, or answer a comment thread',
    description:
      'The checker opens threads anchored to a cell (and optionally a statement line); only the people of the check (its submitter, checker and approver) answer them; any other member gets 403. While in check, or on a returned check until the sheet is submitted again.',
    tags: ['checks'],
    auth: 'session or API token',
    params: { checkId: uuidParam('check') },
    body: { schema: commentSchema },
    responses: { 201: json('The comment.', res.createdIdSchema), ...errors([400, 401, 403, 404, 409]) },
  },
  {
    method: 'PATCH',
    path: '/api/checks/{checkId}/comments/{commentId}',
    operationId: 'resolveCheckComment',
    summary: 'Resolve a comment thread',
    description: 'The checker named on the check, while in check. A thread is resolved once and stays resolved.',
    tags: ['checks'],
    auth: 'session or API token',
    params: { checkId: uuidParam('check'), commentId: uuidParam("thread's first comment") },
    body: { schema: resolveSchema },
    responses: { 200: json('Resolved.', res.okSchema), ...errors([400, 401, 403, 404, 409]) },
  },
  {
    method: 'POST',
    path: '/api/checks/{checkId}/decision',
    operationId: 'decideCheck',
    summary: 'Return, sign as checked, approve, or return from approval',
    description:
      '`return` and `sign` by the checker named on the check while in check; `sign` needs every thread resolved, a verification method, a tolerance ' +
      'when the alternate calculation shares a name with the sheet (400), the work carried over from a returned check confirmed (409 with ' +
      '`details.carriedOver`) and the password. `approve` (password) and `reject` by an approver who saved no version since the last approved one (later ones included), did not ' +
      'submit the version and, when the version under check records itself as safety-related, is not its checker. The rules are applied again at ' +
      "every decision. Each signature is bound to the version's SHA-256. An illegal transition is 409 with `details.state`.",
    tags: ['checks'],
    auth: 'session or API token',
    params: { checkId: uuidParam('check') },
    body: { schema: decisionSchema },
    responses: {
      200: json('The new state.', res.decisionResultSchema),
      ...errors([400, 401, 403, 404, 409], {
        403: 'Not the checker or an eligible approver (`details.rule`), or a wrong password.',
        409: 'Not possible in the current state (`details.state`), or open comment threads.',
      }),
    },
  },

  // revisions
  {
    method: 'GET',
    path: '/api/sheets/{sheetId}/revisions',
    operationId: 'listSheetRevisions',
    summary: 'The issued revisions of a sheet',
    description: member,
    tags: ['revisions'],
    auth: 'session or API token',
    params: sheetParam,
    responses: { 200: json('Newest first.', res.sheetRevisionsSchema), ...errors([401, 404]) },
  },
  {
    method: 'POST',
    path: '/api/sheets/{sheetId}/revisions',
    operationId: 'issueRevision',
    summary: 'Issue an approved version as the next revision',
    description:
      'Document controllers. Signs "issued" (password asked again), then a job renders the PDF, signs it with the organisation\'s certificate ' +
      '(PAdES, ETSI.CAdES.detached), stores it and records the revision, superseding the previous one, all or nothing. Follow the job at ' +
      '`/api/issuing/{jobId}`.',
    tags: ['revisions'],
    auth: 'session or API token',
    params: sheetParam,
    body: { schema: issueRequestSchema },
    responses: {
      202: json('Accepted: the job that issues it.', res.issueAcceptedSchema),
      ...errors([400, 401, 403, 404, 409], {
        409: 'The version is not approved, is already issued, or another issue of this sheet is in progress.',
      }),
    },
  },
  {
    method: 'GET',
    path: '/api/issuing/{jobId}',
    operationId: 'issueJob',
    summary: 'Progress of an issue request',
    description: member,
    tags: ['revisions'],
    auth: 'session or API token',
    params: { jobId: uuidParam('issue request') },
    responses: { 200: json('Its state and step; the revision once done.', res.issueJobSchema), ...errors([401, 404]) },
  },
  {
    method: 'GET',
    path: '/api/projects/{projectId}/register',
    operationId: 'projectRegister',
    summary: 'The document register of a project',
    description: `${member} \`format=csv\` answers a CSV file.`,
    tags: ['revisions'],
    auth: 'session or API token',
    params: projectParam,
    query: registerQuerySchema,
    responses: {
      200: {
        description: 'Every issued revision with its status.',
        content: { 'application/json': res.registerSchema, 'text/csv': 'binary' },
      },
      ...errors([400, 401, 404]),
    },
  },
  {
    method: 'GET',
    path: '/api/revisions/{revisionId}/pdf',
    operationId: 'downloadRevision',
    summary: 'Download the signed PDF of a revision',
    description: `${member} A superseded or withdrawn revision comes as a copy stamped with its status (an incremental update of the issued file, signed by document control; the issued signature stays valid); \`original=1\` (document controllers) gives the original file, byte for byte.`,
    tags: ['revisions'],
    auth: 'session or API token',
    params: { revisionId: uuidParam('revision') },
    query: downloadQuerySchema,
    responses: {
      200: { description: 'The PDF.', content: { 'application/pdf': 'binary' } },
      ...errors([400, 401, 403, 404, 503]),
    },
  },
  {
    method: 'POST',
    path: '/api/revisions/{revisionId}/withdraw',
    operationId: 'withdrawRevision',
    summary: 'Withdraw a revision, with a reason',
    description: 'Document controllers of the project.',
    tags: ['revisions'],
    auth: 'session or API token',
    params: { revisionId: uuidParam('revision') },
    body: { schema: withdrawSchema },
    responses: { 200: json('Withdrawn.', res.withdrawnSchema), ...errors([400, 401, 403, 404, 409]) },
  },
  {
    method: 'POST',
    path: '/api/verify',
    operationId: 'verify',
    summary: 'Is this PDF, or this verification code, an authentic issued revision?',
    description:
      'Anyone, signed in or not. Send the PDF as multipart/form-data (field `file`, at most 30 MiB) or a verification code as JSON. The answer says ' +
      "whether the file's SHA-256 is in the register and its embedded signature verifies with the organisation's certificate, which revision it is, " +
      'and whether it is current, superseded or withdrawn. A stamped copy of a superseded or withdrawn revision (the issued file, byte for byte, ' +
      'then an incremental update signed by document control over the whole file) is answered as authentic with `checks.stampedCopy` true ' +
      "when the prefix is a registered original and both signatures verify with the organisation's certificate. " +
      'A file that is not a PDF, or one never issued, gets an answer, not an error. ' +
      'A file whose signature container is larger than 64 KiB of DER or holds more than 4,096 ASN.1 elements is not read: 413 (an issued ' +
      "revision's signature is a few KiB). Each client address may verify 30 times a minute (`WORLDSHEET_VERIFY_RATE_PER_MINUTE`): 429 beyond.",
    tags: ['revisions'],
    auth: 'none',
    body: { schema: verifyCodeSchema, description: 'Or multipart/form-data with a `file` part.' },
    responses: {
      200: json('The answer.', res.verificationSchema),
      ...errors([400, 413, 429], {
        413: 'The file is larger than 30 MiB, or its signature container is too large or too complex to read: not an authentic issued revision.',
        429: 'This address has verified too often in the last minute; `Retry-After` says when to try again.',
      }),
    },
  },

  {
    method: 'GET',
    path: '/api/software-impact',
    operationId: 'softwareImpact',
    summary:
      'Versions and revisions evaluated with an engine version or constants edition (software problem reporting)',
    description:
      'Any signed-in user; only projects the caller is a member of (administrators: all). Lists every version evaluated with `engineVersion` ' +
      'and/or `constantsEdition`, optionally only those whose calculation cells call `function`, with the revision issued from it; the distinct ' +
      'engine versions and constants editions come with counts to pick from. Without any filter, `rows` is null. `format=csv` answers a CSV file. ' +
      'ASME NQA-1 Part II, Subpart 2.7 (software problem reporting).',
    tags: ['calculation'],
    auth: 'session or API token',
    query: softwareImpactQuerySchema,
    responses: {
      200: {
        description: 'The matching versions, with counts.',
        content: { 'application/json': res.softwareImpactSchema, 'text/csv': 'binary' },
      },
      ...errors([400, 401]),
    },
  },

  // calculation
  {
    method: 'POST',
    path: '/api/evaluate',
    operationId: 'evaluate',
    summary: "Evaluate cells with the server's engine",
    description:
      'Any signed-in user. Cells are evaluated in order in a sandboxed worker with a time and a memory limit. `sheetKey` sends a sheet to the same ' +
      'worker each time, so its cache makes re-evaluation incremental. `attachments` (with `sheetId`) names CSV attachments of that sheet to use ' +
      "as input tables; `fromRevision(…)` citations resolve to issued revisions of that sheet's project (without `sheetId`, to an error); " +
      'the caller must be a member of its project, and results are cached per project only. At most 2 MiB of body, 20,000 statements and ' +
      '32 MiB of results per request (413 beyond, saying what to reduce). The workers are shared fairly: each caller may have two ' +
      'evaluations in progress (429 with `Retry-After` beyond); a cell that hit the time limit is not run again after the same cells above it.',
    tags: ['calculation'],
    auth: 'session or API token',
    body: { schema: evaluateRequestSchema },
    responses: {
      200: json('Per-cell, per-statement results.', res.sheetResultSchema),
      ...errors([400, 401, 404, 413, 429], {
        404: 'No such sheet, or one of a project the caller is not a member of (with `sheetId`).',
        413: 'The body, its statements or its results are larger than one request may be; the message says what to reduce.',
        429: 'The caller has two evaluations in progress already, or the server is evaluating many sheets; `Retry-After` says when to try again.',
      }),
    },
  },
];

const TAGS: { name: Tag; description: string }[] = [
  { name: 'meta', description: 'Health and this document.' },
  { name: 'sign-in', description: 'Signing in and recovering an account.' },
  { name: 'account', description: "The caller's own account and API tokens." },
  { name: 'admin', description: 'Accounts, for administrators.' },
  { name: 'projects', description: 'Projects, roles and the audit trail.' },
  { name: 'sheets', description: 'Calculation sheets and their immutable versions.' },
  { name: 'attachments', description: 'Files attached to sheets.' },
  { name: 'checks', description: 'Independent check, approval and electronic signatures.' },
  { name: 'revisions', description: 'Issued revisions, their signed PDFs, the register and verification.' },
  { name: 'calculation', description: 'The calculation engine.' },
];

const SECURITY: Record<Auth, Record<string, string[]>[]> = {
  none: [],
  'session or API token': [{ sessionCookie: [] }, { apiToken: [] }],
  session: [{ sessionCookie: [] }],
};

/** Schemas shown once under components and referred to by `$ref` where a body is exactly one of them. */
const COMPONENTS: Record<string, ZodType> = { Error: errorBodySchema };

/**
 * JSON Schema 2020-12 of a zod schema, as the request (`input`) or the response (`output`) side sees
 * it. Response objects stay open (no `additionalProperties: false`): a field added to an answer later
 * must not break a client that validates answers.
 */
function jsonSchemaOf(schema: ZodType, io: 'input' | 'output'): Record<string, unknown> {
  const { $schema: _dialect, ...rest } = z.toJSONSchema(schema, {
    target: 'draft-2020-12',
    io,
    override: ({ jsonSchema }) => {
      if (io === 'output' && jsonSchema.additionalProperties === false) delete jsonSchema.additionalProperties;
    },
  });
  return rest;
}

function schemaOrRef(body: BodySchema, io: 'input' | 'output', mediaType: string): Record<string, unknown> {
  // Raw bytes as OpenAPI 3.1 describes them ("Considerations for File Uploads"): a string with its media type.
  if (body === 'binary') return { type: 'string', contentMediaType: mediaType };
  const name = Object.keys(COMPONENTS).find((k) => COMPONENTS[k] === body);
  return name ? { $ref: `#/components/schemas/${name}` } : jsonSchemaOf(body, io);
}

function parametersOf(op: Operation): Record<string, unknown>[] {
  const out: Record<string, unknown>[] = [];
  for (const [name, p] of Object.entries(op.params ?? {})) {
    out.push({ name, in: 'path', required: true, description: p.description, schema: jsonSchemaOf(p.schema, 'input') });
  }
  if (op.query) {
    const query = jsonSchemaOf(op.query, 'input') as {
      properties?: Record<string, Record<string, unknown>>;
      required?: string[];
    };
    for (const [name, schema] of Object.entries(query.properties ?? {})) {
      const { description, ...rest } = schema;
      out.push({
        name,
        in: 'query',
        required: (query.required ?? []).includes(name),
        ...(description ? { description } : {}),
        schema: rest,
      });
    }
  }
  return out;
}

function operationObject(op: Operation): Record<string, unknown> {
  const parameters = parametersOf(op);
  return {
    operationId: op.operationId,
    summary: op.summary,
    ...(op.description ? { description: op.description } : {}),
    tags: op.tags,
    security: SECURITY[op.auth],
    ...(parameters.length ? { parameters } : {}),
    ...(op.body
      ? {
          requestBody: {
            required: true,
            ...(op.body.description ? { description: op.body.description } : {}),
            content: {
              [op.body.contentType ?? 'application/json']: {
                schema: schemaOrRef(op.body.schema, 'input', op.body.contentType ?? 'application/json'),
              },
            },
          },
        }
      : {}),
    responses: Object.fromEntries(
      Object.entries(op.responses).map(([status, r]) => [
        status,
        {
          description: r.description,
          ...(r.content
            ? {
                content: Object.fromEntries(
                  Object.entries(r.content).map(([type, body]) => [
                    type,
                    { schema: schemaOrRef(body, 'output', type) },
                  ]),
                ),
              }
            : {}),
        },
      ]),
    ),
  };
}

/** The OpenAPI 3.1 document of every route in OPERATIONS. */
export function buildOpenApiDocument(): Record<string, unknown> {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const op of OPERATIONS) {
    paths[op.path] ??= {};
    paths[op.path][op.method.toLowerCase()] = operationObject(op);
  }
  return {
    openapi: '3.1.0',
    jsonSchemaDialect: 'https://json-schema.org/draft/2020-12/schema',
    info: {
      title: 'Worldsheet API',
      version: APP_VERSION,
      description:
        'Unit-aware relativistic calculation sheets with independent check and approval. Every write in the app goes through these routes; ' +
        `scripts use an API token (\`Authorization: Bearer ${API_TOKEN_PREFIX}…\`), acting with its owner's roles. ` +
        'A read-only token may only make GET and HEAD requests (403 otherwise). A change made with the browser session (the cookie) must come from the ' +
        "app's own pages: an `Origin` header equal to the app's address, or `Sec-Fetch-Site: same-origin` (403 otherwise), and a JSON body " +
        '(multipart/form-data where a file is sent; 415 otherwise). Bodies are read with a byte limit: 413 as soon as it is passed. ' +
        `Errors answer with one body: {"error": {"code", "message", "details"}}. Calculation engine: ${ENGINE_VERSION}.`,
    },
    servers: [{ url: '/' }],
    tags: TAGS,
    paths,
    components: {
      schemas: Object.fromEntries(
        Object.entries(COMPONENTS).map(([name, schema]) => [name, jsonSchemaOf(schema, 'output')]),
      ),
      securitySchemes: {
        sessionCookie: {
          type: 'apiKey',
          in: 'cookie',
          name: 'next-auth.session-token',
          description:
            'The browser session set by signing in (`__Host-next-auth.session-token`, Secure, when served over HTTPS). Ends after idle time, 12 hours or sign-out.',
        },
        apiToken: {
          type: 'http',
          scheme: 'bearer',
          bearerFormat: `${API_TOKEN_PREFIX}…`,
          description:
            "An API token made on the account page, acting with its owner's roles. It cannot create tokens or change the password.",
        },
      },
    },
  };
}
