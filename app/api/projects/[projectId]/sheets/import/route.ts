import { getDb } from '@/db';
import { requireProjectRole } from '@/lib/auth/current-actor';
import { AppError } from '@/lib/errors/app-error';
import { handle } from '@/lib/http/route';
import { importSheetFile, SHEET_FILE_MAX_BYTES } from '@/lib/sheets/sheet-files';

export const dynamic = 'force-dynamic';

/** Imports a sheet file (the JSON body) as a new sheet: originators. */
export function POST(request: Request, { params }: { params: Promise<{ projectId: string }> }): Promise<Response> {
  return handle(async () => {
    const { actor, project } = await requireProjectRole((await params).projectId, ['originator']);
    if (Number(request.headers.get('content-length') ?? 0) > SHEET_FILE_MAX_BYTES) throw new AppError('too_large', `A sheet file is at most ${SHEET_FILE_MAX_BYTES} bytes.`);
    const text = await request.text();
    if (Buffer.byteLength(text) > SHEET_FILE_MAX_BYTES) throw new AppError('too_large', `A sheet file is at most ${SHEET_FILE_MAX_BYTES} bytes.`);
    return Response.json(await importSheetFile(getDb(), actor, project, text), { status: 201 });
  });
}
