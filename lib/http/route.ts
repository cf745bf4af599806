// Route handlers are thin adapters: parse (zod), authorize, call lib/, map errors.
import type { ZodType } from 'zod';
import { AppError, errorResponse, readJsonBody, unstorableTextPath } from '@/lib/errors/app-error';

export async function handle(fn: () => Promise<Response>): Promise<Response> {
  try {
    return await fn();
  } catch (error) {
    return errorResponse(error);
  }
}

export async function parseJson<T>(request: Request, schema: ZodType<T>, maxBytes = 64 * 1024): Promise<T> {
  const body = await readJsonBody(request, maxBytes);
  return parseValue(body, schema);
}

export function parseValue<T>(value: unknown, schema: ZodType<T>): T {
  const unstorable = unstorableTextPath(value);
  if (unstorable !== null) {
    throw new AppError('bad_request', `${unstorable || 'body'}: holds a character that cannot be stored (U+0000, or half of a surrogate pair)`);
  }
  const parsed = schema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new AppError('bad_request', `${issue.path.join('.') || 'body'}: ${issue.message}`, parsed.error.issues.slice(0, 10));
  }
  return parsed.data;
}

export function searchParams(request: Request): Record<string, string> {
  return Object.fromEntries(new URL(request.url).searchParams.entries());
}
