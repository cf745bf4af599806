import { getDb } from '@/db';
import { listAttachments, uploadAttachment } from '@/lib/attachments/attachments';
import { ACCEPTED_DESCRIPTION, MAX_ATTACHMENT_BYTES } from '@/lib/attachments/kinds';
import { readFormFile } from '@/lib/http/multipart';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { getObjectStore } from '@/lib/storage/object-store';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ sheetId: string }> };

export function GET(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { sheet } = await requireSheetAccess((await routeParams(params)).sheetId);
    return Response.json({ attachments: await listAttachments(getDb(), sheet.id) });
  });
}

/** Uploads a file (multipart field `file`); the editor then cites it in the next version. */
export function POST(request: Request, { params }: Context): Promise<Response> {
  return handle(
    request,
    async () => {
      const { actor, sheet } = await requireSheetAccess((await routeParams(params)).sheetId, ['originator']);
      const file = await readFormFile(
        request,
        'file',
        MAX_ATTACHMENT_BYTES,
        `The file is larger than any accepted attachment: ${ACCEPTED_DESCRIPTION}.`,
      );
      return Response.json(await uploadAttachment(getDb(), getObjectStore(), actor, sheet, file), { status: 201 });
    },
    { multipart: true },
  );
}
