// One error type for the whole app: a code that maps to an HTTP status and a message safe to show.
export type AppErrorCode = 'bad_request' | 'unauthenticated' | 'forbidden' | 'not_found' | 'conflict' | 'too_large' | 'unavailable';

const STATUS: Record<AppErrorCode, number> = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  unavailable: 503,
};

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
    return Response.json({ error: { code: error.code, message: error.message, details: error.details ?? null } }, { status: error.status });
  }
  console.error(error);
  return Response.json({ error: { code: 'internal', message: 'Something went wrong on the server.' } }, { status: 500 });
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
