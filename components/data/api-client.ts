// The one typed client of the app's own routes, for client components. Each function sends what its
// route handler parses, typed from the handler's own zod schema (type imports only: those modules reach
// the database), and parses the answer with the response schema the OpenAPI document shows
// (lib/http/openapi-schemas.ts, a module with no server imports). Every failure is one ApiError whose
// message is the server's error message (the error body of lib/errors/app-error.ts), "The server
// answered N." when the body has none, or says that no answer arrived.
// The request guard (lib/http/route.ts) needs nothing more than a browser sends by itself for a
// same-origin fetch (Origin, Sec-Fetch-Site) and a JSON (or multipart) content type, which send() sets.
import '@/components/data/zod-in-browser';
import { z, type ZodType } from 'zod';
import { attachmentSchema } from '@/lib/attachments/attachment-schema';
import { errorBodySchema } from '@/lib/errors/app-error';
import * as res from '@/lib/http/openapi-schemas';
import type { apiTokenInputSchema } from '@/lib/auth/api-tokens';
import type { evaluateRequestSchema } from '@/lib/calc/evaluate-request';
import type { SheetResult } from '@/lib/calc/types';
import type {
  checkWorkSchema,
  commentSchema,
  decisionSchema,
  resolveSchema,
  submitSchema,
} from '@/lib/checks/workflow';
import type { issueRequestSchema } from '@/lib/issue/request';
import type { saveVersionSchema } from '@/lib/sheets/sheets';
import type { importQuerySchema } from '@/lib/sheets/sheet-files';
import type { startFromSchema } from '@/lib/sheets/start-from';

const UNREACHABLE = 'The server could not be reached.';

/** Any failed call: the server's refusal (status, code, message, details), no answer (status null), or an answer not as documented. */
export class ApiError extends Error {
  override readonly name = 'ApiError';
  constructor(
    /** The HTTP status; null when no answer arrived. */
    readonly status: number | null,
    /** The error body's code; `unreachable` without an answer, `unexpected_answer` for a body not as documented. */
    readonly code: string,
    message: string,
    /** The error body's details (for 400 the first validation issues, for 409 what the request conflicts with). */
    readonly details?: unknown,
    /** Retry-After, in seconds, of a 429 or 503. */
    readonly retryAfterSeconds?: number,
    options?: ErrorOptions,
  ) {
    super(message, options);
  }
}

/** What a form shows for a failed call; `unreachable` words the case of no answer for that form. */
export function errorText(error: unknown, unreachable = UNREACHABLE): string {
  if (error instanceof ApiError) return error.status === null ? unreachable : error.message;
  return unreachable;
}

/** One field of an error's details, when the details are an object. */
export function detail(error: ApiError, key: string): unknown {
  const d = error.details;
  return d !== null && typeof d === 'object' ? (d as Record<string, unknown>)[key] : undefined;
}

export type HttpMethod = 'GET' | 'POST' | 'PATCH' | 'DELETE';

/** A request body: a value sent as JSON, JSON text sent as it is, or a multipart form (a file). */
type RequestBody = { json: unknown } | { jsonText: string } | { form: FormData };

interface CallOptions {
  body?: RequestBody;
  /** The one success status the route answers; any other 2xx is an error too. Default: any 2xx. */
  status?: number;
}

const seg = (value: string | number) => encodeURIComponent(String(value));

// The error body of lib/errors/app-error.ts, read leniently: any code is taken, so that the message of
// an error the server words is shown whatever its code.
const errorAnswerSchema = z.object({
  error: errorBodySchema.shape.error.extend({ code: z.string().catch('http_error') }),
});

/** Sends one request and parses the answer with `schema`; throws ApiError on any failure. */
async function call<S extends ZodType>(
  method: HttpMethod,
  url: string,
  schema: S,
  options: CallOptions = {},
): Promise<z.infer<S>> {
  const init: RequestInit = { method };
  const body = options.body;
  if (body && 'json' in body) {
    init.headers = { 'content-type': 'application/json' };
    init.body = JSON.stringify(body.json);
  } else if (body && 'jsonText' in body) {
    init.headers = { 'content-type': 'application/json' };
    init.body = body.jsonText;
  } else if (body) {
    init.body = body.form; // the browser writes the multipart content type with its boundary
  }
  let response: Response;
  try {
    response = await fetch(url, init);
  } catch (cause) {
    throw new ApiError(null, 'unreachable', UNREACHABLE, undefined, undefined, { cause });
  }
  const answer: unknown = await response.json().catch(() => undefined);
  const expected = options.status === undefined ? response.ok : response.status === options.status;
  if (!expected) {
    const error = errorAnswerSchema.safeParse(answer);
    const retryAfter = Number(response.headers.get('retry-after'));
    throw new ApiError(
      response.status,
      error.success ? error.data.error.code : 'http_error',
      error.success ? error.data.error.message : `The server answered ${response.status}.`,
      error.success ? error.data.error.details : undefined,
      Number.isFinite(retryAfter) && retryAfter > 0 ? retryAfter : undefined,
    );
  }
  const parsed = schema.safeParse(answer);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new ApiError(
      response.status,
      'unexpected_answer',
      `The server answered ${response.status}, but not as this page expected (${issue?.path.join('.') || 'body'}: ${issue?.message}); reload the page to see where things stand.`,
      parsed.error.issues.slice(0, 10),
    );
  }
  return parsed.data;
}

