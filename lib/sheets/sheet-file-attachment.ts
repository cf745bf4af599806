// A module with no server imports (client components may load it), used by lib/sheets/sheet-files.ts and the
// response schemas of lib/http/openapi-schemas.ts.
import { z } from 'zod';
import { attachmentRefSchema } from './content';

/** An attachment as a sheet file lists it: the version's citation, with its bytes when carried. */
export const sheetFileAttachmentSchema = attachmentRefSchema.extend({
  contentBase64: z.string().optional().meta({
    description:
      'The bytes, base64: present when the file carries the attachment. An import checks their size and SHA-256.',
  }),
});
