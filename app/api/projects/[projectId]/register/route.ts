import { getDb } from '@/db';
import { requireProjectRole } from '@/lib/auth/current-actor';
import { routeParams } from '@/lib/http/params';
import { handle, parseValue, searchParams } from '@/lib/http/route';
import { listRevisions, registerCsv, registerQuerySchema } from '@/lib/issue/register';
import { revisionInputFlags } from '@/lib/sheets/impact';

export const dynamic = 'force-dynamic';

/** The project's document register: every issued revision with its status; `format=csv` for a file. */
export function GET(request: Request, { params }: { params: Promise<{ projectId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { project } = await requireProjectRole((await routeParams(params)).projectId);
    const q = parseValue(searchParams(request), registerQuerySchema);
    const rows = await listRevisions(getDb(), { projectId: project.id, status: q.status, q: q.q });
    if (q.format === 'csv') {
      return new Response(registerCsv(rows, await revisionInputFlags(getDb(), project.id)), {
        headers: {
          'content-type': 'text/csv; charset=utf-8',
          'content-disposition': `attachment; filename="${project.code}-register.csv"`,
        },
      });
    }
    return Response.json({ project: project.code, revisions: rows });
  });
}