type In<S extends ZodType> = z.input<S>;
// A JSON form's answer: any object; a body that is none (or not JSON) counts as {} as it always has.
const anyObject = z.looseObject({}).catch({});

/** Every route a client component calls, one function each. */
export const api = {
  // account
  listApiTokens: () => call('GET', '/api/account/tokens', res.apiTokenListSchema),
  createApiToken: (body: In<typeof apiTokenInputSchema>) =>
    call('POST', '/api/account/tokens', res.apiTokenCreatedSchema, { body: { json: body } }),
  revokeApiToken: (tokenId: string) => call('DELETE', `/api/account/tokens/${seg(tokenId)}`, res.okSchema),

  // admin
  listUsers: () => call('GET', '/api/admin/users', res.userListSchema),
  listProjects: () => call('GET', '/api/projects', res.projectListSchema),
  listMembers: (projectId: string) => call('GET', `/api/projects/${seg(projectId)}/members`, res.memberListSchema),

  // sheets
  saveVersion: (sheetId: string, body: In<typeof saveVersionSchema>) =>
    call('POST', `/api/sheets/${seg(sheetId)}/versions`, res.versionSavedSchema, { body: { json: body } }),
  previewImport: (projectId: string, sheetFileText: string) =>
    call('POST', `/api/projects/${seg(projectId)}/sheets/import/preview`, res.importPreviewSchema, {
      body: { jsonText: sheetFileText },
    }),
  importSheet: (projectId: string, sheetFileText: string, query: In<typeof importQuerySchema>) =>
    call(
      'POST',
      `/api/projects/${seg(projectId)}/sheets/import?${new URLSearchParams(query.title === undefined ? {} : { title: query.title })}`,
      res.sheetImportedSchema,
      { body: { jsonText: sheetFileText } },
    ),
  startFrom: (projectId: string, body: In<typeof startFromSchema>) =>
    call('POST', `/api/projects/${seg(projectId)}/sheets/start-from`, res.sheetStartedSchema, {
      body: { json: body },
    }),

  // attachments
  listAttachments: (sheetId: string) =>
    call('GET', `/api/sheets/${seg(sheetId)}/attachments`, res.attachmentListSchema),
  uploadAttachment: (sheetId: string, file: File) => {
    const form = new FormData();
    form.append('file', file);
    return call('POST', `/api/sheets/${seg(sheetId)}/attachments`, attachmentSchema, { body: { form } });
  },

  // checks
  submitForCheck: (sheetId: string, body: In<typeof submitSchema>) =>
    call('POST', `/api/sheets/${seg(sheetId)}/checks`, res.submittedCheckSchema, { body: { json: body } }),
  saveCheckWork: async (
    checkId: string,
    body: In<typeof checkWorkSchema>,
  ): Promise<{ ok: true; alternateResults: SheetResult | null }> => {
    const answer = await call('PATCH', `/api/checks/${seg(checkId)}`, res.checkWorkResultSchema, {
      body: { json: body },
    });
    // The schema checks the results' presence; their shape is the engine's SheetResult (lib/calc/types.ts).
    return answer as { ok: true; alternateResults: SheetResult | null };
  },
  addComment: (checkId: string, body: In<typeof commentSchema>) =>
    call('POST', `/api/checks/${seg(checkId)}/comments`, res.createdIdSchema, { body: { json: body } }),
  resolveComment: (checkId: string, commentId: string, body: In<typeof resolveSchema>) =>
    call('PATCH', `/api/checks/${seg(checkId)}/comments/${seg(commentId)}`, res.okSchema, { body: { json: body } }),
  decide: (checkId: string, body: In<typeof decisionSchema>) =>
    call('POST', `/api/checks/${seg(checkId)}/decision`, res.decisionResultSchema, { body: { json: body } }),

  // revisions
  issueRevision: (sheetId: string, body: In<typeof issueRequestSchema>) =>
    call('POST', `/api/sheets/${seg(sheetId)}/revisions`, res.issueAcceptedSchema, {
      body: { json: body },
      status: 202,
    }),
  issueJob: (jobId: string) => call('GET', `/api/issuing/${seg(jobId)}`, res.issueJobSchema),
  verifyCode: (code: string) => call('POST', '/api/verify', res.verificationSchema, { body: { json: { code } } }),
  verifyFile: (file: File) => {
    const form = new FormData();
    form.append('file', file);
    return call('POST', '/api/verify', res.verificationSchema, { body: { form } });
  },

  // calculation
  evaluate: async (body: In<typeof evaluateRequestSchema>): Promise<SheetResult> =>
    // The schema checks the outline; the full shape is the engine's SheetResult (lib/calc/types.ts).
    (await call('POST', '/api/evaluate', res.sheetResultSchema, { body: { json: body } })) as unknown as SheetResult,

  /** A JSON form's route (components/forms/json-form.tsx): any JSON object answers. */
  sendForm: (method: Exclude<HttpMethod, 'GET'>, url: string, body: Record<string, unknown>) =>
    call(method, url, anyObject, { body: { json: body } }),
};
