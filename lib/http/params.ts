// The dynamic segments of every route handler and page, validated in one place before anything
// reaches the database: ids are UUIDs, numbers are decimal integers within PostgreSQL's int4.
// A segment that does not fit names nothing, so the answer is 404 (route handlers) or the
// not-found page (pages), never a 500 from PostgreSQL refusing the value.
import { z, type ZodType } from 'zod';
import { AppError } from '@/lib/errors/app-error';

/** The largest value of PostgreSQL's integer (int4) columns: version numbers, sheet numbers. */
export const INT4_MAX = 2_147_483_647;

/** A decimal integer from `min` to INT4_MAX written as digits only (no sign, exponent, spaces). */
const intParam = (min: number) =>
  z
    .string()
    .regex(/^\d{1,10}$/, 'digits only')
    .transform(Number)
    .pipe(z.number().int().min(min).max(INT4_MAX));

const uuid = z.uuid();
/** A project is named by its id or by its code (the pages use the code). */
const projectRef = z.union([uuid, z.string().regex(/^[A-Z][A-Z0-9]{1,9}$/)]);

/** Each dynamic segment name used under app/, what it names, and its form. */
export const PATH_PARAMS = {
  sheetId: { what: 'sheet', schema: uuid },
  checkId: { what: 'check', schema: uuid },
  commentId: { what: 'comment', schema: uuid },
  tokenId: { what: 'token', schema: uuid },
  userId: { what: 'user', schema: uuid },
  jobId: { what: 'issue request', schema: uuid },
  revisionId: { what: 'revision', schema: uuid },
  projectId: { what: 'project', schema: projectRef },
  projectCode: { what: 'project', schema: projectRef },
  number: { what: 'version', schema: intParam(1) },
  sheetNumber: { what: 'sheet', schema: intParam(1) },
  cellIndex: { what: 'cell', schema: intParam(0) },
  line: { what: 'line', schema: intParam(1) },
  sha256: { what: 'attachment', schema: z.string().regex(/^[0-9a-f]{64}$/) },
} satisfies Record<string, { what: string; schema: ZodType }>;

export type PathParamName = keyof typeof PATH_PARAMS;
type Parsed<P> = { [K in keyof P]: K extends PathParamName ? z.output<(typeof PATH_PARAMS)[K]['schema']> : never };

/** The segments parsed, or the name of the first one that does not fit. */
export function checkPathParams<P extends Partial<Record<PathParamName, string>>>(
  raw: P,
): { ok: true; value: Parsed<P> } | { ok: false; name: string; what: string } {
  const out: Record<string, unknown> = {};
  for (const [name, value] of Object.entries(raw)) {
    const spec = (PATH_PARAMS as Record<string, { what: string; schema: ZodType }>)[name];
    if (!spec) throw new Error(`lib/http/params.ts: no schema for the path parameter "${name}"`);
    const parsed = spec.schema.safeParse(value);
    if (!parsed.success) return { ok: false, name, what: spec.what };
    out[name] = parsed.data;
  }
  return { ok: true, value: out as Parsed<P> };
}

/** For route handlers: the segments parsed, or 404 naming what does not exist. */
export async function routeParams<P extends Partial<Record<PathParamName, string>>>(
  params: Promise<P> | P,
): Promise<Parsed<P>> {
  const checked = checkPathParams(await params);
  if (!checked.ok) throw new AppError('not_found', `No such ${checked.what}.`);
  return checked.value;
}

/** For pages: the segments parsed, or null (the page then calls notFound()). */
export function pageParams<P extends Partial<Record<PathParamName, string>>>(raw: P): Parsed<P> | null {
  const checked = checkPathParams(raw);
  return checked.ok ? checked.value : null;
}

/** A number from a page's query (`?version=3`): the integer, or null when it is not one within int4. */
export function queryInt4(value: string | string[] | undefined, min = 1): number | null {
  if (typeof value !== 'string') return null;
  const parsed = intParam(min).safeParse(value);
  return parsed.success ? parsed.data : null;
}
