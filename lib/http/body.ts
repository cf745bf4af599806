// Request bodies are read as a stream with a byte limit: the declared Content-Length is refused
// before anything is read, and a body without one (chunked) or with a false one is refused as soon as
// the limit is passed. The rest is never read, so a client cannot make the server hold more than the
// limit in memory, whatever it sends.
import { AppError } from '@/lib/errors/app-error';

function tooLargeMessage(maxBytes: number): string {
  return `The request body is larger than ${maxBytes} bytes.`;
}

/** The body's bytes, at most `maxBytes` of them; 413 (`tooLarge`) as soon as there are more. */
export async function readBodyBytes(
  request: Request,
  maxBytes: number,
  tooLarge = tooLargeMessage(maxBytes),
): Promise<Uint8Array<ArrayBuffer>> {
  const declared = request.headers.get('content-length');
  if (declared !== null && Number(declared) > maxBytes) {
    await request.body?.cancel().catch(() => undefined);
    throw new AppError('too_large', tooLarge);
  }
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > maxBytes) {
        chunks.length = 0;
        await reader.cancel().catch(() => undefined);
        throw new AppError('too_large', tooLarge);
      }
      chunks.push(value);
    }
  } finally {
    reader.releaseLock();
  }
  const bytes = new Uint8Array(total);
  let at = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, at);
    at += chunk.byteLength;
  }
  return bytes;
}

/** The body as UTF-8 text (a byte order mark dropped, as Request.text() does), bounded as readBodyBytes. */
export async function readBodyText(request: Request, maxBytes: number, tooLarge?: string): Promise<string> {
  return new TextDecoder().decode(await readBodyBytes(request, maxBytes, tooLarge));
}

/** Reads a JSON body, refusing bodies over `maxBytes` before and while reading them. */
export async function readJsonBody(request: Request, maxBytes: number): Promise<unknown> {
  const text = await readBodyText(request, maxBytes);
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError('bad_request', 'The request body is not valid JSON.');
  }
}
