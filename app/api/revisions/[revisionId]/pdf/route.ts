import { getDb } from '@/db';
import { requireActor, requireProjectRole } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { routeParams } from '@/lib/http/params';
import { handle, parseValue, searchParams } from '@/lib/http/route';
import { getRevision } from '@/lib/issue/register';
import { downloadQuerySchema, revisionPdf } from '@/lib/issue/download';
import { getObjectStore } from '@/lib/storage/object-store';

export const dynamic = 'force-dynamic';

/**
 * The signed PDF. A superseded or withdrawn revision comes stamped as such; document control may
 * fetch the original with `original=1`.
 */
export function GET(request: Request, { params }: { params: Promise<{ revisionId: string }> }): Promise<Response> {
  return handle(request, async () => {
    await requireActor();
    const { revisionId } = await routeParams(params);
    const revision = await getRevision(getDb(), revisionId);
    if (!revision) throw new AppError('not_found', 'No such revision.');
    const { original } = parseValue(searchParams(request), downloadQuerySchema);
    if (original === '1') await requireProjectRole(revision.project_id, ['controller']);
    else await requireProjectRole(revision.project_id);
    const file = await revisionPdf(getDb(), getObjectStore(), revision.id, original === '1');
    return new Response(new Uint8Array(file.bytes), {
      headers: {
        'content-type': 'application/pdf',
        'content-length': String(file.bytes.length),
        'content-disposition': `attachment; filename="${file.fileName}"`,
        'x-content-type-options': 'nosniff',
        'x-worldsheet-revision-status': revision.status,
        'x-worldsheet-stamped-copy': file.stamped ? '1' : '0',
        'cache-control': 'private, no-store',
      },
    });
  });
}
