import { getDb } from '@/db';
import { readAttachment } from '@/lib/attachments/attachments';
import { routeParams } from '@/lib/http/params';
import { handle } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { getObjectStore } from '@/lib/storage/object-store';

export const dynamic = 'force-dynamic';

type Context = { params: Promise<{ sheetId: string; sha256: string }> };

/** The attachment's bytes, checked against their SHA-256, always as a download (never rendered inline). */
export function GET(request: Request, { params }: Context): Promise<Response> {
  return handle(request, async () => {
    const { sheetId, sha256 } = await routeParams(params);
    const { sheet } = await requireSheetAccess(sheetId);
    const file = await readAttachment(getDb(), getObjectStore(), sheet.id, sha256);
    const ascii = file.name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
    return new Response(new Uint8Array(file.bytes), {
      headers: {
        'content-type': file.mediaType,
        'content-length': String(file.bytes.length),
        'content-disposition': `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(file.name)}`,
        'x-content-type-options': 'nosniff',
        'content-security-policy': "default-src 'none'; sandbox",
        'cache-control': 'private, max-age=31536000, immutable',
        etag: `"${sha256}"`,
        'x-worldsheet-sha256': sha256,
      },
    });
  });
}
