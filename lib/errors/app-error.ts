// One error type for the whole app: a code that maps to an HTTP status and a message safe to show.
import { z } from 'zod';

export type AppErrorCode =
  | 'bad_request'
  | 'unauthenticated'
  | 'forbidden'
  | 'not_found'
  | 'conflict'
  | 'too_large'
  | 'unsupported_type'
  | 'too_many_requests'
  | 'unavailable';

const STATUS: Record<AppErrorCode, number> = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  unsupported_type: 415,
  too_many_requests: 429,
  unavailable: 503,
};

/** The body of every error response (500 answers `internal` without details); the OpenAPI document shows it. */
export const errorBodySchema = z.object({
  error: z.object({
    code: z.enum([...(Object.keys(STATUS) as AppErrorCode[]), 'internal']),
    message: z.string().meta({ description: 'Safe to show to the person using the app.' }),
    details: z.unknown().optional().meta({
      description: 'For 400 the first validation issues, for 409 what the request conflicts with; otherwise null.',
    }),
  }),
});
type ErrorBody = z.infer<typeof errorBodySchema>;

export class AppError extends Error {
  constructor(
    readonly code: AppErrorCode,
    message: string,
    readonly details?: unknown,
    /** For 429 (and 503): seconds after which the request may be made again, sent as Retry-After. */
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
    this.name = 'AppError';
  }

  get status(): number {
    return STATUS[this.code];
  }
}

// A lost database: the server shutting down or refusing (SQLSTATE class 57P, "operator
// intervention"), the connection failing (class 08), or the socket refused, reset or closed under
// node-postgres (which reports a closed connection with these messages and no code).
const CONNECTION_SQLSTATES = new Set(['57P01', '57P02', '57P03', '08006', '08001', '08003', '08004']);
const CONNECTION_ERRNOS = new Set(['ECONNREFUSED', 'ECONNRESET']);
const CONNECTION_MESSAGES = [
  /^Connection terminated/,
  /^Client has encountered a connection error and is not queryable/,
];

/** Whether `error` (or its cause, or one of an AggregateError's errors) says the database connection is lost. */
export function isDatabaseConnectionError(error: unknown, depth = 0): boolean {
  if (!(error instanceof Error) || depth > 4) return false;
  const code = (error as { code?: unknown }).code;
  if (typeof code === 'string' && (CONNECTION_SQLSTATES.has(code) || CONNECTION_ERRNOS.has(code))) return true;
  if (CONNECTION_MESSAGES.some((m) => m.test(error.message))) return true;
  if (error instanceof AggregateError && error.errors.some((e) => isDatabaseConnectionError(e, depth + 1))) return true;
  return isDatabaseConnectionError(error.cause, depth + 1);
}

// Text PostgreSQL cannot store, which only a request can bring: U+0000 in a text column
// (22021 character_not_in_repertoire) or in jsonb (22P05 untranslatable_character). The statement
// failed, so its transaction wrote nothing.
const UNSTORABLE_TEXT_SQLSTATES = new Set(['22021', '22P05']);

/** Whether `error` is PostgreSQL refusing a character of the text it was given. */
export function isUnstorableTextError(error: unknown): boolean {
  const code = error instanceof Error ? (error as { code?: unknown }).code : undefined;
  return typeof code === 'string' && UNSTORABLE_TEXT_SQLSTATES.has(code);
}

// U+0000, which PostgreSQL refuses in text and jsonb, and a surrogate without its other half, which
// jsonb refuses and the canonical JSON of a version's hash (RFC 8785) cannot represent. parseValue
// refuses them at the door, rather than half way through a save.
// eslint-disable-next-line no-control-regex
const UNSTORABLE_CHARACTER = /\u0000|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** The dotted path of the first string (or key) in `value` holding such a character (`path` for `value` itself), or null. */
export function unstorableTextPath(value: unknown, path = '', depth = 0): string | null {
  if (typeof value === 'string') return UNSTORABLE_CHARACTER.test(value) ? path : null;
  if (value === null || typeof value !== 'object' || depth > 64) return null;
  for (const [key, item] of Object.entries(value)) {
    const at = path ? `${path}.${key}` : key;
    if (UNSTORABLE_CHARACTER.test(key)) return at;
    const found = unstorableTextPath(item, at, depth + 1);
    if (found !== null) return found;
  }
  return null;
}

// A value PostgreSQL could not read as its column's type: text that is not a UUID or a number
// (22P02 invalid_text_representation), a number beyond the column's range such as int4
// (22003 numeric_value_out_of_range). Path parameters and bodies are validated before they reach
// the database (lib/http/params.ts); this is the net under that, so such a request is a 400, never a 500.
const MALFORMED_VALUE_SQLSTATES = new Set(['22P02', '22003']);

/** Whether `error` is PostgreSQL refusing a value of the wrong form or range. */
function isMalformedValueError(error: unknown): boolean {
  const code = error instanceof Error ? (error as { code?: unknown }).code : undefined;
  return typeof code === 'string' && MALFORMED_VALUE_SQLSTATES.has(code);
}

// The record rules the database itself enforces (migrations: WS001 a record is only ever added,
// WS002 a check names the hash of its version, WS003 a state change the record does not allow, such
// as a new version of a void sheet). The application checks the same rules first; a request reaching
// the database's refusal lost a race with another change, so it is a 409 with the database's words.
const RECORD_RULE_SQLSTATES = new Set(['WS001', 'WS002', 'WS003']);

/** Whether `error` is one of the database's record rules refusing a change. */
function isRecordRuleError(error: unknown): boolean {
  const code = error instanceof Error ? (error as { code?: unknown }).code : undefined;
  return typeof code === 'string' && RECORD_RULE_SQLSTATES.has(code);
}

/** Maps any error to a JSON response without leaking stacks or internals. */
export function errorResponse(error: unknown): Response {
  if (!(error instanceof AppError) && isDatabaseConnectionError(error)) {
    console.error('database unavailable:', error instanceof Error ? error.message : error);
    error = new AppError(
      'unavailable',
      'The database is unavailable just now; nothing was saved. Try again in a minute.',
    );
  }
  if (!(error instanceof AppError) && isUnstorableTextError(error)) {
    error = new AppError(
      'bad_request',
      'The text holds the NUL character (U+0000), which cannot be stored; remove it and try again.',
    );
  }
  if (!(error instanceof AppError) && isMalformedValueError(error)) {
    error = new AppError(
      'bad_request',
      'A value in the request is not of the expected form or is out of range (an id that is not a UUID, a number beyond 2147483647).',
    );
  }
  if (!(error instanceof AppError) && isRecordRuleError(error)) {
    const message = (error as Error).message.slice(0, 300);
    error = new AppError(
      'conflict',
      `The record refuses this change (${message}); nothing was saved. Reload the page to see the record as it stands now.`,
      { rule: (error as { code: string }).code },
    );
  }
  if (error instanceof AppError) {
    const headers =
      error.retryAfterSeconds === undefined
        ? undefined
        : { 'retry-after': String(Math.max(1, Math.ceil(error.retryAfterSeconds))) };
    return Response.json(
      { error: { code: error.code, message: error.message, details: error.details ?? null } } satisfies ErrorBody,
      { status: error.status, headers },
    );
  }
  console.error(error);
  return Response.json(
    { error: { code: 'internal', message: 'Something went wrong on the server.' } } satisfies ErrorBody,
    { status: 500 },
  );
}
