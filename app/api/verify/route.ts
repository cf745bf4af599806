import { getDb } from '@/db';
import { AppError } from '@/lib/errors/app-error';
import { readFormFile } from '@/lib/http/multipart';
import { clientAddress } from '@/lib/http/client-address';
import { handle, parseJson } from '@/lib/http/route';
import { MAX_VERIFY_BYTES, verifyCode, verifyCodeSchema, verifyPdfFile } from '@/lib/issue/verification';
import { countVerification } from '@/lib/issue/verify-rate-limit';

export const dynamic = 'force-dynamic';

/**
 * For anyone, signed in or not: is this PDF (multipart field `file`) or this verification code
 * (JSON `{"code": …}`) an authentic issued revision, which one, and is it current? Always a plain
 * answer: a file that is not a PDF, or one we never issued, is an answer, not an error. But a file
 * whose signature container is too large or complex to read is refused (413) unread, and each
 * address may verify a limited number of times a minute (429 with Retry-After).
 */
export function POST(request: Request): Promise<Response> {
  return handle(
    request,
    async () => {
      // Counted before the body is read: a refused client costs one small database statement.
      await countVerification(getDb(), clientAddress(request.headers));
      const type = request.headers.get('content-type') ?? '';
      if (/^multipart\/form-data/i.test(type)) {
        const file = await readFormFile(
          request,
          'file',
          MAX_VERIFY_BYTES,
          `The file is larger than ${MAX_VERIFY_BYTES / (1024 * 1024)} MiB; no issued revision is that large.`,
        );
        return Response.json(await verifyPdfFile(getDb(), file.bytes));
      }
      if (/^application\/json/i.test(type)) {
        const { code } = await parseJson(request, verifyCodeSchema);
        return Response.json(await verifyCode(getDb(), code));
      }
      throw new AppError(
        'bad_request',
        'Send a PDF as multipart/form-data (field "file") or a verification code as JSON {"code": "…"}.',
      );
    },
    { multipart: true },
  );
}
