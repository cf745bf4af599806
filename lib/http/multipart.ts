// Reads one file from a multipart/form-data request, refusing bodies over a limit before and while
// reading them (a client may send no Content-Length, or a false one).
import { AppError } from '@/lib/errors/app-error';
import { readBodyBytes } from './body';

/** Room for the multipart boundaries and part headers around the file. */
const ENVELOPE_BYTES = 64 * 1024;

export interface FormFile {
  name: string;
  type: string;
  bytes: Uint8Array;
}

export async function readFormFile(
  request: Request,
  field: string,
  maxFileBytes: number,
  tooLarge: string,
): Promise<FormFile> {
  const contentType = request.headers.get('content-type') ?? '';
  if (!/^multipart\/form-data;/i.test(contentType)) {
    throw new AppError('bad_request', `Send the file as multipart/form-data in a field named "${field}".`);
  }
  const bytes = await readBodyBytes(request, maxFileBytes + ENVELOPE_BYTES, tooLarge);
  let form: FormData;
  try {
    form = await new Response(bytes, { headers: { 'content-type': contentType } }).formData();
  } catch {
    throw new AppError('bad_request', 'The upload could not be read as multipart/form-data.');
  }
  const file = form.get(field);
  if (!file || typeof file === 'string')
    throw new AppError('bad_request', `Send the file in a field named "${field}".`);
  return { name: file.name, type: file.type, bytes: new Uint8Array(await file.arrayBuffer()) };
}
