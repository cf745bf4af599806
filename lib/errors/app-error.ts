// One error type for the whole app: a code that maps to an HTTP status and a message safe to show.
import { z } from 'zod';

export type AppErrorCode = 'bad_request' | 'unauthenticated' | 'forbidden' | 'not_found' | 'conflict' | 'too_large' | 'unsupported_type' | 'unavailable';

const STATUS: Record<AppErrorCode, number> = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  unsupported_type: 415,
  unavailable: 503,
};

/** The body of every error response (500 answers `internal` without details); the OpenAPI document shows it. */
export const errorBodySchema = z.object({
  error: z.object({
    code: z.enum([...(Object.keys(STATUS) as AppErrorCode[]), 'internal']),
    message: z.string().meta({ description: 'Safe to show to the person using the app.' }),
    details: z.unknown().optional().meta({ description: 'For 400 the first validation issues, for 409 what the request conflicts with; otherwise null.' }),
  }),
});
export type ErrorBody = z.infer<typeof errorBodySchema>;

export class AppError extends Error {
  constructor(
    readonly code: AppErrorCode,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'AppError';
  }

  get status(): number {
    return STATUS[this.code];
  }
}

/** Maps any error to a JSON response without leaking stacks or internals. */
export function errorResponse(error: unknown): Response {
  if (error instanceof AppError) {
    return Response.json({ error: { code: error.code, message: error.message, details: error.details ?? null } } satisfies ErrorBody, { status: error.status });
  }
  console.error(error);
  return Response.json({ error: { code: 'internal', message: 'Something went wrong on the server.' } } satisfies ErrorBody, { status: 500 });
}

/** Reads a JSON body, refusing bodies over `maxBytes` before parsing them. */
export async function readJsonBody(request: Request, maxBytes: number): Promise<unknown> {
  const declared = Number(request.headers.get('content-length') ?? 0);
  if (declared > maxBytes) throw new AppError('too_large', `The request body is larger than ${maxBytes} bytes.`);
  const text = await request.text();
  if (Buffer.byteLength(text) > maxBytes) throw new AppError('too_large', `The request body is larger than ${maxBytes} bytes.`);
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError('bad_request', 'The request body is not valid JSON.');
  }
}
