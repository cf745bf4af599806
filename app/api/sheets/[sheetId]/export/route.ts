import { getDb } from '@/db';
import { readAttachment } from '@/lib/attachments/attachments';
import { AppError } from '@/lib/errors/app-error';
import { routeParams } from '@/lib/http/params';
import { handle, parseValue, searchParams } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { checkCarriedSize, exportQuerySchema, sheetFileOf } from '@/lib/sheets/sheet-files';
import { formatSheetNumber } from '@/lib/sheets/sheet-number';
import { getVersion } from '@/lib/sheets/sheets';
import { getObjectStore } from '@/lib/storage/object-store';

export const dynamic = 'force-dynamic';

/**
 * The sheet file of the latest version, or of `?version=n`; with `?attachments=include` it carries
 * the bytes of each attachment the version cites (each read back against its SHA-256 first).
 */
export function GET(request: Request, { params }: { params: Promise<{ sheetId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { sheet, project } = await requireSheetAccess((await routeParams(params)).sheetId);
    const query = parseValue(searchParams(request), exportQuerySchema);
    const version = await getVersion(getDb(), sheet.id, query.version);
    if (!version) throw new AppError('not_found', 'No such version.');
    const number = formatSheetNumber(project.code, sheet.number);
    let carried: Map<string, Uint8Array> | undefined;
    if (query.attachments === 'include') {
      checkCarriedSize(version.content.attachments);
      carried = new Map();
      for (const a of version.content.attachments) {
        if (!carried.has(a.sha256))
          carried.set(a.sha256, (await readAttachment(getDb(), getObjectStore(), sheet.id, a.sha256)).bytes);
      }
    }
    const suffix = carried && carried.size > 0 ? '-with-attachments' : '';
    return new Response(
      `${JSON.stringify(sheetFileOf(version.content, { number, version: version.number, sha256: version.sha256 }, carried), null, 2)}\n`,
      {
        headers: {
          'content-type': 'application/json; charset=utf-8',
          'content-disposition': `attachment; filename="${number}-v${version.number}${suffix}.json"`,
        },
      },
    );
  });
}
