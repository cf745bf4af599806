import { getDb } from '@/db';
import { requireProjectRole } from '@/lib/auth/current-actor';
import { auditCsv, auditQuerySchema, listProjectAudit } from '@/lib/audit/query';
import { routeParams } from '@/lib/http/params';
import { handle, parseValue, searchParams } from '@/lib/http/route';

export const dynamic = 'force-dynamic';

/** The project's audit trail, as JSON or (?format=csv) as CSV. Viewers do not see it. */
export function GET(request: Request, { params }: { params: Promise<{ projectId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { project } = await requireProjectRole((await routeParams(params)).projectId, [
      'originator',
      'checker',
      'approver',
      'controller',
    ]);
    const { format, ...filter } = parseValue(searchParams(request), auditQuerySchema);
    const rows = await listProjectAudit(getDb(), project.id, filter);
    if (format === 'csv') {
      return new Response(auditCsv(rows), {
        headers: {
          'content-type': 'text/csv; charset=utf-8',
          'content-disposition': `attachment; filename="${project.code}-audit.csv"`,
        },
      });
    }
    return Response.json({ events: rows });
  });
}
