import { buildOpenApiDocument } from '@/lib/http/openapi';

// The document depends only on the code, so it is built once, at build time. Public: it says what
// the API accepts, not anything about the data.
export const dynamic = 'force-static';

export function GET(): Response {
  return Response.json(buildOpenApiDocument());
}
