import { getDb } from '@/db';
import { routeParams } from '@/lib/http/params';
import { handle, parseJson } from '@/lib/http/route';
import { requireSheetAccess } from '@/lib/sheets/access';
import { voidSheet, voidSheetSchema } from '@/lib/sheets/void';

export const dynamic = 'force-dynamic';

/** Voids a sheet never issued, with a reason (lib/sheets/void.ts says who may and when). */
export function POST(request: Request, { params }: { params: Promise<{ sheetId: string }> }): Promise<Response> {
  return handle(request, async () => {
    const { actor, roles, sheet } = await requireSheetAccess((await routeParams(params)).sheetId, [
      'originator',
      'controller',
    ]);
    const input = await parseJson(request, voidSheetSchema, 8 * 1024);
    const result = await voidSheet(getDb(), actor, roles, sheet.id, input);
    return Response.json({
      sheetId: sheet.id,
      status: 'void',
      voidedAt: result.voidedAt.toISOString(),
      reason: result.reason,
    });
  });
}
