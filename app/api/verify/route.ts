import { getDb } from '@/db';
import { AppError } from '@/lib/errors/app-error';
import { readFormFile } from '@/lib/http/multipart';
import { handle, parseJson } from '@/lib/http/route';
import { MAX_VERIFY_BYTES, verifyCode, verifyCodeSchema, verifyPdfFile } from '@/lib/issue/issue';

export const dynamic = 'force-dynamic';

/**
 * For anyone, signed in or not: is this PDF (multipart field `file`) or this verification code
 * (JSON `{"code": …}`) an authentic issued revision, which one, and is it current? Always a plain
 * answer: a file that is not a PDF, or one we never issued, is an answer, not an error.
 */
export function POST(request: Request): Promise<Response> {
  return handle(request, async () => {
    const type = request.headers.get('content-type') ?? '';
    if (/^multipart\/form-data/i.test(type)) {
      const file = await readFormFile(request, 'file', MAX_VERIFY_BYTES, `The file is larger than ${MAX_VERIFY_BYTES / (1024 * 1024)} MiB; no issued revision is that large.`);
      return Response.json(await verifyPdfFile(getDb(), file.bytes));
    }
    if (/^application\/json/i.test(type)) {
      const { code } = await parseJson(request, verifyCodeSchema);
      return Response.json(await verifyCode(getDb(), code));
    }
    throw new AppError('bad_request', 'Send a PDF as multipart/form-data (field "file") or a verification code as JSON {"code": "…"}.');
  }, { multipart: true });
}
