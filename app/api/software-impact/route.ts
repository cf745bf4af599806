import { getDb } from '@/db';
import { requireActor } from '@/lib/auth/current-actor';
import { handle, parseValue, searchParams } from '@/lib/http/route';
import { softwareImpact, softwareImpactCsv, softwareImpactQuerySchema } from '@/lib/sheets/software-impact';

export const dynamic = 'force-dynamic';

/**
 * Versions and issued revisions evaluated with an engine version and/or a constants edition
 * (optionally calling a function), in the projects the caller belongs to (administrators: all).
 */
export function GET(request: Request): Promise<Response> {
  return handle(request, async () => {
    const actor = await requireActor();
    const q = parseValue(searchParams(request), softwareImpactQuerySchema);
    const answer = await softwareImpact(getDb(), actor, q);
    if (q.format === 'csv') {
      return new Response(softwareImpactCsv(answer.rows ?? []), {
        headers: {
          'content-type': 'text/csv; charset=utf-8',
          'content-disposition': 'attachment; filename="software-impact.csv"',
        },
      });
    }
    return Response.json(answer);
  });
}
