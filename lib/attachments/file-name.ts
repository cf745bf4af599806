// File names as stored and offered for download: no folders, no control or markup characters, no
// leading dots, a sane length, and the extension of the kind the content really is.
import { ATTACHMENT_KINDS, kindOfName, type AttachmentKind } from './kinds';

const MAX_NAME = 120;

export function sanitizeFileName(raw: string, kind: AttachmentKind): string {
  // Only the last path segment, whichever separator the sender's system uses.
  const base = raw.normalize('NFC').split(/[/\\]/).pop() ?? '';
  let name = base
    // eslint-disable-next-line no-control-regex
    .replace(/[\u0000-\u001f\u007f-\u009f]/g, '')
    .replace(/[^\p{L}\p{N} ._()+,=@-]/gu, '_')
    .replace(/\s+/g, ' ')
    .replace(/_+/g, '_')
    .trim()
    .replace(/^[.\s_-]+/, '');
  const spec = ATTACHMENT_KINDS[kind];
  const declared = kindOfName(name);
  let stem = declared === kind ? name.replace(/\.[A-Za-z0-9]+$/, '') : name;
  stem = stem.replace(/[.\s]+$/, '');
  if (!stem) stem = 'attachment';
  const ext = declared === kind ? name.slice(name.lastIndexOf('.') + 1).toLowerCase() : spec.extensions[0];
  // Cutting to length can leave a dot or a space at the end of the stem again ("scan ..pdf").
  stem =
    [...stem]
      .slice(0, MAX_NAME - ext.length - 1)
      .join('')
      .replace(/[.\s]+$/, '') || 'attachment';
  name = `${stem}.${ext}`;
  return name;
}
